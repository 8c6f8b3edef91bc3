"use client";
import { useState } from "react";
import { Field, Input, Select } from "@/components/ui";
import { saveMarkupAction } from "../actions";
import { SaveRow, SettingsFormTop, useSettingsForm } from "./use-settings-form";

// The parts markup: the sell price a costed part line starts at (lib/parts-pricing.ts). Bands by
// cost are common trade practice, no published source; the example in the hint is only that.

export type MarkupFormValues = { kind: "none" | "percent" | "bands"; percent: string; band1UpTo: string; band1Percent: string; band2UpTo: string; band2Percent: string; topPercent: string };

export function MarkupForm({ shopSlug, currency, markup }: { shopSlug: string; currency: string; markup: MarkupFormValues }) {
  const form = useSettingsForm(saveMarkupAction, "markupSettings");
  const { values, fieldError } = form;
  const [kind, setKind] = useState<string>(values?.markupKind ?? markup.kind);
  const v = (name: keyof MarkupFormValues, key: string) => values?.[key] ?? markup[name];
  return (
    <form key={JSON.stringify([form.state ?? null, markup])} action={form.formAction} className="space-y-4" aria-label="Parts markup">
      <SettingsFormTop form={form} shopSlug={shopSlug} />
      <Field id="markup-kind" label="A part's sell price from its cost" error={fieldError("markupKind")}>
        <Select name="markupKind" value={kind} onChange={(e) => setKind(e.target.value)}>
          <option value="none">No rule: type every sell price</option>
          <option value="percent">One markup on every part</option>
          <option value="bands">Bands by cost</option>
        </Select>
      </Field>
      {kind === "percent" ? (
        <Field id="markup-percent" label="Markup (%)" hint="On the cost: 35 makes a $10.00 part $13.50" error={fieldError("markupPercent")}>
          <Input name="markupPercent" inputMode="decimal" maxLength={12} defaultValue={v("percent", "markupPercent")} />
        </Field>
      ) : null}
      {kind === "bands" ? (
        <div className="space-y-3">
          <p className="text-sm text-ink-muted">For example: up to 10.00 +100 %, up to 50.00 +60 %, dearer parts +35 %. A common trade habit, not a published rule: set your own.</p>
          <div className="grid gap-3 sm:grid-cols-2">
            <Field id="band1-upto" label={`First band: cost up to (${currency})`} error={fieldError("band1UpTo")}>
              <Input name="band1UpTo" inputMode="decimal" maxLength={16} defaultValue={v("band1UpTo", "band1UpTo")} />
            </Field>
            <Field id="band1-percent" label="First band: markup (%)" error={fieldError("band1Percent")}>
              <Input name="band1Percent" inputMode="decimal" maxLength={12} defaultValue={v("band1Percent", "band1Percent")} />
            </Field>
            <Field id="band2-upto" label={`Second band: cost up to (${currency})`} hint="Empty both: no second band" error={fieldError("band2UpTo")}>
              <Input name="band2UpTo" inputMode="decimal" maxLength={16} defaultValue={v("band2UpTo", "band2UpTo")} />
            </Field>
            <Field id="band2-percent" label="Second band: markup (%)" error={fieldError("band2Percent")}>
              <Input name="band2Percent" inputMode="decimal" maxLength={12} defaultValue={v("band2Percent", "band2Percent")} />
            </Field>
            <Field id="top-percent" label="Dearer parts: markup (%)" error={fieldError("topPercent")}>
              <Input name="topPercent" inputMode="decimal" maxLength={12} defaultValue={v("topPercent", "topPercent")} />
            </Field>
          </div>
        </div>
      ) : null}
      <SaveRow form={form} label="Save parts markup" />
    </form>
  );
}
