"use client";
import { useState } from "react";
import { Field, Input, Select } from "@/components/ui";
import { LABOUR_RATE_ROWS } from "@/lib/schemas/shop-settings";
import { TOLERANCE_PRESETS, type ToleranceChoice } from "@/lib/shop-settings";
import { saveDropoffTermsAction, saveLabourAction, saveSuppliesAction, saveTaxAction, saveToleranceAction } from "../actions";
import { Checkbox, SaveRow, SettingsFormTop, useSettingsForm } from "./use-settings-form";

// The money sections: labour rates, tax, the shop-supplies fee and the over-estimate tolerance.
// Amounts arrive as the text the page typed them as (minorToInput), in the shop's currency.

const remount = (state: unknown, stored: unknown) => JSON.stringify([state ?? null, stored]);

export function LabourForm({ shopSlug, currency, defaultRate, named }: { shopSlug: string; currency: string; defaultRate: string; named: { name: string; rate: string }[] }) {
  const form = useSettingsForm(saveLabourAction, "labourSettings");
  const { values, fieldError } = form;
  return (
    <form key={remount(form.state, [defaultRate, named])} action={form.formAction} className="space-y-4" aria-label="Labour rates">
      <SettingsFormTop form={form} shopSlug={shopSlug} />
      <Field id="labour-default" label={`Default rate per hour (${currency})`} hint="Used when a labour line is priced without a rate; empty: type a rate on each line" error={fieldError("defaultRate")}>
        <Input name="defaultRate" inputMode="decimal" maxLength={16} defaultValue={values?.defaultRate ?? defaultRate} />
      </Field>
      <p className="text-sm text-ink-muted">Named rates for particular work, e.g. Diagnosis. Leave a row empty to remove it.</p>
      {Array.from({ length: LABOUR_RATE_ROWS }, (_, i) => (
        <div key={i} className="grid gap-3 sm:grid-cols-2">
          <Field id={`labour-name-${i}`} label={`Rate ${i + 1}: name`} error={fieldError(`rateName${i}`)}>
            <Input name={`rateName${i}`} maxLength={60} defaultValue={values?.[`rateName${i}`] ?? named[i]?.name ?? ""} />
          </Field>
          <Field id={`labour-amount-${i}`} label={`Rate ${i + 1}: per hour (${currency})`} error={fieldError(`rateAmount${i}`)}>
            <Input name={`rateAmount${i}`} inputMode="decimal" maxLength={16} defaultValue={values?.[`rateAmount${i}`] ?? named[i]?.rate ?? ""} />
          </Field>
        </div>
      ))}
      <SaveRow form={form} label="Save labour rates" />
    </form>
  );
}

type Tax = { method: "per_line" | "per_invoice"; rate: string; kindRates: { labour: string; fee: string; supplies: string }; taxable: { part: boolean; labour: boolean; fee: boolean } };

const OWN_RATES = [
  { name: "labourTaxRate", key: "labour", label: "Labour" },
  { name: "feeTaxRate", key: "fee", label: "Fees" },
  { name: "suppliesTaxRate", key: "supplies", label: "Shop-supplies fee" },
] as const;

export function TaxForm({ shopSlug, tax }: { shopSlug: string; tax: Tax }) {
  const form = useSettingsForm(saveTaxAction, "taxSettings");
  const { values, fieldError } = form;
  const ticked = (name: string, stored: boolean) => (values ? values[name] === "on" : stored);
  return (
    <form key={remount(form.state, tax)} action={form.formAction} className="space-y-4" aria-label="Tax">
      <SettingsFormTop form={form} shopSlug={shopSlug} />
      <div className="grid gap-3 sm:grid-cols-2">
        <Field id="tax-rate" label="Sales tax rate (%)" hint="e.g. 8.25; 0 for none. Parts always take this rate" error={fieldError("taxRate")}>
          <Input name="taxRate" inputMode="decimal" maxLength={12} defaultValue={values?.taxRate ?? tax.rate} />
        </Field>
        <Field id="tax-method" label="Worked out" hint="Rounded once per taxable line, or once on the invoice's taxable total" error={fieldError("taxMethod")}>
          <Select name="taxMethod" defaultValue={values?.taxMethod ?? tax.method}>
            <option value="per_line">Per line</option>
            <option value="per_invoice">Per invoice</option>
          </Select>
        </Field>
      </div>
      <fieldset className="space-y-2">
        <legend className="font-semibold text-ink">Rates of their own</legend>
        <p className="text-sm text-ink-muted">Where labour, fees or the supplies fee are taxed differently. Empty: the sales tax rate above.</p>
        <div className="grid gap-3 sm:grid-cols-3">
          {OWN_RATES.map((r) => (
            <Field key={r.name} id={`tax-rate-${r.key}`} label={`${r.label} (%)`} error={fieldError(r.name)}>
              <Input name={r.name} inputMode="decimal" maxLength={12} defaultValue={values?.[r.name] ?? tax.kindRates[r.key]} />
            </Field>
          ))}
        </div>
      </fieldset>
      <fieldset className="space-y-1">
        <legend className="font-semibold text-ink">New lines start out taxable</legend>
        <Checkbox name="partsTaxable" label="Parts" defaultChecked={ticked("partsTaxable", tax.taxable.part)} error={fieldError("partsTaxable")} />
        <Checkbox name="labourTaxable" label="Labour" defaultChecked={ticked("labourTaxable", tax.taxable.labour)} error={fieldError("labourTaxable")} />
        <Checkbox name="feesTaxable" label="Fees" defaultChecked={ticked("feesTaxable", tax.taxable.fee)} error={fieldError("feesTaxable")} />
      </fieldset>
      <SaveRow form={form} label="Save tax" />
    </form>
  );
}

