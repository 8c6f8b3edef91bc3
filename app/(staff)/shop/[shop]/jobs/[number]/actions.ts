"use server";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getJobByPublicId } from "@/db/queries/jobs";
import { moveJobStatus } from "@/db/queries/journal";
import { formAction } from "@/lib/action";
import { AppError } from "@/lib/errors";
import { JOB_STATUSES, JOB_STATUS_LABEL, statusMoveError } from "@/lib/job-status";
import { JOB_PUBLIC_ID_PATTERN } from "@/lib/journal";
import { can } from "@/lib/permissions";
import { authorize } from "@/lib/server/authorize";

const statusChangeSchema = z.object({
  job: z.string().regex(JOB_PUBLIC_ID_PATTERN, "No such job."),
  from: z.enum(JOB_STATUSES),
  to: z.enum(JOB_STATUSES, { message: "Choose where the job goes next." }),
  note: z
    .string()
    .trim()
    .max(500, "Keep the note under 500 characters.")
    .transform((s) => s || null),
});

/** Moves a job along; the rules in lib/job-status.ts decide which moves exist. */
export const changeStatusAction = formAction({
  input: statusChangeSchema,
  run: async ({ input, actor }) => {
    const job = await getJobByPublicId({ publicId: input.job });
    const resource = job && { shopId: job.shopId, customerUserId: job.customerUserId };
    if (!job || !resource || !can(actor, "job:view", resource)) throw new AppError("not_found", "No such job.");
    authorize(actor, "job:change-status", resource);
    if (job.status !== input.from) {
      throw new AppError("conflict", `Someone else has just moved this job to "${JOB_STATUS_LABEL[job.status]}". Check the timeline, then try again.`);
    }
    const refusal = statusMoveError(job.status, input.to);
    if (refusal) throw new AppError("invalid", refusal, { to: [refusal] });
    const moved = await moveJobStatus({ shopId: job.shopId, jobId: job.id, from: input.from, to: input.to, userId: actor.userId, note: input.note });
    if (!moved) throw new AppError("conflict", "Someone else moved this job at the same moment. Check the timeline, then try again.");
    revalidatePath(`/shop/${job.shopSlug}/jobs/${job.number}`);
    return { to: input.to };
  },
});
