"use client";
import { useActionState } from "react";
import { Alert, Button, Field, Select, Textarea } from "@/components/ui";
import { FORM_VISIBLE, formBanner } from "@/lib/form-visible";
import { QUESTION_MAX } from "@/lib/questions";
import { askQuestionAction } from "../question-actions";

type Line = { no: number; description: string };

/**
 * The owner asks the shop. On the job page: a question about the job. On an approval request:
 * about one of its lines, picked from the list (the request and line numbers are the page's).
 */
export function AskForm({ jobPublicId, request }: { jobPublicId: string; request?: { publicId: string; lines: Line[]; initialLine?: number } }) {
  const [state, action, pending] = useActionState(askQuestionAction, null);
  const error = state && !state.ok ? state.error : null;
  const visible = request ? FORM_VISIBLE.askQuestion : FORM_VISIBLE.askQuestion.filter((f) => f !== "line");
  const banner = formBanner(error, visible);
  const idBase = request ? `ask-${request.publicId}` : "ask-job";
  return (
    <form action={action} className="space-y-3" noValidate>
      <input type="hidden" name="job" value={jobPublicId} />
      {request ? <input type="hidden" name="request" value={request.publicId} /> : null}
      {banner ? <Alert tone="error">{banner}</Alert> : null}
      {state?.ok ? (
        <Alert tone="success" title="Sent to the shop">
          Your question is on its way. The answer shows here and comes by e-mail.
        </Alert>
      ) : null}
      {request ? (
        <Field id={`${idBase}-line`} label="Which line" error={error?.fields?.line?.[0]}>
          <Select name="line" defaultValue={String(state && !state.ok ? (state.values?.line ?? request.initialLine ?? 1) : (request.initialLine ?? 1))}>
            {request.lines.map((l) => (
              <option key={l.no} value={l.no}>
                {`Line ${l.no}: ${l.description}`}
              </option>
            ))}
          </Select>
        </Field>
      ) : null}
      <Field id={`${idBase}-body`} label={request ? "Your question about this line" : "Your question"} hint="The shop answers here and by e-mail." error={error?.fields?.body?.[0]}>
        <Textarea name="body" rows={3} maxLength={QUESTION_MAX} defaultValue={state && !state.ok ? state.values?.body : ""} key={state?.ok ? `sent-${state.data.asked}` : "form"} required />
      </Field>
      <Button type="submit" loading={pending}>
        Ask the shop
      </Button>
    </form>
  );
}
