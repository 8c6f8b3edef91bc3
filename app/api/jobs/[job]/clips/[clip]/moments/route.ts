import { addClipMoment } from "@/db/queries/clips";
import { newMomentSchema } from "@/lib/clips";
import { route } from "@/lib/route";
import { journalAccess } from "@/lib/server/journal";

/** POST /api/jobs/:job/clips/:clip/moments {atSeconds, label} — marks a moment in a ready clip. */
export const POST = route<typeof newMomentSchema, { job: string; clip: string }>({
  input: newMomentSchema,
  run: async ({ input, params, actor }) => {
    const { job } = await journalAccess(actor, params.job, "journal:post");
    return addClipMoment({ shopId: job.shopId, jobId: job.id, clipPublicId: params.clip, atMs: Math.round(input.atSeconds * 1000), label: input.label, userId: actor.userId });
  },
});