type Supplies = { percent: string; base: "labour" | "parts_and_labour"; cap: string; taxable: boolean };

export function SuppliesForm({ shopSlug, currency, supplies }: { shopSlug: string; currency: string; supplies: Supplies }) {
  const form = useSettingsForm(saveSuppliesAction, "suppliesSettings");
  const { values, fieldError } = form;
  return (
    <form key={remount(form.state, supplies)} action={form.formAction} className="space-y-4" aria-label="Shop-supplies fee">
      <SettingsFormTop form={form} shopSlug={shopSlug} />
      <div className="grid gap-3 sm:grid-cols-3">
        <Field id="supplies-percent" label="Fee (%)" hint="Empty: no shop-supplies fee" error={fieldError("suppliesPercent")}>
          <Input name="suppliesPercent" inputMode="decimal" maxLength={12} defaultValue={values?.suppliesPercent ?? supplies.percent} />
        </Field>
        <Field id="supplies-base" label="Of" error={fieldError("suppliesBase")}>
          <Select name="suppliesBase" defaultValue={values?.suppliesBase ?? supplies.base}>
            <option value="labour">Labour</option>
            <option value="parts_and_labour">Parts and labour</option>
          </Select>
        </Field>
        <Field id="supplies-cap" label={`At most (${currency})`} hint="Empty: no cap" error={fieldError("suppliesCap")}>
          <Input name="suppliesCap" inputMode="decimal" maxLength={16} defaultValue={values?.suppliesCap ?? supplies.cap} />
        </Field>
      </div>
      <Checkbox name="suppliesTaxable" label="The fee is taxable" defaultChecked={values ? values.suppliesTaxable === "on" : supplies.taxable} error={fieldError("suppliesTaxable")} />
      <SaveRow form={form} label="Save shop-supplies fee" />
    </form>
  );
}

type Tolerance = { choice: ToleranceChoice; percent: string; fixed: string; cap: string };

export function ToleranceForm({ shopSlug, currency, tolerance }: { shopSlug: string; currency: string; tolerance: Tolerance }) {
  const form = useSettingsForm(saveToleranceAction, "toleranceSettings");
  const { values, fieldError } = form;
  const [choice, setChoice] = useState<string>(values?.toleranceKind ?? tolerance.choice);
  return (
    <form key={remount(form.state, tolerance)} action={form.formAction} className="space-y-4" aria-label="Over-estimate tolerance">
      <SettingsFormTop form={form} shopSlug={shopSlug} />
      <Field
        id="tolerance-kind"
        label="A charge may go over the authorised amount by"
        hint="Check which rule applies where you trade; whether it covers off-road machines depends on the state"
        error={fieldError("toleranceKind")}
      >
        <Select name="toleranceKind" value={choice} onChange={(e) => setChoice(e.target.value)}>
          <option value="strict">Nothing: any increase needs the owner&apos;s approval</option>
          {currency === "USD"
            ? (Object.entries(TOLERANCE_PRESETS) as [string, { label: string }][]).map(([name, p]) => (
                <option key={name} value={name}>
                  {p.label}
                </option>
              ))
            : null}
          <option value="custom">My own: the greater of a percent and an amount</option>
        </Select>
      </Field>
      {choice === "custom" ? (
        <div className="grid gap-3 sm:grid-cols-3">
          <Field id="tolerance-percent" label="Percent of the estimate" error={fieldError("tolerancePercent")}>
            <Input name="tolerancePercent" inputMode="decimal" maxLength={12} defaultValue={values?.tolerancePercent ?? tolerance.percent} />
          </Field>
          <Field id="tolerance-fixed" label={`Or an amount (${currency})`} error={fieldError("toleranceFixed")}>
            <Input name="toleranceFixed" inputMode="decimal" maxLength={16} defaultValue={values?.toleranceFixed ?? tolerance.fixed} />
          </Field>
          <Field id="tolerance-cap" label={`At most (${currency})`} hint="Empty: no cap" error={fieldError("toleranceCap")}>
            <Input name="toleranceCap" inputMode="decimal" maxLength={16} defaultValue={values?.toleranceCap ?? tolerance.cap} />
          </Field>
        </div>
      ) : null}
      <SaveRow form={form} label="Save tolerance" />
    </form>
  );
}

export function DropoffTermsForm({ shopSlug, currency, terms }: { shopSlug: string; currency: string; terms: { charge: string; upTo: string } }) {
  const form = useSettingsForm(saveDropoffTermsAction, "dropoffSettings");
  const { values, fieldError } = form;
  return (
    <form key={remount(form.state, terms)} action={form.formAction} className="space-y-4" aria-label="Standard drop-off terms">
      <SettingsFormTop form={form} shopSlug={shopSlug} />
      <div className="grid gap-3 sm:grid-cols-2">
        <Field id="dropoff-standard-charge" label={`Diagnosis charge (${currency})`} hint="Before tax; 0 for free diagnosis" error={fieldError("dropoffCharge")}>
          <Input name="dropoffCharge" inputMode="decimal" maxLength={16} defaultValue={values?.dropoffCharge ?? terms.charge} />
        </Field>
        <Field id="dropoff-standard-up-to" label={`Work authorised up to (${currency})`} hint="Before tax; more needs an approval request" error={fieldError("dropoffUpTo")}>
          <Input name="dropoffUpTo" inputMode="decimal" maxLength={16} defaultValue={values?.dropoffUpTo ?? terms.upTo} />
        </Field>
      </div>
      <SaveRow form={form} label="Save drop-off terms" />
    </form>
  );
}
