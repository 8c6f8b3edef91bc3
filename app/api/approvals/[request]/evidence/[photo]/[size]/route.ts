import { route } from "@/lib/route";
import { evidencePhoto } from "@/lib/server/approval-evidence";
import { getActor } from "@/lib/server/actor";

/**
 * GET /api/approvals/:request/evidence/:photo/thumb|display — a photo that is evidence of this
 * request, for the job's staff and owner; `?t=` (the request e-mail's token) opens the thumbnail
 * without a session. Anything else is the same 404 as a photo that doesn't exist.
 */
export const GET = route<never, { request: string; photo: string; size: string }, true>({
  public: true,
  run: async ({ params, req }) => {
    const token = req.nextUrl.searchParams.get("t");
    const object = await evidencePhoto({ actor: token ? null : await getActor(), requestPublicId: params.request, photoPublicId: params.photo, size: params.size, token });
    return new Response(new Uint8Array(object.body), {
      headers: {
        "content-type": object.contentType,
        "content-length": String(object.size),
        "cache-control": "private, max-age=3600",
        "x-content-type-options": "nosniff",
      },
    });
  },
});
