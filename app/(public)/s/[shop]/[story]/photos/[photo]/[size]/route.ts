import { z } from "zod";
import { publicPhotoKeys } from "@/db/queries/portfolio-public";
import { AppError } from "@/lib/errors";
import { PHOTO_ROUTE_SIZES, photoWidthOf } from "@/lib/journal";
import { mayViewMedia } from "@/lib/permissions";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { photoRendition, variantKey } from "@/lib/server/photos";

/**
 * GET /s/:shop/:story/photos/:photo/thumb|display|w640|w960|w1280 — a photo of a published
 * story (or a narrower copy of its display rendition, for srcset), for anyone.
 * Only photos the story shows (its cover, its photo items, photos in a set it shows) whose entry
 * is still shared; anything else, or once the story is withdrawn or taken down, is the same 404.
 * Renditions were re-encoded on upload with no EXIF/GPS. Shared caches must ask again each time
 * (no-cache + ETag), so a withdrawal also stops them at once; an unchanged photo costs a 304.
 */
export const GET = route(
  { params: z.object({ shop: ids.shop, story: ids.story, photo: ids.media, size: z.enum(PHOTO_ROUTE_SIZES) }), permission: "public" },
  async ({ params, req }) => {
    // Found only while a published story shows it (and its entry is still shared): the "public" branch of the media rule.
    const keys = await publicPhotoKeys({ shopSlug: params.shop, storySlug: params.story, photoPublicId: params.photo });
    const facts = { shared: !!keys, moneyEntry: false, quotedInRequest: false, inPublishedStory: !!keys };
    if (!keys || !mayViewMedia("public", facts)) throw new AppError("not_found", "No such photo.");
    // Renditions never change under a key: the key names the version.
    const key = params.size === "thumb" ? keys.thumbKey : (variantKey(keys.displayKey, photoWidthOf(params.size)) ?? keys.displayKey);
    const etag = `"${Buffer.from(key).toString("base64url")}"`;
    const headers = { "cache-control": "public, no-cache", etag, "x-content-type-options": "nosniff" };
    if (req.headers.get("if-none-match") === etag) return new Response(null, { status: 304, headers });
    const object = await photoRendition(keys, params.size);
    if (!object) throw new AppError("not_found", "No such photo.");
    return new Response(new Uint8Array(object.body), { headers: { ...headers, "content-type": object.contentType, "content-length": String(object.size) } });
  },
);
