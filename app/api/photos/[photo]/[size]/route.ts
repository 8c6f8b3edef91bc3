import { z } from "zod";
import { PHOTO_ROUTE_SIZES } from "@/lib/journal";
import { AppError } from "@/lib/errors";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { photoRendition } from "@/lib/server/photos";

/**
 * GET /api/photos/:photo/thumb|display|w640|w960|w1280 — the image (or a narrower copy of the
 * display rendition, for srcset), for whoever the media rule (`mayViewMedia`, lib/permissions.ts)
 * lets see it: the resolver checks every request, copies included. Everyone else gets the same
 * 404 as for a photo that doesn't exist, so shop-only photos can't be found by guessing.
 */
export const GET = route(
  { params: z.object({ photo: ids.media, size: z.enum(PHOTO_ROUTE_SIZES) }), resource: "photo", permission: "job:view" },
  async ({ params, found: { photo } }) => {
    const object = await photoRendition(photo, params.size);
    if (!object) throw new AppError("not_found", "No such photo.");
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
);
