"use client";
import { Button, Field, Input, Select, Textarea } from "@/components/ui";
import { addTeardownStepAction } from "../actions";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { QueuedNotice } from "@/components/journal/outbox-panel";
import { offlineCapable } from "@/lib/client/queue-post";
import { FORM_FIELDS } from "@/lib/schemas/form-fields";

/** Logs the next thing that came off; steps number themselves in removal order. */
export function TeardownForm({ jobPublicId, nextSeq, photos }: { jobPublicId: string; nextSeq: number; photos: { id: string; caption: string | null }[] }) {
  // With no network the step waits in the phone's outbox and goes to the teardown-steps route.
  const form = useBenchForm(offlineCapable(addTeardownStepAction, { kind: "teardown", job: jobPublicId, label: (f) => `Teardown step: ${String(f.get("removed") ?? "")}` }), {
    visible: FORM_FIELDS.teardownStep.visible,
  });
  const { values, fieldError } = form;
  return (
    <form action={form.formAction} className="space-y-4">
      <input type="hidden" name="job" value={jobPublicId} />
      <FormError message={form.formError} />
      <QueuedNotice state={form.state} />
      <Field id="step-removed" label={`What came off (step ${nextSeq})`} hint="A part or a group of fasteners, e.g. “clutch cover”" error={fieldError("removed")} required>
        <Input name="removed" defaultValue={values?.removed} maxLength={200} />
      </Field>
      <div className="grid grid-cols-2 gap-3">
        <Field id="step-count" label="Count (optional)" error={fieldError("count")}>
          <Input name="count" inputMode="numeric" defaultValue={values?.count} maxLength={3} />
        </Field>
        <Field id="step-size" label="Size (optional)" hint="e.g. “8 mm head”" error={fieldError("size")}>
          <Input name="size" defaultValue={values?.size} maxLength={60} />
        </Field>
      </div>
      <Field id="step-notes" label="Notes (optional)" hint="Orientation, lengths, marks: “stamped side faces out”" error={fieldError("notes")}>
        <Textarea name="notes" rows={2} defaultValue={values?.notes} maxLength={1000} />
      </Field>
      <Field id="step-storage" label="Kept in (optional)" hint="Bin or bag label" error={fieldError("storage")}>
        <Input name="storage" defaultValue={values?.storage} maxLength={80} />
      </Field>
      {photos.length ? (
        <Field id="step-photo" label="Photo (optional)" hint="One of the photos posted on this job" error={fieldError("photo")}>
          <Select name="photo" key={`photo-${values?.photo ?? ""}`} defaultValue={values?.photo ?? ""}>
            <option value="">No photo</option>
            {photos.map((p, i) => (
              <option key={p.id} value={p.id}>
                {p.caption ? `${p.caption} (${i + 1})` : `Photo ${i + 1}`}
              </option>
            ))}
          </Select>
        </Field>
      ) : null}
      <Button type="submit" size="lg" fullWidth loading={form.pending}>
        Log step
      </Button>
    </form>
  );
}
