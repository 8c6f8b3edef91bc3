"use client";
import { Mail } from "lucide-react";
import { useState } from "react";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { Alert, Button, Field, Input, Select, Textarea } from "@/components/ui";
import { DEFAULT_DIAGNOSIS_DESCRIPTION } from "@/lib/dropoff";
import { FORM_VISIBLE } from "@/lib/form-visible";
import { prepareDropoffAction, prepareStandardDropoffAction, sendDropoffLinkAction } from "../dropoff-actions";

// The desk prepares the drop-off authorisation: the diagnosis charge (an amount, or a labour time
// at the shop's rate) and the amount the owner authorises. The wording is made from these.

const VISIBLE = FORM_VISIBLE.dropoffPrepare;

export type PrepareDefaults = { chargeKind: "amount" | "time"; chargeAmount: string; chargeHours: string; description: string; authorisedUpTo: string; terms: string };

export function DropoffPrepareForm({ jobPublicId, labourRate, defaults, submitLabel }: { jobPublicId: string; labourRate: string | null; defaults: PrepareDefaults | null; submitLabel: string }) {
  const form = useBenchForm(prepareDropoffAction, { visible: VISIBLE });
  const v = form.values;
  const [kind, setKind] = useState<"amount" | "time">(defaults?.chargeKind ?? "amount");
  return (
    <form action={form.formAction} className="space-y-4" aria-label="Prepare the drop-off authorisation">
      <input type="hidden" name="job" value={jobPublicId} />
      <FormError message={form.formError} />
      {form.state?.ok ? <Alert tone="success">Prepared. Have the owner sign it here, or e-mail them the link.</Alert> : null}
      <Field id="dropoff-description" label="What the charge is for" error={form.fieldError("description")}>
        <Input name="description" maxLength={200} defaultValue={v?.description ?? defaults?.description ?? DEFAULT_DIAGNOSIS_DESCRIPTION} />
      </Field>
      <Field id="dropoff-charge-kind" label="Charged as" error={form.fieldError("chargeKind")}>
        <Select name="chargeKind" value={kind} onChange={(e) => setKind(e.target.value === "time" ? "time" : "amount")}>
          <option value="amount">An amount</option>
          <option value="time" disabled={!labourRate}>
            {labourRate ? `Labour time at the shop's rate (${labourRate} an hour)` : "Labour time (set the shop's labour rate first)"}
          </option>
        </Select>
      </Field>
      {kind === "amount" ? (
        <Field id="dropoff-charge-amount" label="Diagnosis charge, before tax" hint="0 for no charge." error={form.fieldError("chargeAmount")} required>
          <Input name="chargeAmount" inputMode="decimal" maxLength={20} defaultValue={v?.chargeAmount ?? defaults?.chargeAmount ?? ""} />
        </Field>
      ) : (
        <Field id="dropoff-charge-hours" label="Labour time, in hours" hint="For example 0.5." error={form.fieldError("chargeHours")} required>
          <Input name="chargeHours" inputMode="decimal" maxLength={10} defaultValue={v?.chargeHours ?? defaults?.chargeHours ?? ""} />
        </Field>
      )}
      <Field id="dropoff-up-to" label="Authorised up to, before tax" hint="The most the owner agrees to without being asked again, the diagnosis charge included." error={form.fieldError("authorisedUpTo")} required>
        <Input name="authorisedUpTo" inputMode="decimal" maxLength={20} defaultValue={v?.authorisedUpTo ?? defaults?.authorisedUpTo ?? ""} />
      </Field>
      <Field id="dropoff-terms" label="Anything else agreed (optional)" hint="Printed with the wording, e.g. “Call before ordering parts.”" error={form.fieldError("terms")}>
        <Textarea name="terms" rows={2} maxLength={1000} defaultValue={v?.terms ?? defaults?.terms ?? ""} />
      </Field>
      <Button type="submit" loading={form.pending}>
        {submitLabel}
      </Button>
    </form>
  );
}

export function DropoffSendLink({ jobPublicId, email }: { jobPublicId: string; email: string }) {
  const form = useBenchForm(sendDropoffLinkAction, { visible: [] });
  return (
    <form action={form.formAction} className="space-y-2">
      <input type="hidden" name="job" value={jobPublicId} />
      <FormError message={form.formError} />
      {form.state?.ok ? <Alert tone="success">Sent to {form.state.data.to}. It waits in the outbox until the mail goes.</Alert> : null}
      <Button type="submit" variant="secondary" loading={form.pending} icon={<Mail aria-hidden className="size-5" />}>
        E-mail the owner a link to sign ({email})
      </Button>
    </form>
  );
}

/** Puts the shop's standard terms up for the owner to sign (anyone at the counter). */
export function DropoffStandardButton({ jobPublicId, terms }: { jobPublicId: string; terms: string }) {
  const form = useBenchForm(prepareStandardDropoffAction, { visible: [] });
  return (
    <form action={form.formAction} className="space-y-2" aria-label="Standard drop-off terms">
      <input type="hidden" name="job" value={jobPublicId} />
      <FormError message={form.formError} />
      <p className="text-ink">The shop&apos;s standard terms: {terms}.</p>
      <Button type="submit" loading={form.pending}>
        Put the standard terms up for signing
      </Button>
    </form>
  );
}
