"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/action";
import { statusChangeFields } from "@/lib/schemas/jobs";
import { ids } from "@/lib/server/access";
import { changeJobStatus } from "@/lib/server/journal";

/** Moves a job along; the rules in lib/job-status.ts decide which moves exist. */
export const changeStatusAction = formAction(
  { input: statusChangeFields.extend({ job: ids.job }), resource: "job", permission: "job:change-status" },
  async ({ input, actor, found }) => {
    const job = await changeJobStatus(actor, found, input);
    revalidatePath(`/shop/${job.shopSlug}/jobs/${job.number}`);
    return { to: input.to };
  },
);
