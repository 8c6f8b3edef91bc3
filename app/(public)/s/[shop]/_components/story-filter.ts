// The shop page's machine-kind filter, as plain functions (StoryGrid runs them in the browser;
// tests/unit/story-filter.test.ts checks them). The page is cached for everyone, so the chosen
// kind is read from the address there, never from the request.

/** The kind asked for in the address's query (`?kind=atv`), if it is one the page has chips for. */
export function kindFromSearch(search: string, kinds: readonly { kind: string }[]): string | null {
  const asked = new URLSearchParams(search).get("kind");
  return asked !== null && kinds.some((k) => k.kind === asked) ? asked : null;
}

/** The address a chip links to: shareable, and the same page for the cache (the query isn't read on the server). */
export function kindHref(shop: string, kind: string | null): string {
  return kind ? `/s/${shop}?kind=${encodeURIComponent(kind)}` : `/s/${shop}`;
}

/** The stories to show for a kind (all of them for none), in the page's order. */
export function storiesOfKind<T extends { kind: string }>(items: readonly T[], kind: string | null): T[] {
  return kind ? items.filter((i) => i.kind === kind) : [...items];
}
