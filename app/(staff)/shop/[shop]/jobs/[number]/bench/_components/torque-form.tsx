"use client";
import { useState } from "react";
import { BoltPattern } from "@/components/bench/bolt-pattern";
import { PassTable } from "@/components/bench/torque-value";
import { Button, Field, Input, Select, Textarea } from "@/components/ui";
import { assertPassPercents } from "@/lib/tightening-passes";
import { crossPatternOrder, supportsCrossPattern } from "@/lib/tightening-order";
import { TORQUE_UNITS, type TorqueUnit, isTorqueUnit } from "@/lib/torque";
import { recordTorqueAction } from "../actions";
import { FormError, useBenchForm } from "@/components/bench/action-form";

export type TorqueSpecOption = { id: number; label: string; value: number; unit: TorqueUnit; boltCount: number | null; source: string | null };

const asNumber = (s: string) => (/^\d+(?:[.,]\d+)?$/.test(s.trim()) ? Number(s.trim().replace(",", ".")) : null);
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
export function TorqueForm({ jobPublicId, shopUnit, passPercents, specs }: { jobPublicId: string; shopUnit: TorqueUnit; passPercents: number[]; specs: TorqueSpecOption[] }) {
  const [fastener, setFastener] = useState("");
  const [spec, setSpec] = useState("");
  const [unit, setUnit] = useState<TorqueUnit>(shopUnit);
  const [bolts, setBolts] = useState("");
  const [passes, setPasses] = useState(passPercents.join(", "));
  const form = useBenchForm(recordTorqueAction, {
    onSuccess: () => {
      setFastener("");
      setSpec("");
      setBolts("");
    },
  });
  const { values, fieldError } = form;

  function pick(id: string) {
    const chosen = specs.find((s) => String(s.id) === id);
    if (!chosen) return;
    setFastener(chosen.label);
    setSpec(String(chosen.value));
    setUnit(chosen.unit);
    setBolts(chosen.boltCount ? String(chosen.boltCount) : "");
  }

  const specValue = asNumber(spec);
  const boltCount = /^\d{1,2}$/.test(bolts) ? Number(bolts) : null;
  const schedule = asPasses(passes);

  return (
    <form action={form.formAction} className="space-y-4">
      <input type="hidden" name="job" value={jobPublicId} />
      <FormError message={form.formError} />
      {specs.length ? (
        <Field id="torque-from-spec" label="From the shop's specs" hint="Fills in the fields below; check them against the manual.">
          <Select defaultValue="" onChange={(e) => pick(e.target.value)}>
            <option value="">Choose a spec…</option>
            {specs.map((s) => (
              <option key={s.id} value={s.id}>
                {s.label}
                {s.source ? ` (${s.source})` : ""}
              </option>
            ))}
          </Select>
        </Field>
      ) : null}
      <Field id="torque-fastener" label="What was torqued" hint="e.g. “clutch cover bolts, 8 × M6”" error={fieldError("fastener")} required>
        <Input name="fastener" value={fastener} onChange={(e) => setFastener(e.target.value)} maxLength={200} />
      </Field>
      <div className="grid grid-cols-2 gap-3">
        <Field id="torque-spec" label="Spec torque" error={fieldError("specValue")} required>
          <Input name="specValue" inputMode="decimal" autoComplete="off" value={spec} onChange={(e) => setSpec(e.target.value)} maxLength={12} />
        </Field>
        <Field id="torque-unit" label="Unit" error={fieldError("unit")}>
          <Select name="unit" value={unit} onChange={(e) => isTorqueUnit(e.target.value) && setUnit(e.target.value)}>
            {TORQUE_UNITS.map((u) => (
              <option key={u.id} value={u.id}>
                {u.label}
              </option>
            ))}
          </Select>
        </Field>
      </div>
      <div className="grid grid-cols-2 gap-3">
        <Field id="torque-applied" label="Applied (optional)" hint="In the same unit" error={fieldError("appliedValue")}>
          <Input name="appliedValue" inputMode="decimal" autoComplete="off" defaultValue={values?.appliedValue} maxLength={12} />
        </Field>
        <Field id="torque-bolts" label="Bolts in the circle (optional)" error={fieldError("boltCount")}>
          <Input name="boltCount" inputMode="numeric" autoComplete="off" value={bolts} onChange={(e) => setBolts(e.target.value)} maxLength={3} />
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
      <Field id="torque-note" label="Note (optional)" hint="e.g. “re-used fasteners: reduced per the maker's manual”" error={fieldError("note")}>
        <Textarea name="note" rows={2} defaultValue={values?.note} maxLength={500} />
      </Field>
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
