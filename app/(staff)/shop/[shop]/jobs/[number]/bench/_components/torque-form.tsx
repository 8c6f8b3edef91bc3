"use client";
import { useState } from "react";
import { PlausibilityConfirm } from "@/components/bench/plausibility-confirm";
import { TorqueUnitOptions } from "@/components/bench/torque-unit-options";
import { BoltPattern } from "@/components/bench/bolt-pattern";
import { PassTable } from "@/components/bench/torque-value";
import { Button, Field, Input, Select, Textarea } from "@/components/ui";
import { assertPassPercents } from "@/lib/tightening-passes";
import { crossPatternOrder, supportsCrossPattern } from "@/lib/tightening-order";
import { type NumberStyle, exampleIn, formatNumberInput, numberStyleFor, parseNumberInput } from "@/lib/number-input";
import { type TorqueUnit, convertTorque, isTorqueUnit } from "@/lib/torque";
import { WRENCH_CLASSES, type WrenchClass, isWrenchClass, outcomeText } from "@/lib/torque-check";
import { parseAngleStages, torqueAngleWarning } from "@/lib/torque-special";
import { recordTorqueAction } from "../actions";
import { SpecPicker } from "@/components/bench/spec-picker";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { QueuedNotice } from "@/components/journal/outbox-panel";
import { offlineCapable } from "@/lib/client/queue-post";
import { FORM_VISIBLE } from "@/lib/form-visible";
import { WrenchClassOptions } from "@/components/bench/wrench-class-options";
import { FastenerFields, WrenchFields } from "./torque-special-fields";

export type TorqueSpecOption = { id: number; label: string; value: number; unit: TorqueUnit; boltCount: number | null; source: string | null };

/** The typed value when it reads one way in the shop's style; the refusal when it has two readings or another convention's. */
function read(text: string, style: NumberStyle, what = "The number") {
  if (text.trim() === "") return { value: null, message: null };
  // Named as the server names the field, so the message beside it reads the same before and after sending.
  const r = parseNumberInput(text, style, { what });
  return r.ok ? { value: r.value > 0 ? r.value : null, message: null } : { value: null, message: r.readings.length ? r.message : null };
}
const UNIT_DECIMALS: Record<TorqueUnit, number> = { nm: 1, lbf_ft: 1, lbf_in: 1, kgf_m: 2 };
const asPasses = (s: string) => {
  const list = s.split(/[^\d.]+/).filter(Boolean).map(Number);
  try {
    assertPassPercents(list);
    return list;
  } catch {
    return null;
  }
};

