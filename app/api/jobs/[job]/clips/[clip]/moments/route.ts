import { z } from "zod";
import { addClipMoment } from "@/db/queries/clips";
import { newMomentSchema } from "@/lib/schemas/clips";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";

/** POST /api/jobs/:job/clips/:clip/moments {atSeconds, label} — marks a moment in a ready clip of this job. */
export const POST = route(
  { params: z.object({ job: ids.job, clip: ids.media }), body: newMomentSchema, resource: "job", permission: "journal:post" },
  ({ body, params, found: { job }, actor }) =>
    addClipMoment({ shopId: job.shopId, jobId: job.id, clipPublicId: params.clip, atMs: Math.round(body.atSeconds * 1000), label: body.label, userId: actor.userId }),
);
