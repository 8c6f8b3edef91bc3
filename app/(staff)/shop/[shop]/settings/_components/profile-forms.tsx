"use client";
import { Field, Input, PlainOptions, Select, Textarea } from "@/components/ui";
import { type OpeningHours, SUPPORTED_CURRENCIES, WEEKDAYS, WEEKDAY_LABEL } from "@/lib/shop-settings";
import { saveDigestAction, saveHoursAction, saveProfileAction, saveRegionAction } from "../actions";
import { Checkbox, SaveRow, SettingsFormTop, useSettingsForm } from "./use-settings-form";

// The shop's own details: profile and contact, opening hours, time zone and currency, digest window.
// Each form remounts after an answer (its key), so fields show what was typed after an error and
// what is stored after a save.

const remount = (state: unknown, stored: unknown) => JSON.stringify([state ?? null, stored]);

export function ProfileForm({ shopSlug, profile }: { shopSlug: string; profile: { name: string; email: string | null; phone: string | null; address: string | null } }) {
  const form = useSettingsForm(saveProfileAction, "profileSettings");
  const { values, fieldError } = form;
  return (
    <form key={remount(form.state, profile)} action={form.formAction} className="space-y-4" aria-label="Profile and contact">
      <SettingsFormTop form={form} shopSlug={shopSlug} />
      <div className="grid gap-3 sm:grid-cols-2">
        <Field id="profile-name" label="Shop name" error={fieldError("name")} required>
          <Input name="name" maxLength={120} defaultValue={values?.name ?? profile.name} />
        </Field>
        <Field id="profile-email" label="E-mail" hint="Where customers' replies go" error={fieldError("email")}>
          <Input name="email" type="email" maxLength={254} autoComplete="email" defaultValue={values?.email ?? profile.email ?? ""} />
        </Field>
        <Field id="profile-phone" label="Phone" error={fieldError("phone")}>
          <Input name="phone" type="tel" maxLength={40} autoComplete="tel" defaultValue={values?.phone ?? profile.phone ?? ""} />
        </Field>
        <Field id="profile-address" label="Address" hint="Printed on invoices" error={fieldError("address")}>
          <Textarea name="address" rows={3} maxLength={300} defaultValue={values?.address ?? profile.address ?? ""} />
        </Field>
      </div>
      <SaveRow form={form} label="Save profile" />
    </form>
  );
}

export function HoursForm({ shopSlug, hours }: { shopSlug: string; hours: OpeningHours | null }) {
  const form = useSettingsForm(saveHoursAction, "hoursSettings");
  const { values, fieldError } = form;
  return (
    <form key={remount(form.state, hours)} action={form.formAction} className="space-y-4" aria-label="Opening hours">
      <SettingsFormTop form={form} shopSlug={shopSlug} />
      {WEEKDAYS.map((d) => {
        const day = hours?.[d];
        const closed = values ? values[`${d}Closed`] === "on" : hours ? day === null : d === "sun";
        return (
          <fieldset key={d} className="grid items-end gap-3 sm:grid-cols-4">
            <legend className="font-semibold text-ink">{WEEKDAY_LABEL[d]}</legend>
            <Field id={`hours-${d}-open`} label="Opens" error={fieldError(`${d}Open`)}>
              <Input name={`${d}Open`} type="time" defaultValue={values?.[`${d}Open`] ?? day?.open ?? "08:00"} />
            </Field>
            <Field id={`hours-${d}-close`} label="Closes" error={fieldError(`${d}Close`)}>
              <Input name={`${d}Close`} type="time" defaultValue={values?.[`${d}Close`] ?? day?.close ?? "17:00"} />
            </Field>
            <Checkbox name={`${d}Closed`} label="Closed all day" defaultChecked={closed} error={fieldError(`${d}Closed`)} />
          </fieldset>
        );
      })}
      <SaveRow form={form} label="Save opening hours" />
    </form>
  );
}

export function RegionForm({ shopSlug, timezone, currency, zones }: { shopSlug: string; timezone: string; currency: string; zones: string[] }) {
  const form = useSettingsForm(saveRegionAction, "regionSettings");
  const { values, fieldError } = form;
  return (
    <form key={remount(form.state, [timezone, currency])} action={form.formAction} className="space-y-4" aria-label="Time zone and currency">
      <SettingsFormTop form={form} shopSlug={shopSlug} />
      <div className="grid gap-3 sm:grid-cols-2">
        <Field id="region-timezone" label="Time zone" hint="The shop's clock: morning mail, dates on invoices" error={fieldError("timezone")}>
          <Select name="timezone" defaultValue={values?.timezone ?? timezone}>
            <PlainOptions values={zones.includes(timezone) ? zones : [timezone, ...zones]} />
          </Select>
        </Field>
        <Field id="region-currency" label="Currency" hint="For new invoices. Amounts in these settings are not converted: check the rates after a change." error={fieldError("currency")}>
          <Select name="currency" defaultValue={values?.currency ?? currency}>
            <PlainOptions values={SUPPORTED_CURRENCIES} />
          </Select>
        </Field>
      </div>
      <SaveRow form={form} label="Save time zone and currency" />
    </form>
  );
}

export function DigestForm({ shopSlug, minutes }: { shopSlug: string; minutes: number }) {
  const form = useSettingsForm(saveDigestAction, "digestSettings");
  const { values, fieldError } = form;
  return (
    <form key={remount(form.state, minutes)} action={form.formAction} className="space-y-4" aria-label="Update digest">
      <SettingsFormTop form={form} shopSlug={shopSlug} />
      <Field id="digest-minutes" label="Gather job updates for (minutes)" hint="Updates shared within this window go to followers in one e-mail; 0 sends each at once" error={fieldError("digestWindowMinutes")}>
        <Input name="digestWindowMinutes" inputMode="numeric" maxLength={4} defaultValue={values?.digestWindowMinutes ?? String(minutes)} />
      </Field>
      <SaveRow form={form} label="Save digest window" />
    </form>
  );
}
