"use client";
import { Button, Field, Input, Select } from "@/components/ui";
import { PART_STATUSES, PART_STATUS_LABEL, type PartStatus, USUAL_NEXT_PART_STATUS } from "@/lib/bench";
import { changePartStatusAction } from "../actions";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { FORM_FIELDS } from "@/lib/schemas/form-fields";

/** Moves one part along (the status it was in is sent, so two people at once give one change). */
export function PartStatusForm({ jobPublicId, partId, status, description }: { jobPublicId: string; partId: number; status: PartStatus; description: string }) {
  const form = useBenchForm(changePartStatusAction, { visible: FORM_FIELDS.partStatus.visible });
  const next = PART_STATUSES.filter((s) => s !== status);
  const id = (name: string) => `part-${partId}-${name}`;
  return (
    <form action={form.formAction} className="space-y-3">
      <input type="hidden" name="job" value={jobPublicId} />
      <input type="hidden" name="part" value={partId} />
      <input type="hidden" name="from" value={status} />
      <FormError message={form.formError} />
      <div className="grid gap-3 sm:grid-cols-2">
        <Field id={id("to")} label={`New status for ${description}`} error={form.fieldError("to")}>
          <Select name="to" defaultValue={USUAL_NEXT_PART_STATUS[status]} key={status}>
            {next.map((s) => (
              <option key={s} value={s}>
                {PART_STATUS_LABEL[s]}
              </option>
            ))}
          </Select>
        </Field>
        <Field id={id("expected")} label="Expected (optional)" error={form.fieldError("expectedOn")}>
          <Input name="expectedOn" type="date" />
        </Field>
      </div>
      <Button type="submit" loading={form.pending}>
        Update part
      </Button>
      {form.state?.ok && form.state.data.jobMovedTo === "in_progress" ? (
        <p role="status">All parts are in: the job is back on the bench and the owner can see it.</p>
      ) : null}
    </form>
  );
}
