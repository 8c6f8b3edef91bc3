"use client";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { Button, Field, Input, Select } from "@/components/ui";
import type { BenchSettings } from "@/lib/bench";
import { FORM_FIELDS } from "@/lib/schemas/form-fields";
import { TORQUE_UNITS } from "@/lib/torque";
import { saveBenchSettingsAction } from "../actions";
import { formatNumberInput, numberStyleFor } from "@/lib/number-input";
import { WrenchClassOptions } from "@/components/bench/wrench-class-options";

/** The shop's bench settings: the torque unit shown first, the pass schedule, the chain limit, clip limits. */
export function SettingsForm({
  shopSlug,
  currency,
  settings,
  clipLimits,
  ownerWaitDays,
}: {
  shopSlug: string;
  /** Numbers are shown and read in the convention of the shop's currency (lib/number-input.ts). */
  currency: string;
  settings: BenchSettings;
  clipLimits: { maxSeconds: number; maxBytes: number };
  ownerWaitDays: number;
}) {
  const style = numberStyleFor(currency);
  const form = useBenchForm(saveBenchSettingsAction, { visible: FORM_FIELDS.benchSettings.visible });
  const { values, fieldError } = form;
  return (
    <form action={form.formAction} className="space-y-4">
      <input type="hidden" name="shop" value={shopSlug} />
      <FormError message={form.formError} />
      <div className="grid gap-3 sm:grid-cols-3">
        <Field id="settings-unit" label="Torque unit shown first" error={fieldError("torqueUnit")}>
          <Select name="torqueUnit" key={`unit-${values?.torqueUnit ?? ""}`} defaultValue={values?.torqueUnit ?? settings.torqueUnit}>
            {TORQUE_UNITS.map((u) => (
              <option key={u.id} value={u.id}>
                {u.label} ({u.name})
              </option>
            ))}
          </Select>
        </Field>
        <Field id="settings-passes" label="Passes, % of final" hint="Rising, ending at 100" error={fieldError("passes")}>
          <Input name="passes" autoComplete="off" defaultValue={values?.passes ?? settings.passPercents.join(", ")} maxLength={40} />
        </Field>
        <Field id="settings-wrench" label="Usual torque wrench" hint="Its ISO 6789-1 class sets a torque record's default tolerance" error={fieldError("wrenchClass")}>
          <Select name="wrenchClass" key={`wrench-${values?.wrenchClass ?? ""}`} defaultValue={values?.wrenchClass ?? settings.wrenchClass}>
            <WrenchClassOptions />
          </Select>
        </Field>
        <Field id="settings-chain" label="Chain replace-at stretch (%)" hint="About 3 for most drives, 1.5 for fixed centres" error={fieldError("chainLimitPct")}>
          <Input name="chainLimitPct" inputMode="decimal" defaultValue={values?.chainLimitPct ?? formatNumberInput(settings.chainLimitPct, style)} maxLength={6} />
        </Field>
        <Field id="settings-clip-minutes" label="Longest clip (minutes)" error={fieldError("clipMaxMinutes")}>
          <Input name="clipMaxMinutes" inputMode="decimal" defaultValue={values?.clipMaxMinutes ?? formatNumberInput(+(clipLimits.maxSeconds / 60).toFixed(1), style)} maxLength={5} />
        </Field>
        <Field id="settings-clip-gb" label="Largest clip (GB)" error={fieldError("clipMaxGb")}>
          <Input name="clipMaxGb" inputMode="decimal" defaultValue={values?.clipMaxGb ?? formatNumberInput(+(clipLimits.maxBytes / 1024 ** 3).toFixed(1), style)} maxLength={5} />
        </Field>
        <Field id="settings-owner-wait" label="Owner slow to answer after (days)" hint="The board flags a job waiting on the owner this long" error={fieldError("ownerWaitDays")}>
          <Input name="ownerWaitDays" inputMode="numeric" defaultValue={values?.ownerWaitDays ?? String(ownerWaitDays)} maxLength={2} />
        </Field>
      </div>
      <Button type="submit" loading={form.pending}>
        Save settings
      </Button>
      {form.state?.ok ? <p role="status">Saved.</p> : null}
    </form>
  );
}
