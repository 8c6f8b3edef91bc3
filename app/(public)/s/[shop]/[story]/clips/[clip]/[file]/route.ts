import { publicClipPlayback } from "@/db/queries/portfolio-public";
import { AppError } from "@/lib/errors";
import { PHOTO_ID_PATTERN } from "@/lib/journal";
import { PUBLIC_CLIP_FILES, SHOP_SLUG_PATTERN, STORY_SLUG_PATTERN } from "@/lib/portfolio";
import { route } from "@/lib/route";
import { streamClipMedia } from "@/lib/server/video";

/**
 * GET /s/:shop/:story/clips/:clip/video.mp4|poster.jpg — a clip of a published story, for
 * anyone, streamed on from the video service. Only a clip the story shows, still shared and
 * ready; once the story is withdrawn or taken down, the same 404 as for no clip.
 */
export const GET = route<never, { shop: string; story: string; clip: string; file: string }, true>({
  public: true,
  run: async ({ params, req }) => {
    const notFound = new AppError("not_found", "No such clip.");
    if (!SHOP_SLUG_PATTERN.test(params.shop) || !STORY_SLUG_PATTERN.test(params.story) || !PHOTO_ID_PATTERN.test(params.clip)) throw notFound;
    if (!(PUBLIC_CLIP_FILES as readonly string[]).includes(params.file)) throw notFound;
    const playbackId = await publicClipPlayback({ shopSlug: params.shop, storySlug: params.story, clipPublicId: params.clip });
    if (!playbackId) throw notFound;
    // Shared caches must ask again each time, so a withdrawal stops them at once too.
    return streamClipMedia(playbackId, params.file as "video.mp4" | "poster.jpg", req, "public, no-cache");
  },
});
