"use client";
import { type MouseEvent, type ReactNode, useEffect, useState } from "react";
import clsx from "clsx";
import { kindFromSearch, kindHref, storiesOfKind } from "./story-filter";

// The shop page's "finished jobs" grid with its machine-kind chips. The page is static (cached
// for every visitor), so the filter lives here, not in the request: every card is in the HTML,
// and the chosen kind comes from the address (`?kind=atv`, so a filtered view can still be
// shared) once the page is running, and from the chips, which change the address in place.
// Without JavaScript the chips still link there, and every story shows.

export type StoryGridItem = { key: string; kind: string; card: ReactNode };

export function StoryGrid({ shop, kinds, items }: { shop: string; kinds: { kind: string; label: string }[]; items: StoryGridItem[] }) {
  const [kind, setKind] = useState<string | null>(null);

  useEffect(() => {
    const follow = () => setKind(kindFromSearch(window.location.search, kinds));
    follow();
    window.addEventListener("popstate", follow);
    return () => window.removeEventListener("popstate", follow);
  }, [kinds]);

  const choose = (next: string | null, href: string) => (e: MouseEvent<HTMLAnchorElement>) => {
    // A new tab or window (modifier keys, middle click) opens the link as it is.
    if (e.metaKey || e.ctrlKey || e.shiftKey || e.altKey || e.button !== 0) return;
    e.preventDefault();
    window.history.pushState(null, "", href);
    setKind(next);
  };

  const options = [{ kind: null, label: "All machines" }, ...kinds].map((o) => ({ ...o, href: kindHref(shop, o.kind) }));
  const shown = storiesOfKind(items, kind);
  return (
    <>
      {kinds.length > 1 ? (
        <nav aria-label="Filter by kind of machine">
          <ul className="flex flex-wrap gap-2">
            {options.map((o) => (
              <li key={o.href}>
                <a
                  href={o.href}
                  onClick={choose(o.kind, o.href)}
                  aria-current={kind === o.kind ? "page" : undefined}
                  className={clsx("inline-flex min-h-tap items-center rounded-full border px-4 font-semibold", kind === o.kind ? "border-oil bg-oil text-oil-on" : "border-line-strong bg-surface text-ink hover:bg-sunken")}
                >
                  {o.label}
                </a>
              </li>
            ))}
          </ul>
        </nav>
      ) : null}
      <p className="sr-only" aria-live="polite">
        {kind ? `Showing ${shown.length} of ${items.length} stories.` : ""}
      </p>
      <ul className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
        {shown.map((i) => (
          <li key={i.key}>{i.card}</li>
        ))}
      </ul>
    </>
  );
}
