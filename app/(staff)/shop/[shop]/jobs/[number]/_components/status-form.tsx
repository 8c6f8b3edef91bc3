"use client";
import { useActionState, useEffect, useMemo } from "react";
import { QueuedNotice } from "@/components/journal/outbox-panel";
import { type Queued, isQueued, offlineCapable } from "@/lib/client/queue-post";
import { Alert, Button, Field, Input, Select } from "@/components/ui";
import type { ActionState } from "@/lib/action";
import { JOB_STATUS_LABEL, NEXT_STATUSES, type JobStatus } from "@/lib/job-status";
import { SUGGESTED_NEXT } from "@/lib/job-workflow";
import { changeStatusAction } from "../actions";
import { FORM_VISIBLE, formBanner } from "@/lib/form-visible";

/** Moves the job to one of the statuses its rules allow; the move becomes a shared timeline entry. */
export function StatusForm({ jobPublicId, status, onMoved }: { jobPublicId: string; status: JobStatus; onMoved?: () => void }) {
  // With no network the move waits in the phone's outbox (its `from` guards against a move made meanwhile).
  const queueable = useMemo(
    () => offlineCapable(changeStatusAction, { kind: "status", job: jobPublicId, label: (f) => `Move to ${JOB_STATUS_LABEL[f.get("to") as JobStatus] ?? "another status"}` }),
    [jobPublicId],
  );
  const [state, action, pending] = useActionState<ActionState<{ to: JobStatus } | Queued>, FormData>(queueable, null);
  const options = NEXT_STATUSES[status];
  useEffect(() => {
    if (state?.ok && !isQueued(state.data)) onMoved?.();
  }, [state, onMoved]);

  if (!options.length) return <p className="text-ink-muted">This job is closed. A comeback is checked in as a new job.</p>;
  const error = state && !state.ok ? state.error : null;
  return (
    <form id="post-status" action={action} className="space-y-3">
      <input type="hidden" name="job" value={jobPublicId} />
      <input type="hidden" name="from" value={status} />
      <QueuedNotice state={state} />
      {formBanner(error, FORM_VISIBLE.statusChange) ? <Alert tone="error">{formBanner(error, FORM_VISIBLE.statusChange)}</Alert> : null}
      <Field id="status-to" label="Move to" error={error?.fields?.to?.[0]} required>
        <Select name="to" defaultValue={SUGGESTED_NEXT[status] ?? options[0]} key={status}>
          {options.map((s) => (
            <option key={s} value={s}>
              {JOB_STATUS_LABEL[s]}
            </option>
          ))}
        </Select>
      </Field>
      <Field id="status-note" label="Note for the owner (optional)" hint="The owner sees status changes and this note." error={error?.fields?.note?.[0]}>
        <Input name="note" maxLength={500} key={`${status}-note`} />
      </Field>
      {status === "ready" ? (
        <Field
          id="status-override"
          label="Reason to hand it back before it is paid"
          hint="Only needed when the invoice isn't issued and paid; it is kept in the job's history."
          error={error?.fields?.override?.[0]}
        >
          <Input name="override" maxLength={300} key={`${status}-override`} />
        </Field>
      ) : null}
      <Button type="submit" loading={pending} fullWidth>
        Change status
      </Button>
    </form>
  );
}
