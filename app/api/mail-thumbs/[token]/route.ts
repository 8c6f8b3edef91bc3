import { z } from "zod";
import { getPhotoAccess } from "@/db/queries/journal";
import { AppError } from "@/lib/errors";
import { mayViewMedia } from "@/lib/permissions";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { readMailThumbToken } from "@/lib/server/signed-token";
import { storage } from "@/lib/server/storage";

/**
 * GET /api/mail-thumbs/:token — a photo's thumbnail for an e-mail. Mail clients load images
 * without our cookies, so the signed, expiring token (lib/server/signed-token.ts) is the right
 * to see it, as a follower would (the media rule's "follower": shared, not on a money entry).
 */
export const GET = route({ params: z.object({ token: z.string().max(400) }), permission: "public" }, async ({ params }) => {
  const notFound = new AppError("not_found", "No such photo.");
  const photoId = ids.media.safeParse(readMailThumbToken(params.token));
  const photo = photoId.success ? await getPhotoAccess({ publicId: photoId.data }) : null;
  if (!photo || !mayViewMedia("follower", { ...photo, inPublishedStory: false })) throw notFound;
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
});
