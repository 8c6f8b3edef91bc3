"use client";
import { useState } from "react";
import { TorqueUnitOptions } from "@/components/bench/torque-unit-options";
import { Field, Input, Select } from "@/components/ui";
import type { NumberStyle } from "@/lib/number-input";
import { parseNumberInput } from "@/lib/number-input";
import { type TorqueUnit, isTorqueUnit } from "@/lib/torque";
import { torqueHeadline } from "@/lib/torque-check";
import { LUBRICATIONS, LUBRICATION_LABEL, type Lubrication, angleText, calibrationOverAYear, calibrationRefusal, isLubrication, parseAngleStages, todayIn, wrenchRangeFlags } from "@/lib/torque-special";

// Issue 18 §3–4 on the torque form: the wrench (serial, calibration date, maximum) and how the
// fastener is tightened (angle stages, lubrication, loosen-and-retorque, one-time). What the
// server would refuse or flag shows as it is typed, with the same words (lib/torque-special.ts).

type FieldError = (name: string) => string | undefined;
type Values = Record<string, string> | undefined;
const localToday = () => todayIn(Intl.DateTimeFormat().resolvedOptions().timeZone);

/** The wrench's serial, calibration and maximum; kept between records (the same wrench, usually). */
export function WrenchFields({ style, unit, specValue, passPercents, fieldError }: { style: NumberStyle; unit: TorqueUnit; specValue: number | null; passPercents: number[] | null; fieldError: FieldError }) {
  const [serial, setSerial] = useState("");
  const [calibratedOn, setCalibratedOn] = useState("");
  const [max, setMax] = useState("");
  const [maxUnit, setMaxUnit] = useState<TorqueUnit | "">("");
  // The browser's day (the server checks the shop's); only read once a date is typed, so the server render matches.
  const today = localToday();
  const future = /^\d{4}-\d{2}-\d{2}$/.test(calibratedOn) ? calibrationRefusal(calibratedOn, today) : null;
  const old = !future && /^\d{4}-\d{2}-\d{2}$/.test(calibratedOn) && calibrationOverAYear(calibratedOn, today);
  const maxRead = max.trim() ? parseNumberInput(max, style, { what: "The wrench's maximum" }) : null;
  const wrenchMax = maxRead?.ok && maxRead.value > 0 ? { value: maxRead.value, unit: maxUnit || unit } : null;
  const flags = specValue && passPercents && wrenchMax ? wrenchRangeFlags({ specValue, unit, passPercents, wrenchMax }) : [];
  return (
    <div className="space-y-3">
      <div className="grid grid-cols-2 gap-3">
        <Field id="torque-serial" label="Wrench serial (optional)" error={fieldError("toolSerial")}>
          <Input name="toolSerial" autoComplete="off" value={serial} onChange={(e) => setSerial(e.target.value)} maxLength={60} />
        </Field>
        <Field id="torque-calibrated" label="Calibrated on (optional)" hint={old ? "Calibration over a year old" : "From the wrench's certificate"} error={fieldError("calibratedOn") ?? future ?? undefined}>
          <Input name="calibratedOn" type="date" value={calibratedOn} onChange={(e) => setCalibratedOn(e.target.value)} />
        </Field>
      </div>
      <div className="grid grid-cols-2 gap-3">
        <Field id="torque-wrench-max" label="Wrench maximum (optional)" hint="Its capacity: the top of its scale" error={fieldError("wrenchMax") ?? (maxRead && !maxRead.ok && maxRead.readings.length ? maxRead.message : undefined)}>
          <Input name="wrenchMax" inputMode="decimal" autoComplete="off" value={max} onChange={(e) => setMax(e.target.value)} maxLength={20} />
        </Field>
        <Field id="torque-wrench-max-unit" label="Maximum's unit" error={fieldError("wrenchMaxUnit")}>
          <Select name="wrenchMaxUnit" value={maxUnit} onChange={(e) => setMaxUnit(isTorqueUnit(e.target.value) ? e.target.value : "")}>
            <option value="">Same as the spec</option>
            <TorqueUnitOptions />
          </Select>
        </Field>
      </div>
      {flags.length ? (
        <div role="status" className="space-y-1 rounded-lg border border-line p-3">
          {flags.map((f) => (
            <p key={f}>
              <strong>Outside the wrench&apos;s range:</strong> {f}.
            </p>
          ))}
        </div>
      ) : null}
    </div>
  );
}

