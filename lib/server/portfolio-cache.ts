import "server-only";
import { revalidateTag, unstable_cache } from "next/cache";
import { getPublicFace } from "@/db/queries/public-face";
import { jobHasPublishedStory, publicPhotoKeys } from "@/db/queries/portfolio-public";
import { ids } from "@/lib/server/access";
import { photoInlineCopy } from "@/lib/server/photos";
import { getPublicShopPage, getPublicStory } from "@/lib/server/portfolio-public";

// The shops' public pages (/s/<shop>, /s/<shop>/<story> and their social cards) are static:
// rendered on the first visit, then served from Next's cache (ISR) until a change drops them.
// What they show is read through the loaders below, which label the page with one tag per shop,
// whatever the answer (a 404 too, so a story published later replaces it). Every change to
// anything a shop's public pages show calls dropPublicPages(shop) in the same request, so the
// next visit renders afresh: publish, take down, curate, a consent answer (a withdrawal is a 404
// on the very next request), the profile and logo, the shop's name, hours and time zone, and an
// edit, unshare or delete of an entry of a job with a published story.
//
// The cache (and the record of dropped tags) is this app process's own: with several app
// instances, a shared cache handler (next.config cacheHandler) would be needed for a withdrawal
// to reach them all at once.

/** The tag every cached public page and its data of one shop carry. */
export const publicPagesTag = (shopSlug: string) => `public-pages:${shopSlug}`;

/**
 * How long a public page is served before it is rendered again on a visit, although nothing
 * dropped it: only for what changes without a writer of ours (a clip the video service finished
 * after the story went out). The pages' `export const revalidate` repeat it (Next reads it there
 * as a literal).
 */
export const PUBLIC_PAGE_SECONDS = 300;

// An address that can't be a shop's (ids.shop) has no page and never will: no tag, no cached data
// (nor odd characters in a tag).
const tagged = <T>(shopSlug: string, key: string[], load: () => Promise<T | null>): Promise<T | null> =>
  ids.shop.safeParse(shopSlug).success
    ? unstable_cache(load, ["public-pages", shopSlug, ...key], { tags: [publicPagesTag(shopSlug)], revalidate: PUBLIC_PAGE_SECONDS })()
    : Promise.resolve(null);

/** A published story as the page shows it, or null (not published, withdrawn, unknown). */
export function loadPublicStoryPage(shopSlug: string, storySlug: string) {
  return tagged(shopSlug, ["story", storySlug], async () => {
    const story = await getPublicStory(shopSlug, storySlug);
    if (!story?.cover) return story ? { ...story, coverInline: null } : null;
    // Kept with the page: made once per render of the page, not per visit.
    const keys = await publicPhotoKeys({ shopSlug, storySlug, photoPublicId: story.cover.id });
    return { ...story, coverInline: keys ? await photoInlineCopy(keys) : null };
  });
}

/** The shop's public page: profile, stories, opening hours; null when it has no public page. */
export function loadPublicShopPage(shopSlug: string) {
  return tagged(shopSlug, ["shop"], async () => {
    const [page, face] = await Promise.all([getPublicShopPage(shopSlug, null), getPublicFace({ slug: shopSlug })]);
    return page && face ? { ...page, openingHours: face.openingHours, timezone: face.timezone } : null;
  });
}

/**
 * Drops every cached public page of the shop; the next visit renders afresh, nobody is served the
 * old one ({ expire: 0 }: no stale-while-revalidate). Works in server actions and route handlers.
 */
export function dropPublicPages(shopSlug: string): void {
  revalidateTag(publicPagesTag(shopSlug), { expire: 0 });
}

/** After an entry of this job changed: drops the shop's public pages if a published story may show it. */
export async function dropPublicPagesForJob({ shopId, shopSlug, jobId }: { shopId: number; shopSlug: string; jobId: number }): Promise<void> {
  if (await jobHasPublishedStory({ shopId, jobId })) dropPublicPages(shopSlug);
}
