"use client";
import { useState } from "react";
import { Button, Field, Input } from "@/components/ui";
import { recordReadingAction } from "../actions";
import { SpecPicker } from "@/components/bench/spec-picker";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { QueuedNotice } from "@/components/journal/outbox-panel";
import { offlineCapable } from "@/lib/client/queue-post";
import { FORM_VISIBLE } from "@/lib/form-visible";
import { type NumberStyle, formatNumberInput, numberStyleFor } from "@/lib/number-input";

/** decimals: as typed in the library ("0.10" → 2), null on entries from before; the limit keeps them. */
export type LimitSpecOption = { id: number; label: string; unit: string | null; min: number | null; max: number | null; source: string | null; decimals: { min: number | null; max: number | null } };

const EMPTY = { label: "", unit: "", min: "", max: "", source: "" };
// Limits from the library are filled in as the shop writes numbers, at the resolution typed there
// ("0.10" stays 0.10), so they read back the same and the reading keeps the limit's decimals.
const text = (n: number | null, style: NumberStyle, decimals: number | null) => (n == null ? "" : formatNumberInput(n, style, decimals ?? undefined));

/** A measured value against the limits typed from the manual (or picked from the shop's specs). */
export function ReadingForm({ jobPublicId, currency, specs }: { jobPublicId: string; currency: string; specs: LimitSpecOption[] }) {
  const style = numberStyleFor(currency);
  const [f, setF] = useState(EMPTY);
  const set = (key: keyof typeof EMPTY) => (e: { target: { value: string } }) => setF((prev) => ({ ...prev, [key]: e.target.value }));
  const form = useBenchForm(offlineCapable(recordReadingAction, { kind: "reading", job: jobPublicId, label: (f) => `Reading: ${String(f.get("label") ?? "")}` }), { onSuccess: () => setF(EMPTY), visible: FORM_VISIBLE.reading });
  const { values, fieldError } = form;

  function pick(id: string) {
    const s = specs.find((x) => String(x.id) === id);
    if (s) setF({ label: s.label, unit: s.unit ?? "", min: text(s.min, style, s.decimals.min), max: text(s.max, style, s.decimals.max), source: s.source ?? "" });
  }

  return (
    <form id="post-reading" action={form.formAction} className="space-y-4">
      <input type="hidden" name="job" value={jobPublicId} />
      <FormError message={form.formError} />
      <QueuedNotice state={form.state} />
      <SpecPicker id="reading-from-spec" hint="Fills in the limits; check them against the manual." choose="Choose a limit…" specs={specs} onPick={pick} />
      <Field id="reading-label" label="What was measured" hint="e.g. “front brake disc thickness”" error={fieldError("label")} required>
        <Input name="label" value={f.label} onChange={set("label")} maxLength={200} />
      </Field>
      <div className="grid grid-cols-2 gap-3">
        <Field id="reading-value" label="Reading" hint="As the instrument shows it: “0.20” keeps its last zero." error={fieldError("value")} required>
          <Input name="value" inputMode="decimal" autoComplete="off" defaultValue={values?.value} maxLength={16} />
        </Field>
        <Field id="reading-unit" label="Unit (optional)" error={fieldError("unit")}>
          <Input name="unit" autoComplete="off" value={f.unit} onChange={set("unit")} maxLength={20} />
        </Field>
        <Field id="reading-min" label="Minimum (optional)" error={fieldError("min")}>
          <Input name="min" inputMode="decimal" autoComplete="off" value={f.min} onChange={set("min")} maxLength={16} />
        </Field>
        <Field id="reading-max" label="Maximum (optional)" error={fieldError("max")}>
          <Input name="max" inputMode="decimal" autoComplete="off" value={f.max} onChange={set("max")} maxLength={16} />
        </Field>
      </div>
      <Field id="reading-source" label="Where the limit comes from (optional)" hint="e.g. “service manual p. 4-12”" error={fieldError("source")}>
        <Input name="source" autoComplete="off" value={f.source} onChange={set("source")} maxLength={200} />
      </Field>
      <Button type="submit" size="lg" fullWidth loading={form.pending}>
        Log reading
      </Button>
    </form>
  );
}