/**
 * Angle stages, lubrication, loosen-and-retorque and one-time; cleared after each record (keyed by
 * the form). The angle text is the form's: its plausibility check depends on it.
 */
export function FastenerFields({ style, unit, shopUnit, specValue, fieldError, values, angle, setAngle }: { style: NumberStyle; unit: TorqueUnit; shopUnit: TorqueUnit; specValue: number | null; fieldError: FieldError; values: Values; angle: string; setAngle: (text: string) => void }) {
  const read = parseAngleStages(angle, style);
  const stages = read.ok ? read.stages : [];
  return (
    <fieldset className="space-y-3">
      <legend className="font-semibold text-ink">How it is tightened (optional)</legend>
      <Field id="torque-angle" label="Then turn, degrees" hint="Angle stages after the torque, e.g. “90” or “90 + 90”" error={fieldError("angleStages") ?? (read.ok ? undefined : read.message)}>
        <Input name="angleStages" autoComplete="off" value={angle} onChange={(e) => setAngle(e.target.value)} maxLength={60} />
      </Field>
      {specValue && stages.length ? <p role="status">Spec: {torqueHeadline(specValue, unit, shopUnit)} {angleText(stages)}</p> : null}
      {stages.length ? (
        <label className="flex min-h-tap items-center gap-3">
          <input type="checkbox" name="angleDone" className="size-6 accent-oil" />
          <span>Angle stages turned, in order</span>
        </label>
      ) : null}
      <ThreadsAndRetorque idPrefix="torque" fieldError={fieldError} values={values} />
      <label className="flex min-h-tap items-center gap-3">
        <input type="checkbox" name="oneTime" className="size-6 accent-oil" defaultChecked={values?.oneTime === "on"} />
        <span>One-time (torque-to-yield) fasteners: replace with new</span>
      </label>
    </fieldset>
  );
}

type Saved = { lubrication?: Lubrication | null; lubricationOther?: string | null; loosenRetorque?: boolean | null; retorqueSequence?: string | null } | null;

/**
 * The thread lubrication (with what "other" was) and loosen-and-retorque with its sequence: the
 * torque record's fields and a teardown step's alike. `saved`: a step's torque as stored, shown
 * until the form is sent; `idPrefix` keeps ids apart where several forms share a page.
 */
export function ThreadsAndRetorque({ idPrefix, fieldError, values, saved = null }: { idPrefix: string; fieldError: FieldError; values: Values; saved?: Saved }) {
  const first = values ? values.lubrication : (saved?.lubrication ?? "");
  const [lube, setLube] = useState<Lubrication | "">(isLubrication(first) ? first : "");
  return (
    <>
      <div className="grid grid-cols-2 gap-3">
        <Field id={`${idPrefix}-lubrication`} label="Threads" error={fieldError("lubrication")}>
          <Select name="lubrication" value={lube} onChange={(e) => setLube(isLubrication(e.target.value) ? e.target.value : "")}>
            <option value="">Not recorded</option>
            {LUBRICATIONS.map((l) => (
              <option key={l} value={l}>
                {LUBRICATION_LABEL[l]}
              </option>
            ))}
          </Select>
        </Field>
        {lube === "other" ? (
          <Field id={`${idPrefix}-lubrication-other`} label="What was on the threads" error={fieldError("lubricationOther")} required>
            <Input name="lubricationOther" autoComplete="off" defaultValue={values ? values.lubricationOther : (saved?.lubricationOther ?? "")} maxLength={60} />
          </Field>
        ) : null}
      </div>
      <label className="flex min-h-tap items-center gap-3">
        <input type="checkbox" name="loosenRetorque" className="size-6 accent-oil" defaultChecked={values ? values.loosenRetorque === "on" : saved?.loosenRetorque === true} />
        <span>Loosened and retorqued</span>
      </label>
      <Field id={`${idPrefix}-retorque`} label="Loosen-and-retorque sequence (with the tick)" hint="e.g. “loosen 180°, retorque to 20 N·m, then + 90°”" error={fieldError("retorqueSequence")}>
        <Input name="retorqueSequence" autoComplete="off" defaultValue={values ? values.retorqueSequence : (saved?.retorqueSequence ?? "")} maxLength={300} />
      </Field>
    </>
  );
}
