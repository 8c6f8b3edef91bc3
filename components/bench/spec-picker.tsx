"use client";
import { Field, Select } from "@/components/ui";

// "From the shop's specs": a saved spec fills a bench form's fields (torque or a reading's limits);
// what it fills stays editable, and the hint asks to check it against the manual.

export function SpecPicker({
  id,
  hint,
  choose,
  specs,
  onPick,
}: {
  id: string;
  hint: string;
  /** The empty choice's words, e.g. "Choose a spec…". */
  choose: string;
  specs: readonly { id: number; label: string; source: string | null }[];
  onPick: (id: string) => void;
}) {
  if (!specs.length) return null;
  return (
    <Field id={id} label="From the shop's specs" hint={hint}>
      <Select defaultValue="" onChange={(e) => onPick(e.target.value)}>
        <option value="">{choose}</option>
        {specs.map((s) => (
          <option key={s.id} value={s.id}>
            {s.label}
            {s.source ? ` (${s.source})` : ""}
          </option>
        ))}
      </Select>
    </Field>
  );
}
