import { z } from "zod";
import { publicClipPlayback } from "@/db/queries/portfolio-public";
import { AppError } from "@/lib/errors";
import { mayViewMedia } from "@/lib/permissions";
import { PUBLIC_CLIP_FILES } from "@/lib/portfolio";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { streamClipMedia } from "@/lib/server/video";

/**
 * GET /s/:shop/:story/clips/:clip/video.mp4|poster.jpg — a clip of a published story, for
 * anyone, streamed on from the video service. Only a clip the story shows, still shared and
 * ready; once the story is withdrawn or taken down, the same 404 as for no clip.
 */
export const GET = route(
  { params: z.object({ shop: ids.shop, story: ids.story, clip: ids.media, file: z.enum(PUBLIC_CLIP_FILES) }), permission: "public" },
  async ({ params, req }) => {
    // Found only while a published story shows it (and its entry is still shared): the "public" branch of the media rule.
    const playbackId = await publicClipPlayback({ shopSlug: params.shop, storySlug: params.story, clipPublicId: params.clip });
    const facts = { shared: !!playbackId, moneyEntry: false, quotedInRequest: false, inPublishedStory: !!playbackId };
    if (!playbackId || !mayViewMedia("public", facts)) throw new AppError("not_found", "No such clip.");
    // Shared caches must ask again each time, so a withdrawal stops them at once too.
    return streamClipMedia(playbackId, params.file, req, "public, no-cache");
  },
);
