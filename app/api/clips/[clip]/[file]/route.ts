import { getClipAccess } from "@/db/queries/clips";
import { CLIP_MEDIA_FILES } from "@/lib/clips";
import { AppError } from "@/lib/errors";
import { PHOTO_ID_PATTERN } from "@/lib/journal";
import { can } from "@/lib/permissions";
import { route } from "@/lib/route";
import { audienceFor, jobResource } from "@/lib/server/following";
import { streamClipMedia } from "@/lib/server/video";

/**
 * GET /api/clips/:clip/video.mp4|poster.jpg — a ready clip, streamed from the video service for
 * staff of its shop, for its owner and followers while its entry is shared, and for the owner
 * when it is quoted in an approval request. Everyone else gets the same 404 as for no clip.
 */
export const GET = route<never, { clip: string; file: string }>({
  run: async ({ params, actor, req }) => {
    const notFound = new AppError("not_found", "No such clip.");
    if (!PHOTO_ID_PATTERN.test(params.clip) || !(CLIP_MEDIA_FILES as readonly string[]).includes(params.file)) throw notFound;
    const clip = await getClipAccess({ publicId: params.clip });
    if (!clip?.playbackId) throw notFound;
    const resource = await jobResource(actor, { id: clip.jobId, shopId: clip.shopId, customerUserId: clip.customerUserId });
    const audience = can(actor, "job:view", resource) ? audienceFor(actor, resource) : null;
    const allowed = audience === "shop" || (audience != null && clip.sharedWithOwner) || (audience === "owner" && clip.quotedInRequest);
    if (!allowed) throw notFound;

    return streamClipMedia(clip.playbackId, params.file as "video.mp4" | "poster.jpg", req, "private, max-age=300");
  },
});
