import { z } from "zod";
import { PHOTO_ROUTE_SIZES } from "@/lib/journal";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { evidencePhoto } from "@/lib/server/approval-evidence";

/**
 * GET /api/approvals/:request/evidence/:photo/thumb|display|w640|w960|w1280 — a photo that is evidence of this
 * request, for the job's staff and owner; `?t=` (the request e-mail's token) opens the thumbnail
 * without a session. Anything else is the same 404 as a photo that doesn't exist.
 *
 * Declared public because the token stands in for a session (mail clients send no cookies);
 * without a token, evidencePhoto applies the "request" resolver with "job:view" (401 when signed out).
 */
export const GET = route(
  {
    params: z.object({ request: ids.request, photo: ids.media, size: z.enum(PHOTO_ROUTE_SIZES) }),
    query: z.object({ t: z.string().optional() }),
    permission: "public",
  },
  async ({ params, query, actor }) => {
    const object = await evidencePhoto({ actor, requestPublicId: params.request, photoPublicId: params.photo, size: params.size, token: query.t || null });
    return new Response(new Uint8Array(object.body), {
      headers: {
        "content-type": object.contentType,
        "content-length": String(object.size),
        "cache-control": "private, max-age=3600",
        "x-content-type-options": "nosniff",
      },
    });
  },
);
