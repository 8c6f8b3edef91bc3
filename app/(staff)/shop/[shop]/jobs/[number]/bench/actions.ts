"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/action";
import {
  chainReadingSchema,
  partSchema,
  partStatusSchema,
  readingSchema,
  stepFlagSchema,
  stepTorqueSchema,
  teardownDeleteSchema,
  teardownEditSchema,
  teardownStepSchema,
  torqueRecordSchema,
} from "@/lib/schemas/bench";
import { addTeardownStep, markStepReplaced, recordChainReading, recordReading, recordTorque, setTeardownTorque, tickTeardownStep } from "@/lib/server/bench";
import { addJobPart, changeJobPartStatus } from "@/lib/server/bench-parts";
import { deleteTeardownStep, editTeardownStep } from "@/lib/server/teardown-edit";

// The bench page's forms. Each one: zod schema and the job it names, authorised by its declaration
// → lib/server/bench (checks with the domain modules, writes the row and its entry together) →
// refresh the bench and job pages.

function refresh(job: { shopSlug: string; number: number }) {
  revalidatePath(`/shop/${job.shopSlug}/jobs/${job.number}/bench`);
  revalidatePath(`/shop/${job.shopSlug}/jobs/${job.number}`);
}

export const recordTorqueAction = formAction({ input: torqueRecordSchema, resource: "job", permission: "bench:record" }, async ({ input, actor, found }) => {
  const made = await recordTorque(actor, found, input);
  refresh(made.job);
  return { id: made.id };
});

export const recordReadingAction = formAction({ input: readingSchema, resource: "job", permission: "bench:record" }, async ({ input, actor, found }) => {
  const made = await recordReading(actor, found, input);
  refresh(made.job);
  return { id: made.id };
});

export const recordChainAction = formAction({ input: chainReadingSchema, resource: "job", permission: "bench:record" }, async ({ input, actor, found }) => {
  const made = await recordChainReading(actor, found, input);
  refresh(made.job);
  return { id: made.id, verdict: made.check.verdict };
});

export const addTeardownStepAction = formAction({ input: teardownStepSchema, resource: "job", permission: "bench:record" }, async ({ input, actor, found }) => {
  const made = await addTeardownStep(actor, found, input);
  refresh(made.job);
  return { id: made.id, seq: made.seq };
});

// Issue 18 §7: a logged step changes with a trail (the step as it was, who, when); refused once collected.
export const editTeardownStepAction = formAction({ input: teardownEditSchema, resource: "job", permission: "bench:record" }, async ({ input, actor, found }) => {
  const made = await editTeardownStep(actor, found, input);
  refresh(made.job);
  return { step: input.step, version: made.version };
});

export const deleteTeardownStepAction = formAction({ input: teardownDeleteSchema, resource: "job", permission: "bench:record" }, async ({ input, actor, found }) => {
  const made = await deleteTeardownStep(actor, found, input);
  refresh(made.job);
  return { step: input.step, jobMovedTo: made.jobMovedTo };
});

export const setStepTorqueAction = formAction({ input: stepTorqueSchema, resource: "job", permission: "bench:record" }, async ({ input, actor, found }) => {
  refresh((await setTeardownTorque(actor, found, input)).job);
  return { step: input.step };
});

export const tickStepAction = formAction({ input: stepFlagSchema, resource: "job", permission: "bench:record" }, async ({ input, actor, found }) => {
  refresh((await tickTeardownStep(actor, found, input)).job);
  return { step: input.step };
});

export const markReplacedAction = formAction({ input: stepFlagSchema, resource: "job", permission: "bench:record" }, async ({ input, actor, found }) => {
  refresh((await markStepReplaced(actor, found, input)).job);
  return { step: input.step };
});

export const addPartAction = formAction({ input: partSchema, resource: "job", permission: "parts:manage" }, async ({ input, actor, found }) => {
  const made = await addJobPart(actor, found, input);
  refresh(made.job);
  return { id: made.id, jobMovedTo: made.jobMovedTo };
});

export const changePartStatusAction = formAction({ input: partStatusSchema, resource: "job", permission: "parts:manage" }, async ({ input, actor, found }) => {
  const made = await changeJobPartStatus(actor, found, input);
  refresh(made.job);
  return { jobMovedTo: made.jobMovedTo };
});