/** Logs a torque record; the pass schedule and the tightening order show as the spec is typed. */
type FormProps = { jobPublicId: string; currency: string; shopUnit: TorqueUnit; passPercents: number[]; specs: TorqueSpecOption[]; shopWrench: WrenchClass };
export function TorqueForm({ jobPublicId, currency, shopUnit, passPercents, specs, shopWrench }: FormProps) {
  const style = numberStyleFor(currency);
  const [fastener, setFastener] = useState("");
  const [spec, setSpec] = useState("");
  const [applied, setApplied] = useState("");
  const [unit, setUnit] = useState<TorqueUnit>(shopUnit);
  const [wrench, setWrench] = useState<WrenchClass>(shopWrench);
  const [tolerance, setTolerance] = useState("");
  // The spec picked from the library, while the field still holds it (typing over it forgets it).
  const [picked, setPicked] = useState<{ value: number; unit: TorqueUnit } | null>(null);
  const [bolts, setBolts] = useState("");
  const [passes, setPasses] = useState(passPercents.join(", "));
  // Bumped after each record: the angle, lubrication and one-time fields start afresh.
  const [logged, setLogged] = useState(0);
  const [angle, setAngle] = useState("");
  // With no network the record waits in the phone's outbox and goes to the torque-records route.
  const form = useBenchForm(offlineCapable(recordTorqueAction, { kind: "torque", job: jobPublicId, label: (f) => `Torque: ${String(f.get("fastener") ?? "")}` }), {
    onSuccess: () => {
      setLogged((n) => n + 1);
      setAngle("");
      setFastener("");
      setSpec("");
      setPicked(null);
      setApplied("");
      setBolts("");
    },
    visible: FORM_VISIBLE.torqueRecord,
  });
  const { values, fieldError } = form;

  function pick(id: string) {
    const chosen = specs.find((s) => String(s.id) === id);
    if (!chosen) return;
    setFastener(chosen.label);
    setSpec(formatNumberInput(chosen.value, style));
    setPicked({ value: chosen.value, unit: chosen.unit });
    setUnit(chosen.unit);
    setBolts(chosen.boltCount ? String(chosen.boltCount) : "");
  }

  // After picking a spec, a unit switch converts (from the picked value, so rounding never
  // accumulates) and the applied value with it: the same torque in another unit. A number typed by
  // hand is labelled by the unit chosen, as it was typed.
  function switchUnit(next: TorqueUnit) {
    if (picked) {
      const v = read(applied, style).value;
      if (v != null) setApplied(formatNumberInput(convertTorque(v, unit, next), style, UNIT_DECIMALS[next]));
      setSpec(next === picked.unit ? formatNumberInput(picked.value, style) : formatNumberInput(convertTorque(picked.value, picked.unit, next), style, UNIT_DECIMALS[next]));
    }
    setUnit(next);
  }

  const specRead = read(spec, style, "Spec torque");
  const appliedRead = read(applied, style, "Applied torque");
  const tolRead = read(tolerance, style, "The tolerance (%)");
  const specValue = specRead.value;
  const angleRead = parseAngleStages(angle, style);
  // With angle stages after it, a low seating torque is expected (lib/torque-special.ts).
  const warning = specValue ? torqueAngleWarning(specValue, unit, fastener, angleRead.ok ? angleRead.stages : []) : null;
  const tolerancePct = tolRead.value ?? WRENCH_CLASSES[wrench].tolerancePct;
  const preview = specValue && appliedRead.value ? outcomeText({ specValue, appliedValue: appliedRead.value, unit, tolerancePct }, shopUnit) : null;
  const boltCount = /^\d{1,2}$/.test(bolts) ? Number(bolts) : null;
  const schedule = asPasses(passes);

  return (
    <form id="post-torque" action={form.formAction} className="space-y-4">
      <input type="hidden" name="job" value={jobPublicId} />
      <FormError message={form.formError} />
      <QueuedNotice state={form.state} />
      <SpecPicker id="torque-from-spec" hint="Fills in the fields below; check them against the manual." choose="Choose a spec…" specs={specs} onPick={pick} />
      <Field id="torque-fastener" label="What was torqued" hint="e.g. “clutch cover bolts, 8 × M6”" error={fieldError("fastener")} required>
        <Input name="fastener" value={fastener} onChange={(e) => setFastener(e.target.value)} maxLength={200} />
      </Field>
      <div className="grid grid-cols-2 gap-3">
        <Field id="torque-spec" label="Spec torque" hint={`Written like ${exampleIn(style)}`} error={fieldError("specValue") ?? specRead.message ?? undefined} required>
          <Input name="specValue" inputMode="decimal" autoComplete="off" value={spec} onChange={(e) => {
              setSpec(e.target.value);
              setPicked(null);
            }} maxLength={20} />
        </Field>
        <Field id="torque-unit" label="Unit" hint={picked ? "Switching converts the picked spec" : "The unit of the number typed"} error={fieldError("unit")}>
          <Select name="unit" value={unit} onChange={(e) => isTorqueUnit(e.target.value) && switchUnit(e.target.value)}>
            <TorqueUnitOptions />
          </Select>
        </Field>
      </div>
      <div className="grid grid-cols-2 gap-3">
        <Field id="torque-applied" label="Applied (optional)" hint="In the same unit; empty reads “not recorded”" error={fieldError("appliedValue") ?? appliedRead.message ?? undefined}>
          <Input name="appliedValue" inputMode="decimal" autoComplete="off" value={applied} onChange={(e) => setApplied(e.target.value)} maxLength={20} />
        </Field>
        <Field id="torque-bolts" label="Bolts in the circle (optional)" error={fieldError("boltCount")}>
          <Input name="boltCount" inputMode="numeric" autoComplete="off" value={bolts} onChange={(e) => setBolts(e.target.value)} maxLength={3} />
        </Field>
      </div>
      {warning ? <PlausibilityConfirm warning={warning} /> : null}
      {preview ? <p role="status">{preview.charAt(0).toUpperCase() + preview.slice(1)}.</p> : null}
      <div className="grid grid-cols-2 gap-3">
        <Field id="torque-wrench" label="Wrench" error={fieldError("wrenchClass")}>
          <Select name="wrenchClass" value={wrench} onChange={(e) => isWrenchClass(e.target.value) && setWrench(e.target.value)}>
            <WrenchClassOptions />
          </Select>
        </Field>
        <Field id="torque-tolerance" label="Tolerance ± % (optional)" hint={`The wrench's: ±${WRENCH_CLASSES[wrench].tolerancePct} %`} error={fieldError("tolerancePct") ?? tolRead.message ?? undefined}>
          <Input name="tolerancePct" inputMode="decimal" autoComplete="off" value={tolerance} onChange={(e) => setTolerance(e.target.value)} maxLength={8} />
        </Field>
      </div>
      <Field id="torque-passes" label="Passes, % of final" hint="The shop's setting; the maker's procedure wins." error={fieldError("passes")}>
        <Input name="passes" autoComplete="off" value={passes} onChange={(e) => setPasses(e.target.value)} maxLength={40} />
      </Field>
      {specValue && schedule ? (
        <PassTable value={specValue} unit={unit} displayUnit={shopUnit} passPercents={schedule} label="Pass schedule for this spec" />
      ) : null}
      {boltCount && supportsCrossPattern(boltCount) ? <BoltPattern count={boltCount} order={crossPatternOrder(boltCount)} size={240} /> : null}
      <Field id="torque-tool" label="Tool (optional)" error={fieldError("tool")}>
        <Input name="tool" autoComplete="off" defaultValue={values?.tool} maxLength={120} />
      </Field>
      <WrenchFields style={style} unit={unit} specValue={specValue} passPercents={schedule} fieldError={fieldError} />
      <Field id="torque-note" label="Note (optional)" hint="e.g. “re-used fasteners: reduced per the maker's manual”" error={fieldError("note")}>
        <Textarea name="note" rows={2} defaultValue={values?.note} maxLength={500} />
      </Field>
      <FastenerFields key={logged} style={style} unit={unit} shopUnit={shopUnit} specValue={specValue} fieldError={fieldError} values={values} angle={angle} setAngle={setAngle} />
      <fieldset className="space-y-1">
        <legend className="font-semibold text-ink">Done, as recorded (nothing is assumed)</legend>
        <label className="flex min-h-tap items-center gap-3">
          <input type="checkbox" name="passesDone" className="size-6 accent-oil" />
          <span>All passes done, in order</span>
        </label>
        <label className="flex min-h-tap items-center gap-3">
          <input type="checkbox" name="checkPass" className="size-6 accent-oil" />
          <span>Check pass at final, in the tightening direction: no fastener turned</span>
        </label>
      </fieldset>
      <label className="flex min-h-tap items-center gap-3">
        <input type="checkbox" name="share" className="size-6 accent-oil" />
        <span>Share with the owner as proof</span>
      </label>
      <Button type="submit" size="lg" fullWidth loading={form.pending}>
        Log torque
      </Button>
    </form>
  );
}
