import { getPhotoAccess } from "@/db/queries/journal";
import { AppError } from "@/lib/errors";
import { PHOTO_ID_PATTERN, PHOTO_SIZES, type PhotoSize } from "@/lib/journal";
import { can } from "@/lib/permissions";
import { route } from "@/lib/route";
import { audienceFor, jobResource } from "@/lib/server/following";
import { storage } from "@/lib/server/storage";

/**
 * GET /api/photos/:photo/thumb|display — the image, for staff of its shop, or for the job's
 * owner and followers while its entry is shared (followers: not on money or decision entries). Everyone else gets the same 404 as for a photo that
 * doesn't exist, so shop-only photos can't be found by guessing.
 */
export const GET = route<never, { photo: string; size: string }>({
  run: async ({ params, actor }) => {
    const notFound = new AppError("not_found", "No such photo.");
    if (!PHOTO_ID_PATTERN.test(params.photo) || !(PHOTO_SIZES as readonly string[]).includes(params.size)) throw notFound;
    const photo = await getPhotoAccess({ publicId: params.photo });
    if (!photo) throw notFound;
    const resource = await jobResource(actor, { id: photo.jobId, shopId: photo.shopId, customerUserId: photo.customerUserId });
    const audience = can(actor, "job:view", resource) ? audienceFor(actor, resource) : null;
    const allowed = audience === "shop" || (photo.sharedWithOwner && (audience === "owner" || (audience === "follower" && !photo.moneyEntry)));
    if (!allowed) throw notFound;
    const object = await storage().get((params.size as PhotoSize) === "thumb" ? photo.thumbKey : photo.displayKey);
    if (!object) throw notFound;
    return new Response(new Uint8Array(object.body), {
      headers: {
        "content-type": object.contentType,
        "content-length": String(object.size),
        // Private: a shared cache must never hand one person's photo to another.
        "cache-control": "private, max-age=3600",
        "x-content-type-options": "nosniff",
      },
    });
  },
});
