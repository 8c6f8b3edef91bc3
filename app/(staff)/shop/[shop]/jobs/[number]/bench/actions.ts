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
  teardownStepSchema,
  torqueRecordSchema,
} from "@/lib/schemas/bench";
import { addTeardownStep, markStepReplaced, recordChainReading, recordReading, recordTorque, setTeardownTorque, tickTeardownStep } from "@/lib/server/bench";
import { addJobPart, changeJobPartStatus } from "@/lib/server/bench-parts";

// The bench page's forms. Each one: zod schema → lib/server/bench (authorises on the job, checks
// with the domain modules, writes the row and its entry together) → refresh the bench and job pages.

function refresh(job: { shopSlug: string; number: number }) {
  revalidatePath(`/shop/${job.shopSlug}/jobs/${job.number}/bench`);
  revalidatePath(`/shop/${job.shopSlug}/jobs/${job.number}`);
}

export const recordTorqueAction = formAction({
  input: torqueRecordSchema,
  run: async ({ input, actor }) => {
    const made = await recordTorque(actor, input);
    refresh(made.job);
    return { id: made.id };
  },
});

export const recordReadingAction = formAction({
  input: readingSchema,
  run: async ({ input, actor }) => {
    const made = await recordReading(actor, input);
    refresh(made.job);
    return { id: made.id };
  },
});

export const recordChainAction = formAction({
  input: chainReadingSchema,
  run: async ({ input, actor }) => {
    const made = await recordChainReading(actor, input);
    refresh(made.job);
    return { id: made.id, verdict: made.check.verdict };
  },
});

export const addTeardownStepAction = formAction({
  input: teardownStepSchema,
  run: async ({ input, actor }) => {
    const made = await addTeardownStep(actor, input);
    refresh(made.job);
    return { id: made.id, seq: made.seq };
  },
});

export const setStepTorqueAction = formAction({
  input: stepTorqueSchema,
  run: async ({ input, actor }) => {
    refresh((await setTeardownTorque(actor, input)).job);
    return { step: input.step };
  },
});

export const tickStepAction = formAction({
  input: stepFlagSchema,
  run: async ({ input, actor }) => {
    refresh((await tickTeardownStep(actor, input)).job);
    return { step: input.step };
  },
});

export const markReplacedAction = formAction({
  input: stepFlagSchema,
  run: async ({ input, actor }) => {
    refresh((await markStepReplaced(actor, input)).job);
    return { step: input.step };
  },
});

export const addPartAction = formAction({
  input: partSchema,
  run: async ({ input, actor }) => {
    const made = await addJobPart(actor, input);
    refresh(made.job);
    return { id: made.id, jobMovedTo: made.jobMovedTo };
  },
});

export const changePartStatusAction = formAction({
  input: partStatusSchema,
  run: async ({ input, actor }) => {
    const made = await changeJobPartStatus(actor, input);
    refresh(made.job);
    return { jobMovedTo: made.jobMovedTo };
  },
});
