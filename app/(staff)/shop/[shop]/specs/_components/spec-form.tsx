"use client";
import { useState } from "react";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { Button, Field, Input, Select, Textarea } from "@/components/ui";
import { SPEC_KINDS, SPEC_KIND_LABEL, type SpecKind } from "@/lib/bench";
import { TORQUE_UNITS } from "@/lib/torque";
import { addSpecAction } from "../actions";
import { FORM_VISIBLE } from "@/lib/form-visible";

/** Adds one spec for a make and model; which fields it needs depends on its kind. */
export function SpecForm({ shopSlug, models }: { shopSlug: string; models: { make: string; model: string }[] }) {
  const form = useBenchForm(addSpecAction, { visible: FORM_VISIBLE.spec });
  const { values, fieldError } = form;
  const [kind, setKind] = useState<SpecKind>((values?.kind as SpecKind | undefined) ?? "torque");
  const makes = [...new Set(models.map((m) => m.make))];
  return (
    <form action={form.formAction} className="space-y-4">
      <input type="hidden" name="shop" value={shopSlug} />
      <FormError message={form.formError} />
      <datalist id="spec-makes">
        {makes.map((m) => (
          <option key={m} value={m} />
        ))}
      </datalist>
      <datalist id="spec-models">
        {models.map((m) => (
          <option key={`${m.make}/${m.model}`} value={m.model} />
        ))}
      </datalist>
      <div className="grid gap-3 sm:grid-cols-2">
        <Field id="spec-make" label="Make" error={fieldError("make")} required>
          <Input name="make" list="spec-makes" autoComplete="off" defaultValue={values?.make} maxLength={60} />
        </Field>
        <Field id="spec-model" label="Model" error={fieldError("model")} required>
          <Input name="model" list="spec-models" autoComplete="off" defaultValue={values?.model} maxLength={80} />
        </Field>
        <Field id="spec-kind" label="Kind" error={fieldError("kind")}>
          <Select name="kind" value={kind} onChange={(e) => setKind(e.target.value as SpecKind)}>
            {SPEC_KINDS.map((k) => (
              <option key={k} value={k}>
                {SPEC_KIND_LABEL[k]}
              </option>
            ))}
          </Select>
        </Field>
        <Field id="spec-label" label="What it is for" hint="e.g. “clutch cover bolts”" error={fieldError("label")} required>
          <Input name="label" defaultValue={values?.label} maxLength={200} />
        </Field>
        {kind === "torque" || kind === "capacity" ? (
          <Field id="spec-value" label={kind === "torque" ? "Torque" : "Amount"} error={fieldError("value")} required>
            <Input name="value" inputMode="decimal" autoComplete="off" defaultValue={values?.value} maxLength={16} />
          </Field>
        ) : null}
        {kind === "torque" ? (
          <Field id="spec-unit" label="Unit" error={fieldError("unit")}>
            <Select name="unit" defaultValue={values?.unit ?? "nm"}>
              {TORQUE_UNITS.map((u) => (
                <option key={u.id} value={u.id}>
                  {u.label}
                </option>
              ))}
            </Select>
          </Field>
        ) : kind !== "note" ? (
          <Field id="spec-unit" label="Unit (optional)" hint="e.g. mm, L, %" error={fieldError("unit")}>
            <Input name="unit" autoComplete="off" defaultValue={values?.unit} maxLength={20} />
          </Field>
        ) : null}
        {kind === "limit" ? (
          <>
            <Field id="spec-min" label="Minimum (optional)" error={fieldError("min")}>
              <Input name="min" inputMode="decimal" autoComplete="off" defaultValue={values?.min} maxLength={16} />
            </Field>
            <Field id="spec-max" label="Maximum (optional)" error={fieldError("max")}>
              <Input name="max" inputMode="decimal" autoComplete="off" defaultValue={values?.max} maxLength={16} />
            </Field>
          </>
        ) : null}
        {kind === "torque" ? (
          <Field id="spec-bolts" label="Bolts in the circle (optional)" error={fieldError("boltCount")}>
            <Input name="boltCount" inputMode="numeric" autoComplete="off" defaultValue={values?.boltCount} maxLength={2} />
          </Field>
        ) : null}
        <Field id="spec-source" label="Source" hint="Manual and page, e.g. “service manual p. 4-12”" error={fieldError("source")}>
          <Input name="source" defaultValue={values?.source} maxLength={200} />
        </Field>
      </div>
      <Field id="spec-notes" label={kind === "note" ? "Note" : "Notes (optional)"} error={fieldError("notes")} required={kind === "note"}>
        <Textarea name="notes" rows={2} defaultValue={values?.notes} maxLength={1000} />
      </Field>
      <Button type="submit" size="lg" loading={form.pending}>
        Add spec
      </Button>
    </form>
  );
}
