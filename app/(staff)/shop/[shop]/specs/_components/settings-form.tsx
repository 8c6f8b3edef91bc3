"use client";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { Button, Field, Input, Select } from "@/components/ui";
import type { BenchSettings } from "@/lib/bench";
import { FORM_FIELDS } from "@/lib/schemas/form-fields";
import { TORQUE_UNITS } from "@/lib/torque";
import { saveBenchSettingsAction } from "../actions";

/** The shop's bench settings: the torque unit shown first, the pass schedule, the chain limit, clip limits. */
export function SettingsForm({
  shopSlug,
  settings,
  clipLimits,
  ownerWaitDays,
}: {
  shopSlug: string;
  settings: BenchSettings;
  clipLimits: { maxSeconds: number; maxBytes: number };
  ownerWaitDays: number;
}) {
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
        <Field id="settings-chain" label="Chain replace-at stretch (%)" hint="About 3 for most drives, 1.5 for fixed centres" error={fieldError("chainLimitPct")}>
          <Input name="chainLimitPct" inputMode="decimal" defaultValue={values?.chainLimitPct ?? String(settings.chainLimitPct)} maxLength={6} />
        </Field>
        <Field id="settings-clip-minutes" label="Longest clip (minutes)" error={fieldError("clipMaxMinutes")}>
          <Input name="clipMaxMinutes" inputMode="decimal" defaultValue={values?.clipMaxMinutes ?? String(+(clipLimits.maxSeconds / 60).toFixed(1))} maxLength={5} />
        </Field>
        <Field id="settings-clip-gb" label="Largest clip (GB)" error={fieldError("clipMaxGb")}>
          <Input name="clipMaxGb" inputMode="decimal" defaultValue={values?.clipMaxGb ?? String(+(clipLimits.maxBytes / 1024 ** 3).toFixed(1))} maxLength={5} />
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
