import "server-only";
import { unstable_cache } from "next/cache";
import type { PublicStory } from "@/lib/portfolio";
import { buildPublicStory, publicStoryGate } from "@/lib/server/portfolio-public";

// Public story pages render per request, but only a small check runs every time: is this story
// published right now, at which version, and when did what it shows last change? The body
// (several queries) is cached under those, so a change shows at once and a withdrawn or
// unpublished story is a 404 on the very next request, on every app instance, whatever the cache
// holds. Tags let a change also drop the old entry early rather than leave it to expire.

export const storyCacheTag = (storyId: number) => `portfolio-story:${storyId}`;
export const shopCacheTag = (shopId: number) => `portfolio-shop:${shopId}`;

/** How long an unused cached body is kept; correctness never depends on it. */
const BODY_TTL_SECONDS = 300;

export async function loadPublicStoryPage(shopSlug: string, storySlug: string): Promise<PublicStory | null> {
  const gate = await publicStoryGate(shopSlug, storySlug);
  if (!gate) return null;
  const build = unstable_cache(() => buildPublicStory({ shopId: gate.shopId, storyId: gate.storyId, shopSlug }), ["public-story", shopSlug, String(gate.storyId), String(gate.version), gate.contentKey], {
    tags: [storyCacheTag(gate.storyId), shopCacheTag(gate.shopId)],
    revalidate: BODY_TTL_SECONDS,
  });
  return build();
}
