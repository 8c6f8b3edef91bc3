import type { Metadata } from "next";
import Link from "next/link";
import { forbidden, redirect } from "next/navigation";
import { AppHeader } from "@/components/app-header";
import { ROLE_LABEL } from "@/lib/permissions";
import { requirePageActor } from "@/lib/server/authorize";

export const metadata: Metadata = { title: "Your shops" };

/** Staff home: straight to the shop when there is one, a choice when there are several. */
export default async function ShopsPage() {
  const actor = await requirePageActor("/shop");
  if (actor.memberships.length === 0) forbidden();
  if (actor.memberships.length === 1) redirect(`/shop/${actor.memberships[0]!.shopSlug}`);
  return (
    <>
      <AppHeader actor={actor} />
      <main id="main" tabIndex={-1} className="mx-auto max-w-2xl space-y-4 px-4 py-6">
        <h1 className="text-2xl font-bold">Your shops</h1>
        <ul className="space-y-2">
          {actor.memberships.map((m) => (
            <li key={m.shopId}>
              <Link href={`/shop/${m.shopSlug}`} className="flex min-h-tap items-center justify-between rounded-xl border border-line bg-surface p-4 hover:bg-sunken">
                <span className="font-semibold">{m.shopName}</span>
                <span className="text-ink-muted">{ROLE_LABEL[m.role]}</span>
              </Link>
            </li>
          ))}
        </ul>
      </main>
    </>
  );
}
