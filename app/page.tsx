import { redirect } from "next/navigation";
import { connection } from "next/server";
import { Wrench } from "lucide-react";
import { AppStyles } from "@/app/app-styles";
import { Brand } from "@/components/brand";
import { ButtonLink } from "@/components/ui";
import { getActor } from "@/lib/server/actor";

export default async function Home() {
  // Rendered per request: the page's scripts carry this request's CSP nonce (proxy.ts).
  await connection();
  const actor = await getActor();
  if (actor) redirect(actor.memberships.length ? "/shop" : "/my");
  return (
    <div className="flex min-h-dvh flex-col">
      <AppStyles />
      <header className="px-4 py-3">
        <Brand />
      </header>
      <main id="main" tabIndex={-1} className="mx-auto flex w-full max-w-2xl flex-1 flex-col justify-center gap-6 px-4 py-10">
        <Wrench aria-hidden className="size-10 text-brass" />
        <h1 className="text-3xl font-bold leading-tight sm:text-4xl">Every job at the bench, told to the machine&apos;s owner as it happens.</h1>
        <p className="text-lg text-ink-muted">
          Benchside keeps a journal of each repair — clips, photos and notes from the bench — asks owners before added work, and
          hands the machine back with a clear invoice.
        </p>
        <div className="flex flex-wrap gap-3">
          <ButtonLink href="/sign-in" size="lg">
            Sign in
          </ButtonLink>
          <ButtonLink href="/start" size="lg" variant="secondary">
            Start your shop
          </ButtonLink>
        </div>
      </main>
    </div>
  );
}
