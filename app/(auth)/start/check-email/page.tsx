import type { Metadata } from "next";
import { MailCheck } from "lucide-react";
import { ButtonLink } from "@/components/ui";
import { SIGNUP_LIMITS } from "@/lib/server/shop-signup";

export const metadata: Metadata = { title: "Confirm your shop" };

export default async function StartCheckEmailPage({ searchParams }: { searchParams: Promise<{ to?: string | string[] }> }) {
  const { to } = await searchParams;
  const address = typeof to === "string" ? to.slice(0, 254) : null;
  return (
    <div className="space-y-4 text-center">
      <MailCheck aria-hidden className="mx-auto size-12 text-oil" />
      <h1 className="text-2xl font-bold">Check your e-mail</h1>
      <p className="text-ink-muted">
        A link to confirm the address and create your shop is on its way. It works once and lasts {SIGNUP_LIMITS.linkTtlMinutes} minutes; nothing is
        created until you open it.
      </p>
      {address ? (
        <p className="text-ink-muted">
          Address: <strong className="text-ink">{address}</strong>
        </p>
      ) : null}
      <p className="text-ink-muted">Nothing after a few minutes? Check the address and your spam folder, or start again.</p>
      <ButtonLink href="/start" variant="secondary">
        Start again
      </ButtonLink>
    </div>
  );
}
