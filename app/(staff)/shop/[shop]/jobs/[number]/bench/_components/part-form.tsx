"use client";
import { Button, Field, Input, Select } from "@/components/ui";
import { PART_STATUSES, PART_STATUS_LABEL } from "@/lib/bench";
import { addPartAction } from "../actions";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { FORM_FIELDS } from "@/lib/schemas/form-fields";
import type { FindingClearance } from "@/db/queries/workflow";

const CLEARANCE_LABEL: Record<FindingClearance["state"], string> = {
  not_sent: "not asked yet",
  waiting: "waiting for the owner",
  approved: "approved",
  declined: "declined",
};

/** Adds a part to the job; a part still to come parks a job in progress on "waiting on parts". */
export function PartForm({ jobPublicId, currency, findings }: { jobPublicId: string; currency: string; findings: FindingClearance[] }) {
  const form = useBenchForm(addPartAction, { visible: FORM_FIELDS.part.visible });
  const { values, fieldError } = form;
  return (
    <form action={form.formAction} className="space-y-4">
      <input type="hidden" name="job" value={jobPublicId} />
      <FormError message={form.formError} />
      <Field id="part-description" label="Part" hint="What it is, e.g. “cam chain, 112 links”" error={fieldError("description")} required>
        <Input name="description" defaultValue={values?.description} maxLength={200} />
      </Field>
      <Field
        id="part-for"
        label="For which work"
        hint="A part for a finding waits the job only once the owner approves that finding."
        error={fieldError("forWork")}
        required
      >
        <Select name="forWork" key={`for-${values?.forWork ?? ""}`} defaultValue={values?.forWork ?? ""} required>
          <option value="" disabled>
            Choose…
          </option>
          <option value="booked">The work it was booked in for (no further OK needed)</option>
          {findings.map((f) => (
            <option key={f.id} value={`finding:${f.id}`}>
              {f.title} ({CLEARANCE_LABEL[f.state]})
            </option>
          ))}
        </Select>
      </Field>
      <div className="grid grid-cols-2 gap-3">
        <Field id="part-number" label="Part number (optional)" error={fieldError("partNumber")}>
          <Input name="partNumber" autoComplete="off" autoCapitalize="characters" defaultValue={values?.partNumber} maxLength={60} />
        </Field>
        <Field id="part-qty" label="Qty" error={fieldError("qty")}>
          <Input name="qty" inputMode="decimal" autoComplete="off" defaultValue={values?.qty ?? "1"} maxLength={12} />
        </Field>
        <Field id="part-supplier" label="Supplier (optional)" error={fieldError("supplier")}>
          <Input name="supplier" defaultValue={values?.supplier} maxLength={120} />
        </Field>
        <Field id="part-cost" label={`Unit cost, ${currency} (optional)`} hint="Shop only" error={fieldError("cost")}>
          <Input name="cost" inputMode="decimal" autoComplete="off" defaultValue={values?.cost} maxLength={16} />
        </Field>
        <Field id="part-status" label="Status" error={fieldError("status")}>
          <Select name="status" key={`status-${values?.status ?? ""}`} defaultValue={values?.status ?? "needed"}>
            {PART_STATUSES.map((s) => (
              <option key={s} value={s}>
                {PART_STATUS_LABEL[s]}
              </option>
            ))}
          </Select>
        </Field>
        <Field id="part-expected" label="Expected (optional)" error={fieldError("expectedOn")}>
          <Input name="expectedOn" type="date" defaultValue={values?.expectedOn} />
        </Field>
      </div>
      <Button type="submit" size="lg" fullWidth loading={form.pending}>
        Add part
      </Button>
      {form.state?.ok && form.state.data.jobMovedTo ? (
        <p role="status" className="text-ink">
          The job is now waiting on parts; the owner sees the change.
        </p>
      ) : null}
    </form>
  );
}
