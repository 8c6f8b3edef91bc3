// The question forms' inputs (lib/questions.ts holds the pure helpers the components use).
import { z } from "zod";
import { QUESTION_MAX } from "@/lib/questions";
import { REQUEST_PUBLIC_ID_PATTERN } from "./approvals";
import { jobPublicIdField } from "./following";

const body = (empty: string) =>
  z
    .string({ error: empty })
    .trim()
    .min(1, empty)
    .max(QUESTION_MAX, `Keep it under ${QUESTION_MAX} characters.`);

/** The owner asks: on the job page (no line), or on a line of a request (request + line filled by the page). */
export const askQuestionSchema = z
  .object({
    job: jobPublicIdField,
    body: body("Write your question first."),
    request: z.string().regex(REQUEST_PUBLIC_ID_PATTERN, "No such approval request. Reload the page and ask again.").optional(),
    line: z.coerce.number({ error: "No such line. Reload the page and ask again." }).int("No such line. Reload the page and ask again.").min(1, "No such line. Reload the page and ask again.").max(999, "No such line. Reload the page and ask again.").optional(),
  })
  .refine((v) => (v.request === undefined) === (v.line === undefined), { message: "Name both the request and its line, or neither. Reload the page and ask again.", path: ["line"] });

/** The desk answers one question. */
export const answerQuestionSchema = z.object({
  job: jobPublicIdField,
  question: z.coerce.number({ error: "No such question. Reload the page." }).int("No such question. Reload the page.").positive("No such question. Reload the page."),
  body: body("Write the answer first."),
});

export type AskQuestionInput = z.output<typeof askQuestionSchema>;
export type AnswerQuestionInput = z.output<typeof answerQuestionSchema>;
