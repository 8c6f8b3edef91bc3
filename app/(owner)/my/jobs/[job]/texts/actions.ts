"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/action";
import { stopTextsSchema, textChoiceSchema } from "@/lib/schemas/texts";
import { chooseTextsAs, stopTextsAs } from "@/lib/server/texts";

// The owner's texts page: how the shop reaches them, and their consent to texts. The machine's
// owner only (texts:choose): followers and staff can't agree to texts for them.

export const chooseTextsAction = formAction({ input: textChoiceSchema, resource: "job", permission: "texts:choose" }, async ({ input, actor, found }) => {
  const chosen = await chooseTextsAs(actor, found, input);
  revalidatePath(`/my/jobs/${input.job}/texts`);
  return chosen;
});

export const stopTextsAction = formAction({ input: stopTextsSchema, resource: "job", permission: "texts:choose" }, async ({ input, actor, found }) => {
  await stopTextsAs(actor, found);
  revalidatePath(`/my/jobs/${input.job}/texts`);
  return { stopped: true };
});
