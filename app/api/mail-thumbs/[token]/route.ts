import { getPhotoAccess } from "@/db/queries/journal";
import { AppError } from "@/lib/errors";
import { PHOTO_ID_PATTERN } from "@/lib/journal";
import { route } from "@/lib/route";
import { readMailThumbToken } from "@/lib/server/signed-token";
import { storage } from "@/lib/server/storage";

/**
 * GET /api/mail-thumbs/:token — a photo's thumbnail for an e-mail. Mail clients load images
 * without our cookies, so the signed, expiring token (lib/server/signed-token.ts) is the right
 * to see it; the photo must still be shared and not on a money entry, as for a follower.
 */
export const GET = route<never, { token: string }, true>({
  public: true,
  run: async ({ params }) => {
    const notFound = new AppError("not_found", "No such photo.");
    const photoId = readMailThumbToken(params.token);
    if (!photoId || !PHOTO_ID_PATTERN.test(photoId)) throw notFound;
    const photo = await getPhotoAccess({ publicId: photoId });
    if (!photo || !photo.sharedWithOwner || photo.moneyEntry) throw notFound;
    const object = await storage().get(photo.thumbKey);
    if (!object) throw notFound;
    return new Response(new Uint8Array(object.body), {
      headers: {
        "content-type": object.contentType,
        "content-length": String(object.size),
        // Private: whoever holds the mail may look, a shared cache may not keep it for others.
        "cache-control": "private, max-age=86400",
        "x-content-type-options": "nosniff",
      },
    });
  },
});
