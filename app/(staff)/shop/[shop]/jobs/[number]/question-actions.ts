"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/action";
import { answerQuestionSchema } from "@/lib/schemas/questions";
import { answerAs } from "@/lib/server/questions";

// The desk answers an owner's question from the staff job page (lib/server/questions.ts): the
// answer goes on the thread and to the owner by e-mail; the inbox item clears.
export const answerQuestionAction = formAction({ input: answerQuestionSchema, resource: "job", permission: "questions:answer" }, async ({ input, actor, found }) => {
  const { id } = await answerAs(actor, found, input);
  revalidatePath(`/shop/${found.job.shopSlug}/jobs/${found.job.number}`);
  revalidatePath(`/my/jobs/${input.job}`, "layout");
  return { answered: id };
});
