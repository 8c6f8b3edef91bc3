"use client";
import { useState } from "react";
import { PlausibilityConfirm } from "@/components/bench/plausibility-confirm";
import { TorqueUnitOptions } from "@/components/bench/torque-unit-options";
import { Button, Field, Input, Select } from "@/components/ui";
import type { StepTorque } from "@/lib/bench";
import { formatNumberInput, numberStyleFor, parseNumberInput } from "@/lib/number-input";
import { type TorqueUnit, isTorqueUnit } from "@/lib/torque";
import { angleText, parseAngleStages, torqueAngleWarning } from "@/lib/torque-special";
import { ThreadsAndRetorque } from "./torque-special-fields";
import { setStepTorqueAction } from "../actions";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { QueuedNotice } from "@/components/journal/outbox-panel";
import { isQueued, offlineCapable } from "@/lib/client/queue-post";
import { FORM_FIELDS } from "@/lib/schemas/form-fields";

type Current = StepTorque | null;

/**
 * The torque a teardown step's fasteners go back on with; shown on the reassembly checklist. The
 * plausibility check of a torque record (lib/torque-check.ts) runs on it too, with the same
 * confirm box; `fastener` is the step as that check reads it ("8 × M6 clutch cover bolts").
 */
export function StepTorqueForm({ jobPublicId, currency, stepId, current, shopUnit, fastener }: { jobPublicId: string; currency: string; stepId: number; current: Current; shopUnit: TorqueUnit; fastener: string }) {
  // With no network the spec waits in the phone's outbox and goes to the step-torques route.
  const form = useBenchForm(offlineCapable(setStepTorqueAction, { kind: "step-torque", job: jobPublicId, label: () => `Torque spec: ${fastener}` }), { visible: FORM_FIELDS.stepTorque.visible });
  const { values, fieldError } = form;
  const id = (name: string) => `step-${stepId}-${name}`;
  const style = numberStyleFor(currency);
  const [value, setValue] = useState(current ? formatNumberInput(current.value, style) : "");
  const [unit, setUnit] = useState<TorqueUnit>(current?.unit ?? shopUnit);
  const [angle, setAngle] = useState(current?.angleStages?.length ? current.angleStages.join(" + ") : "");
  const read = value.trim() ? parseNumberInput(value, style, { what: "Torque" }) : null;
  const angleRead = parseAngleStages(angle, style);
  const warning = read?.ok && read.value > 0 ? torqueAngleWarning(read.value, unit, fastener, angleRead.ok ? angleRead.stages : []) : null;
  return (
    <form action={form.formAction} className="space-y-3">
      <input type="hidden" name="job" value={jobPublicId} />
      <input type="hidden" name="step" value={stepId} />
      <FormError message={form.formError} />
      <div className="grid grid-cols-3 gap-3">
        <Field id={id("torque")} label="Torque" error={fieldError("torqueValue")} required>
          <Input name="torqueValue" inputMode="decimal" autoComplete="off" value={value} onChange={(e) => setValue(e.target.value)} maxLength={12} />
        </Field>
        <Field id={id("unit")} label="Unit" error={fieldError("torqueUnit")}>
          <Select name="torqueUnit" value={unit} onChange={(e) => isTorqueUnit(e.target.value) && setUnit(e.target.value)}>
            <TorqueUnitOptions />
          </Select>
        </Field>
        <Field id={id("bolts")} label="Bolts" error={fieldError("boltCount")}>
          <Input name="boltCount" inputMode="numeric" autoComplete="off" defaultValue={values?.boltCount ?? (current?.boltCount ? String(current.boltCount) : "")} maxLength={3} />
        </Field>
      </div>
      {warning ? <PlausibilityConfirm warning={warning} /> : null}
      <Field id={id("angle")} label="Then turn, degrees" hint="e.g. “90” or “90 + 90”" error={fieldError("angleStages") ?? (angleRead.ok ? undefined : angleRead.message)}>
        <Input name="angleStages" autoComplete="off" value={angle} onChange={(e) => setAngle(e.target.value)} maxLength={60} />
      </Field>
      {angleRead.ok && angleRead.stages.length ? <p className="text-sm">Then {angleText(angleRead.stages)} by angle.</p> : null}
      {/* The torque record's own fields (lubrication with "other", loosen-and-retorque); keyed so a failed send shows what was sent. */}
      <ThreadsAndRetorque key={`threads-${values?.lubrication ?? current?.lubrication ?? ""}`} idPrefix={id("t")} fieldError={fieldError} values={values} saved={current} />
      <label className="flex min-h-tap items-center gap-3">
        <input type="checkbox" name="oneTime" className="size-6 accent-oil" defaultChecked={values ? values.oneTime === "on" : current?.oneTime === true} />
        <span>One-time (torque-to-yield) fasteners: replace with new</span>
      </label>
      <Button type="submit" loading={form.pending}>
        Save torque spec
      </Button>
      {form.state?.ok && !isQueued(form.state.data) ? (
        <p role="status" className="text-sm text-moss">
          Saved.
        </p>
      ) : null}
      <QueuedNotice state={form.state} />
    </form>
  );
}
