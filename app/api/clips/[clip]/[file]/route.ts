import { z } from "zod";
import { CLIP_MEDIA_FILES } from "@/lib/clips";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { streamClipMedia } from "@/lib/server/video";

/**
 * GET /api/clips/:clip/video.mp4|poster.jpg — a ready clip, streamed from the video service for
 * whoever the media rule (`mayViewMedia`, lib/permissions.ts) lets see it. Everyone else gets
 * the same 404 as for no clip.
 */
export const GET = route(
  { params: z.object({ clip: ids.media, file: z.enum(CLIP_MEDIA_FILES) }), resource: "clip", permission: "job:view" },
  ({ params, found: { clip }, req }) => streamClipMedia(clip.playbackId, params.file, req, "private, max-age=300"),
);
