"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/action";
import { frequencySchema, inviteFollowerSchema, removeFollowerSchema } from "@/lib/following";
import { inviteFollowerAs, removeFollowerAs, setOwnFrequency } from "@/lib/server/following";

// The following card on the owner's job page. Each action checks its own right on the job
// (lib/server/following.ts): the owner manages followers; each subscriber sets their own e-mail.

export const inviteFollowerAction = formAction({
  input: inviteFollowerSchema,
  run: async ({ input, actor }) => {
    await inviteFollowerAs(actor, input.job, input.email);
    revalidatePath(`/my/jobs/${input.job}`);
    return { invited: input.email };
  },
});

export const removeFollowerAction = formAction({
  input: removeFollowerSchema,
  run: async ({ input, actor }) => {
    await removeFollowerAs(actor, input.job, input.subscriber);
    revalidatePath(`/my/jobs/${input.job}`);
    return { removed: input.subscriber };
  },
});

export const setFrequencyAction = formAction({
  input: frequencySchema,
  run: async ({ input, actor }) => {
    await setOwnFrequency(actor, input.job, input.frequency);
    revalidatePath(`/my/jobs/${input.job}`);
    return { frequency: input.frequency };
  },
});
