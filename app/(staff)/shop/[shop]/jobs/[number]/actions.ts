"use server";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { formAction } from "@/lib/action";
import { JOB_STATUSES } from "@/lib/job-status";
import { ids } from "@/lib/server/access";
import { changeJobStatus } from "@/lib/server/journal";

const statusChangeSchema = z.object({
  job: ids.job,
  from: z.enum(JOB_STATUSES),
  to: z.enum(JOB_STATUSES, { message: "Choose where the job goes next." }),
  note: z
    .string()
    .trim()
    .max(500, "Keep the note under 500 characters.")
    .transform((s) => s || null),
  // Handing back before the invoice is paid: why (recorded in the history).
  override: z
    .string()
    .trim()
    .max(300, "Keep the reason under 300 characters.")
    .optional()
    .transform((s) => s || null),
});

/** Moves a job along; the rules in lib/job-status.ts decide which moves exist. */
export const changeStatusAction = formAction(
  { input: statusChangeSchema, resource: "job", permission: "job:change-status" },
  async ({ input, actor, found }) => {
    const job = await changeJobStatus(actor, found, input);
    revalidatePath(`/shop/${job.shopSlug}/jobs/${job.number}`);
    return { to: input.to };
  },
);
