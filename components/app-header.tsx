import Link from "next/link";
import { Brand } from "@/components/brand";
import { AccountMenu, SignOutButton } from "@/components/sign-out-button";
import type { Actor } from "@/lib/permissions";

/** Header for signed-in areas: where you are, where else you can go, and sign-out. */
export function AppHeader({ actor, context }: { actor: Actor; context?: string }) {
  const hasShops = actor.memberships.length > 0;
  return (
    <header className="border-b border-line bg-surface">
      <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-4 gap-y-2 px-4 py-2">
        <Brand size="sm" />
        {context ? <span className="truncate font-semibold text-ink-muted">{context}</span> : null}
        <nav aria-label="Areas" className="ml-auto flex items-center gap-1">
          {hasShops ? (
            <Link href="/shop" className="inline-flex min-h-tap items-center rounded-lg px-3 font-medium text-oil hover:bg-oil-soft">
              Shop
            </Link>
          ) : null}
          <Link href="/my" className="inline-flex min-h-tap items-center rounded-lg px-3 font-medium text-oil hover:bg-oil-soft">
            My machines
          </Link>
          <AccountMenu email={actor.email} />
          <SignOutButton email={actor.email} />
        </nav>
      </div>
    </header>
  );
}
