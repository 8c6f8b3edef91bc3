import { STORY_SLUG_PATTERN, SHOP_SLUG_PATTERN, isReservedSlug } from "@/lib/portfolio";

// Which of a shop's public pages a path asks for: the shop's page (/s/<shop>) or one of its
// stories (/s/<shop>/<story>), each with its social card (…/opengraph-image). The proxy asks the
// database whether that page is shown before Next renders it (lib/server/public-gate.ts): the
// pages are cached per address (ISR), a 404 too, so without that check every made-up address
// would leave a page in the cache and on disk. The other routes under /s/<shop> (the logo, a
// story's photos and clips) are no page: null, like any other path.

export type PublicPageAddress = { shop: string; story: string | null };

const SOCIAL_CARD = /^opengraph-image(?:-[A-Za-z0-9]+)?$/;

export function publicPageAddress(pathname: string): PublicPageAddress | null {
  const parts = pathname.split("/");
  if (parts[0] !== "" || parts[1] !== "s") return null;
  let rest = parts.slice(2);
  if (rest.length > 1 && SOCIAL_CARD.test(rest[rest.length - 1]!)) rest = rest.slice(0, -1);
  if (rest.some((p) => p === "")) return null; // "/s/", "/s/shop/": Next's own redirect or 404 first
  if (rest.length === 1) return { shop: rest[0]!, story: null };
  if (rest.length === 2 && !isReservedSlug(rest[1]!)) return { shop: rest[0]!, story: rest[1]! };
  return null;
}

/** Whether the address could name a page at all (the slug rules); one that can't is missing without asking. */
export function possiblePublicPage({ shop, story }: PublicPageAddress): boolean {
  return SHOP_SLUG_PATTERN.test(shop) && (story === null || (story.length <= 80 && STORY_SLUG_PATTERN.test(story)));
}

/** Where the proxy sends a missing page's address: one address, so one cached 404 for all of them. */
export const MISSING_PUBLIC_PAGE = "/s/-/-";
