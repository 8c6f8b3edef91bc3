"use client";
import { Trash2 } from "lucide-react";
import { ActionButton, FormError, useBenchForm } from "@/components/bench/action-form";
import { Alert, Button, Field, Input, Textarea } from "@/components/ui";
import type { TeardownRow } from "@/db/queries/bench";
import { onlineOnly, useBrowserOffline } from "@/lib/client/queue-post";
import { FORM_FIELDS } from "@/lib/schemas/form-fields";
import { deleteTeardownStepAction, editTeardownStepAction } from "../actions";

type Step = Pick<TeardownRow, "id" | "seq" | "version" | "removed" | "count" | "size" | "notes" | "storage">;

/**
 * Why an edit or a delete is never queued in the phone's outbox (issue 20 §2): both are checked
 * against the step's version on screen, which a page opened from the offline copy may no longer
 * have, and a delete can finish the reassembly and move the job when it lands; neither should
 * happen later, out of sight.
 */
const NEEDS_CONNECTION = "Editing or deleting a logged step needs a connection: it is checked against the step as it is now. Try again when the network is back.";

/** Corrects a logged step (the version on screen guards against overwriting someone else's edit), or deletes it. */
export function TeardownEditForm({ jobPublicId, step }: { jobPublicId: string; step: Step }) {
  const offline = useBrowserOffline();
  const form = useBenchForm(onlineOnly(editTeardownStepAction, NEEDS_CONNECTION), { visible: FORM_FIELDS.teardownEdit.visible });
  const { values, fieldError } = form;
  const id = (name: string) => `step-${step.id}-edit-${name}`;
  // Labels name the step: every step has this form, and the log's own form sits beside them.
  return (
    <div className="space-y-4">
      {offline ? <Alert tone="info">{NEEDS_CONNECTION}</Alert> : null}
      <form action={form.formAction} className="space-y-3">
        <input type="hidden" name="job" value={jobPublicId} />
        <input type="hidden" name="step" value={step.id} />
        <input type="hidden" name="version" value={step.version} />
        <FormError message={form.formError} />
        <Field id={id("removed")} label={`Step ${step.seq}: what came off`} error={fieldError("removed")} required>
          <Input name="removed" defaultValue={values?.removed ?? step.removed} maxLength={200} />
        </Field>
        <div className="grid grid-cols-2 gap-3">
          <Field id={id("count")} label={`Step ${step.seq}: count`} hint="Optional" error={fieldError("count")}>
            <Input name="count" inputMode="numeric" defaultValue={values?.count ?? (step.count == null ? "" : String(step.count))} maxLength={3} />
          </Field>
          <Field id={id("size")} label={`Step ${step.seq}: size`} hint="Optional" error={fieldError("size")}>
            <Input name="size" defaultValue={values?.size ?? step.size ?? ""} maxLength={60} />
          </Field>
        </div>
        <Field id={id("notes")} label={`Step ${step.seq}: notes`} hint="Optional" error={fieldError("notes")}>
          <Textarea name="notes" rows={2} defaultValue={values?.notes ?? step.notes ?? ""} maxLength={1000} />
        </Field>
        <Field id={id("storage")} label={`Step ${step.seq}: kept in`} hint="Optional: bin or bag label" error={fieldError("storage")}>
          <Input name="storage" defaultValue={values?.storage ?? step.storage ?? ""} maxLength={80} />
        </Field>
        <Button type="submit" loading={form.pending}>
          Save changes to step {step.seq}
        </Button>
        {form.state?.ok ? (
          <p role="status" className="text-sm text-moss">
            Saved. The step as it was is kept in its history.
          </p>
        ) : null}
      </form>
      <details>
        <summary className="inline-flex min-h-tap cursor-pointer items-center rounded-md px-2 font-semibold text-rust hover:bg-sunken">Delete this step…</summary>
        <div className="space-y-2 pt-2">
          <p className="text-sm text-ink-muted">It leaves the log and the reassembly checklist, and its timeline entry is removed. What it said stays in the history on this page.</p>
          <ActionButton action={onlineOnly(deleteTeardownStepAction, NEEDS_CONNECTION)} fields={{ job: jobPublicId, step: String(step.id), version: String(step.version) }} variant="danger" icon={<Trash2 aria-hidden className="size-5" />}>
            Delete step {step.seq}: {step.removed}
          </ActionButton>
        </div>
      </details>
    </div>
  );
}
