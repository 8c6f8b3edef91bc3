"use server";
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { formAction } from "@/lib/action";
import { draftSetFindingSchema, measurementSetSchema } from "@/lib/schemas/measurements";
import { draftFindingFromSet, recordMeasurementSet } from "@/lib/server/measurements";

// The bench page's measurement sets (issue 18 §5): record a set; draft a finding from one with an
// item out of limit, which opens the draft for the technician to finish.

export const recordMeasurementSetAction = formAction({ input: measurementSetSchema, resource: "job", permission: "bench:record" }, async ({ input, actor, found }) => {
  const made = await recordMeasurementSet(actor, found, input);
  revalidatePath(`/shop/${made.job.shopSlug}/jobs/${made.job.number}/bench`);
  revalidatePath(`/shop/${made.job.shopSlug}/jobs/${made.job.number}`);
  return { id: made.id, out: made.out };
});

export const draftSetFindingAction = formAction({ input: draftSetFindingSchema, resource: "job", permission: "approvals:draft" }, async ({ input, actor, found }) => {
  const made = await draftFindingFromSet(actor, found, input.set);
  revalidatePath(`/shop/${made.job.shopSlug}/jobs/${made.job.number}/bench`);
  redirect(`/shop/${made.job.shopSlug}/jobs/${made.job.number}/findings/${made.findingId}`);
});
