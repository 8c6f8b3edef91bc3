import { publicPhotoKeys } from "@/db/queries/portfolio-public";
import { AppError } from "@/lib/errors";
import { PHOTO_ID_PATTERN, PHOTO_SIZES, type PhotoSize } from "@/lib/journal";
import { SHOP_SLUG_PATTERN, STORY_SLUG_PATTERN } from "@/lib/portfolio";
import { route } from "@/lib/route";
import { storage } from "@/lib/server/storage";

/**
 * GET /s/:shop/:story/photos/:photo/thumb|display — a photo of a published story, for anyone.
 * Only photos the story shows (its cover, its photo items, photos in a set it shows) whose entry
 * is still shared; anything else, or once the story is withdrawn or taken down, is the same 404.
 * Renditions were re-encoded on upload with no EXIF/GPS. Shared caches must ask again each time
 * (no-cache + ETag), so a withdrawal also stops them at once; an unchanged photo costs a 304.
 */
export const GET = route<never, { shop: string; story: string; photo: string; size: string }, true>({
  public: true,
  run: async ({ params, req }) => {
    const notFound = new AppError("not_found", "No such photo.");
    if (!SHOP_SLUG_PATTERN.test(params.shop) || !STORY_SLUG_PATTERN.test(params.story) || !PHOTO_ID_PATTERN.test(params.photo)) throw notFound;
    if (!(PHOTO_SIZES as readonly string[]).includes(params.size)) throw notFound;
    const keys = await publicPhotoKeys({ shopSlug: params.shop, storySlug: params.story, photoPublicId: params.photo });
    if (!keys) throw notFound;
    // Renditions never change under a key: the key names the version.
    const key = (params.size as PhotoSize) === "thumb" ? keys.thumbKey : keys.displayKey;
    const etag = `"${Buffer.from(key).toString("base64url")}"`;
    const headers = { "cache-control": "public, no-cache", etag, "x-content-type-options": "nosniff" };
    if (req.headers.get("if-none-match") === etag) return new Response(null, { status: 304, headers });
    const object = await storage().get(key);
    if (!object) throw notFound;
    return new Response(new Uint8Array(object.body), { headers: { ...headers, "content-type": object.contentType, "content-length": String(object.size) } });
  },
});
