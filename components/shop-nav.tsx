import Link from "next/link";
import type { ReactNode } from "react";

/** The shop area's sections, under the header; only the ones this person may open are passed in. */
export function ShopNav({ links }: { links: { href: string; label: string; badge?: ReactNode }[] }) {
  if (links.length < 2) return null;
  return (
    <nav aria-label="This shop" className="border-b border-line bg-surface">
      <ul className="mx-auto flex max-w-6xl gap-1 overflow-x-auto px-4">
        {links.map((l) => (
          <li key={l.href}>
            <Link href={l.href} className="inline-flex min-h-tap items-center whitespace-nowrap rounded-lg px-3 font-medium text-oil hover:bg-oil-soft">
              {l.label}
              {l.badge}
            </Link>
          </li>
        ))}
      </ul>
    </nav>
  );
}
