"use client";
import { useActionState } from "react";
import { Alert, Button, Field, Textarea } from "@/components/ui";
import { FORM_VISIBLE, formBanner } from "@/lib/form-visible";
import { QUESTION_MAX } from "@/lib/questions";
import { answerQuestionAction } from "../question-actions";

/** The desk's answer to one open question; it goes to the owner by e-mail and clears the inbox item. */
export function AnswerQuestionForm({ jobPublicId, questionId }: { jobPublicId: string; questionId: number }) {
  const [state, action, pending] = useActionState(answerQuestionAction, null);
  const error = state && !state.ok ? state.error : null;
  const banner = formBanner(error, FORM_VISIBLE.answerQuestion);
  return (
    <form action={action} className="space-y-2" noValidate>
      <input type="hidden" name="job" value={jobPublicId} />
      <input type="hidden" name="question" value={questionId} />
      {banner ? <Alert tone="error">{banner}</Alert> : null}
      <Field id={`answer-${questionId}`} label="Your answer" hint="The owner gets it by e-mail and sees it on their job page." error={error?.fields?.body?.[0]}>
        <Textarea name="body" rows={3} maxLength={QUESTION_MAX} defaultValue={state && !state.ok ? state.values?.body : ""} required />
      </Field>
      <Button type="submit" loading={pending}>
        Send the answer
      </Button>
    </form>
  );
}
