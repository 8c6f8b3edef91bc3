"use client";
import { Button, Field, Input, Select } from "@/components/ui";
import { formatNumberInput, numberStyleFor } from "@/lib/number-input";
import { TORQUE_UNITS, type TorqueUnit } from "@/lib/torque";
import { setStepTorqueAction } from "../actions";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { FORM_FIELDS } from "@/lib/schemas/form-fields";

type Current = { value: number; unit: TorqueUnit; boltCount: number | null } | null;

/** The torque a teardown step's fasteners go back on with; shown on the reassembly checklist. */
export function StepTorqueForm({ jobPublicId, currency, stepId, current, shopUnit }: { jobPublicId: string; currency: string; stepId: number; current: Current; shopUnit: TorqueUnit }) {
  const form = useBenchForm(setStepTorqueAction, { visible: FORM_FIELDS.stepTorque.visible });
  const { values, fieldError } = form;
  const id = (name: string) => `step-${stepId}-${name}`;
  return (
    <form action={form.formAction} className="space-y-3">
      <input type="hidden" name="job" value={jobPublicId} />
      <input type="hidden" name="step" value={stepId} />
      <FormError message={form.formError} />
      <div className="grid grid-cols-3 gap-3">
        <Field id={id("torque")} label="Torque" error={fieldError("torqueValue")} required>
          <Input name="torqueValue" inputMode="decimal" autoComplete="off" defaultValue={values?.torqueValue ?? (current ? formatNumberInput(current.value, numberStyleFor(currency)) : "")} maxLength={12} />
        </Field>
        <Field id={id("unit")} label="Unit" error={fieldError("torqueUnit")}>
          <Select name="torqueUnit" key={`unit-${values?.torqueUnit ?? ""}`} defaultValue={values?.torqueUnit ?? current?.unit ?? shopUnit}>
            {TORQUE_UNITS.map((u) => (
              <option key={u.id} value={u.id}>
                {u.label}
              </option>
            ))}
          </Select>
        </Field>
        <Field id={id("bolts")} label="Bolts" error={fieldError("boltCount")}>
          <Input name="boltCount" inputMode="numeric" autoComplete="off" defaultValue={values?.boltCount ?? (current?.boltCount ? String(current.boltCount) : "")} maxLength={3} />
        </Field>
      </div>
      <Button type="submit" loading={form.pending}>
        Save torque spec
      </Button>
      {form.state?.ok ? <p role="status" className="text-sm text-moss">Saved.</p> : null}
    </form>
  );
}
