"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/action";
import { frequencySchema, inviteFollowerSchema, removeFollowerSchema } from "@/lib/schemas/following";
import { inviteFollowerAs, removeFollowerAs, setOwnFrequency } from "@/lib/server/following";

// The following card on the owner's job page. Each action declares its right on the job:
// the owner manages followers; each subscriber sets their own e-mail.

export const inviteFollowerAction = formAction(
  { input: inviteFollowerSchema, resource: "job", permission: "job:follow-manage" },
  async ({ input, actor, found }) => {
    await inviteFollowerAs(actor, found, input.email);
    revalidatePath(`/my/jobs/${input.job}`);
    return { invited: input.email };
  },
);

export const removeFollowerAction = formAction(
  { input: removeFollowerSchema, resource: "job", permission: "job:follow-manage" },
  async ({ input, found }) => {
    await removeFollowerAs(found, input.subscriber);
    revalidatePath(`/my/jobs/${input.job}`);
    return { removed: input.subscriber };
  },
);

export const setFrequencyAction = formAction({ input: frequencySchema, resource: "job", permission: "job:follow" }, async ({ input, actor, found }) => {
  await setOwnFrequency(actor, found, input.frequency);
  revalidatePath(`/my/jobs/${input.job}`);
  return { frequency: input.frequency };
});
