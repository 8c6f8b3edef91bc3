"use client";
import { HandCoins, Undo2 } from "lucide-react";
import { useState } from "react";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { FORM_FIELDS } from "@/lib/schemas/form-fields";
import { Alert, Button, Field, Input, Select } from "@/components/ui";
import { COUNTER_METHODS, PAYMENT_METHOD_LABEL } from "@/lib/invoices";
import { formKey } from "./form-key";
import { recordDepositAction, recordPaymentAction, refundAction, requestDepositAction } from "../actions";
import { FORM_VISIBLE } from "@/lib/form-visible";

// Money at the counter: a payment against the issued invoice, a parts deposit asked for or taken,
// and refunds (shop owner only; online payments go back through the payments service).

function MethodFields({ id, values, fieldError }: { id: string; values?: Record<string, string>; fieldError: (name: string) => string | undefined }) {
  return (
    <>
      <Field id={`${id}-method`} label="How it was paid" error={fieldError("method")}>
        <Select name="method" defaultValue={values?.method ?? "cash"}>
          {COUNTER_METHODS.map((m) => (
            <option key={m} value={m}>
              {PAYMENT_METHOD_LABEL[m]}
            </option>
          ))}
        </Select>
      </Field>
      <Field id={`${id}-reference`} label="Reference" hint="Terminal receipt or cheque number; optional for cash" error={fieldError("reference")}>
        <Input name="reference" maxLength={120} autoComplete="off" defaultValue={values?.reference} />
      </Field>
    </>
  );
}

export function RecordPaymentForm({ invoice, balance, currency }: { invoice: string; balance: string; currency: string }) {
  const form = useBenchForm(recordPaymentAction, { visible: FORM_FIELDS.recordPayment.visible });
  return (
    <form key={formKey(form.state, balance)} action={form.formAction} className="space-y-3" aria-label="Record a payment at the counter">
      <input type="hidden" name="invoice" value={invoice} />
      <FormError message={form.formError} />
      <div className="grid gap-3 sm:grid-cols-3">
        <Field id="pay-amount" label={`Amount (${currency})`} error={form.fieldError("amount")} required>
          <Input name="amount" inputMode="decimal" maxLength={16} defaultValue={form.values?.amount ?? balance} />
        </Field>
        <MethodFields id="pay" values={form.values} fieldError={form.fieldError} />
      </div>
      <Button type="submit" loading={form.pending} icon={<HandCoins aria-hidden className="size-5" />}>
        Record the payment
      </Button>
      {form.state?.ok ? <p role="status">Recorded; the owner gets a receipt by e-mail.</p> : null}
    </form>
  );
}

export function RequestDepositForm({ job, currency, requests }: { job: string; currency: string; requests: { publicId: string; title: string }[] }) {
  const form = useBenchForm(requestDepositAction, { visible: FORM_FIELDS.requestDeposit.visible });
  return (
    <form key={formKey(form.state)} action={form.formAction} className="space-y-3" aria-label="Ask for a parts deposit">
      <input type="hidden" name="job" value={job} />
      <FormError message={form.formError} />
      <div className="grid gap-3 sm:grid-cols-2">
        <Field id="deposit-amount" label={`Deposit (${currency})`} error={form.fieldError("amount")} required>
          <Input name="amount" inputMode="decimal" maxLength={16} defaultValue={form.values?.amount} />
        </Field>
        <Field id="deposit-request" label="With approval request (optional)" error={form.fieldError("request")}>
          <Select name="request" defaultValue={form.values?.request ?? ""}>
            <option value="">None</option>
            {requests.map((r) => (
              <option key={r.publicId} value={r.publicId}>
                {r.title}
              </option>
            ))}
          </Select>
        </Field>
      </div>
      <Field id="deposit-note" label="Note for the owner (optional)" hint="e.g. which parts it is for" error={form.fieldError("note")}>
        <Input name="note" maxLength={500} defaultValue={form.values?.note} />
      </Field>
      <Button type="submit" variant="secondary" loading={form.pending}>
        Ask for the deposit
      </Button>
      {form.state?.ok ? <p role="status">Asked; the owner gets an e-mail and can pay online.</p> : null}
    </form>
  );
}

export function RecordDepositForm({ deposit, amount }: { deposit: string; amount: string }) {
  const form = useBenchForm(recordDepositAction, { visible: FORM_VISIBLE.recordDeposit });
  return (
    <form key={formKey(form.state)} action={form.formAction} className="space-y-3" aria-label={`Record the ${amount} deposit`}>
      <input type="hidden" name="deposit" value={deposit} />
      <FormError message={form.formError} />
      <div className="grid gap-3 sm:grid-cols-2">
        <MethodFields id={`dep-${deposit}`} values={form.values} fieldError={form.fieldError} />
      </div>
      <Button type="submit" variant="secondary" loading={form.pending}>
        Record {amount} received
      </Button>
    </form>
  );
}

export function RefundForm({ job, payment, left, leftValue, label, online }: { job: string; payment: number; left: string; leftValue: string; label: string; online: boolean }) {
  const form = useBenchForm(refundAction, { visible: FORM_VISIBLE.refund });
  const [open, setOpen] = useState(false);
  if (!open) {
    return (
      <Button variant="ghost" onClick={() => setOpen(true)} icon={<Undo2 aria-hidden className="size-5" />}>
        Refund<span className="sr-only"> {label}</span>
      </Button>
    );
  }
  return (
    <form key={formKey(form.state, leftValue)} action={form.formAction} role="group" aria-label={`Refund ${label}`} className="w-full space-y-3 rounded-lg bg-rust-soft p-3">
      <input type="hidden" name="job" value={job} />
      <input type="hidden" name="payment" value={payment} />
      <input type="hidden" name="confirmed" value="yes" />
      <FormError message={form.formError} />
      <div className="grid gap-3 sm:grid-cols-2">
        <Field id={`refund-${payment}-amount`} label="Amount to refund" hint={`At most ${left}`} error={form.fieldError("amount")} required>
          <Input name="amount" inputMode="decimal" maxLength={16} defaultValue={form.values?.amount ?? leftValue} />
        </Field>
        <Field id={`refund-${payment}-reason`} label="Reason (optional)" error={form.fieldError("reason")}>
          <Input name="reason" maxLength={300} defaultValue={form.values?.reason} />
        </Field>
      </div>
      <Alert tone="warning" title="This gives money back">
        {online ? "The refund goes back to the owner's card through the payments service." : "Record this only once you have handed the money back."}
      </Alert>
      <div className="flex flex-wrap gap-2">
        <Button type="submit" variant="danger" loading={form.pending}>
          Refund it
        </Button>
        <Button variant="secondary" onClick={() => setOpen(false)}>
          Don&apos;t refund
        </Button>
      </div>
    </form>
  );
}
