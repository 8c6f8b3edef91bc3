"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/action";
import { askQuestionSchema } from "@/lib/schemas/questions";
import { askAs } from "@/lib/server/questions";

// The owner asks the shop a question about the job, or about a line of one of its requests
// (lib/server/questions.ts). Only the machine's owner may: `questions:ask`.
export const askQuestionAction = formAction({ input: askQuestionSchema, resource: "job", permission: "questions:ask" }, async ({ input, actor, found }) => {
  const { id } = await askAs(actor, found, input);
  revalidatePath(`/my/jobs/${input.job}`, "layout");
  revalidatePath(`/shop/${found.job.shopSlug}/jobs/${found.job.number}`);
  return { asked: id };
});
