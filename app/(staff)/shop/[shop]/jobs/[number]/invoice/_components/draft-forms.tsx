"use client";
import { Ban, FilePlus2, Send, Trash2 } from "lucide-react";
import { useState } from "react";
import { ActionButton, FormError, useBenchForm } from "@/components/bench/action-form";
import { Alert, Button, Field, Input, Select, Textarea } from "@/components/ui";
import { LINE_KINDS, LINE_KIND_LABEL, type LineKind } from "@/lib/approvals";
import { FORM_FIELDS } from "@/lib/schemas/form-fields";
import { formKey } from "./form-key";
import { addLineAction, createInvoiceAction, draftDetailsAction, issueInvoiceAction, removeLineAction, syncAuthorisedAction, voidInvoiceAction } from "../actions";

// The desk's forms for a draft invoice: make it, bring in newly authorised work, add or remove a
// line, the discount and notes, then issue (after a confirm step) or cancel.

type Ref = { invoice: string; version: number };
const hidden = (ref: Ref) => ({ invoice: ref.invoice, version: String(ref.version) });

function Hidden({ fields }: { fields: Record<string, string> }) {
  return Object.entries(fields).map(([name, value]) => <input key={name} type="hidden" name={name} value={value} />);
}

export function CreateInvoiceButton({ jobPublicId }: { jobPublicId: string }) {
  return (
    <ActionButton action={createInvoiceAction} fields={{ job: jobPublicId }} variant="primary" icon={<FilePlus2 aria-hidden className="size-5" />}>
      Make the invoice from authorised work
    </ActionButton>
  );
}

export function SyncButton({ refs, count }: { refs: Ref; count: number }) {
  return (
    <ActionButton action={syncAuthorisedAction} fields={hidden(refs)}>
      Bring in {count} newly authorised line{count === 1 ? "" : "s"}
    </ActionButton>
  );
}

export function RemoveLineButton({ refs, lineId, description }: { refs: Ref; lineId: number; description: string }) {
  return (
    <ActionButton action={removeLineAction} fields={{ ...hidden(refs), line: String(lineId) }} variant="ghost" icon={<Trash2 aria-hidden className="size-5" />}>
      <span className="sr-only">Remove {description}</span>
    </ActionButton>
  );
}

/** The shop's labour rates as typed text: its default (null until the owner sets one) and the named ones. */
export type RateChoices = { defaultRate: string | null; named: { name: string; rate: string }[] };

export function AddLineForm({ refs, currency, rates }: { refs: Ref; currency: string; rates: RateChoices }) {
  const form = useBenchForm(addLineAction, { visible: FORM_FIELDS.addLine.visible });
  const [kind, setKind] = useState<LineKind>("part");
  const { values, fieldError } = form;
  return (
    <form key={formKey(form.state, refs.version)} action={form.formAction} className="space-y-3" aria-label="Add a line">
      <Hidden fields={hidden(refs)} />
      <FormError message={form.formError} />
      <div className="grid gap-3 sm:grid-cols-2">
        <Field id="line-kind" label="Kind" error={fieldError("kind")}>
          <Select name="kind" value={kind} onChange={(e) => setKind(e.target.value as LineKind)}>
            {LINE_KINDS.map((k) => (
              <option key={k} value={k}>
                {LINE_KIND_LABEL[k]}
              </option>
            ))}
          </Select>
        </Field>
        <Field id="line-description" label="Description" error={fieldError("description")} required>
          <Input name="description" defaultValue={values?.description} maxLength={200} />
        </Field>
        {kind === "part" ? (
          <>
            <Field id="line-qty" label="Quantity" error={fieldError("qty")}>
              <Input name="qty" inputMode="decimal" defaultValue={values?.qty ?? "1"} maxLength={12} />
            </Field>
            <Field id="line-price" label={`Unit price (${currency})`} error={fieldError("unitPrice")}>
              <Input name="unitPrice" inputMode="decimal" defaultValue={values?.unitPrice} maxLength={16} />
            </Field>
          </>
        ) : kind === "labour" ? (
          <>
            <Field id="line-hours" label="Hours" error={fieldError("hours")}>
              <Input name="hours" inputMode="decimal" defaultValue={values?.hours} maxLength={8} />
            </Field>
            <Field
              id="line-rate"
              label={`Rate per hour (${currency})`}
              hint={rates.defaultRate ? `Leave empty for the shop's rate, ${rates.defaultRate}` : "The shop has no default rate yet: type the rate"}
              error={fieldError("rate")}
            >
              <Input name="rate" inputMode="decimal" defaultValue={values?.rate} maxLength={16} list={rates.named.length ? "line-rate-named" : undefined} />
            </Field>
            {rates.named.length ? (
              <datalist id="line-rate-named">
                {rates.named.map((r) => (
                  <option key={r.name} value={r.rate} label={r.name} />
                ))}
              </datalist>
            ) : null}
          </>
        ) : (
          <Field id="line-amount" label={`Amount (${currency})`} error={fieldError("amount")}>
            <Input name="amount" inputMode="decimal" defaultValue={values?.amount} maxLength={16} />
          </Field>
        )}
      </div>
      <label className="flex min-h-tap items-center gap-2">
        <input type="checkbox" name="taxable" defaultChecked={kind === "part"} key={kind} className="size-5" aria-describedby={fieldError("taxable") ? "line-taxable-error" : undefined} />
        Taxable
      </label>
      {fieldError("taxable") ? (
        <p id="line-taxable-error" className="text-sm font-medium text-rust">
          {fieldError("taxable")}
        </p>
      ) : null}
      <p className="text-sm text-ink-muted">A line that takes the total past what the owner authorised (plus the shop&apos;s tolerance) is flagged and not charged: it needs a new approval.</p>
      <Button type="submit" variant="secondary" loading={form.pending}>
        Add the line
      </Button>
    </form>
  );
}

export function DetailsForm({ refs, currency, discount, returnedPartsNote, note }: { refs: Ref; currency: string; discount: { kind: "none" | "amount" | "percent"; value: string }; returnedPartsNote: string | null; note: string | null }) {
  const form = useBenchForm(draftDetailsAction, { visible: FORM_FIELDS.draftDetails.visible });
  const { values, fieldError } = form;
  return (
    <form key={formKey(form.state, refs.version)} action={form.formAction} className="space-y-3" aria-label="Discount and notes">
      <Hidden fields={hidden(refs)} />
      <FormError message={form.formError} />
      <div className="grid gap-3 sm:grid-cols-2">
        <Field id="discount-kind" label="Discount" error={fieldError("discountKind")}>
          <Select name="discountKind" defaultValue={values?.discountKind ?? discount.kind}>
            <option value="none">No discount</option>
            <option value="amount">An amount ({currency})</option>
            <option value="percent">A percent</option>
          </Select>
        </Field>
        <Field id="discount-value" label="Discount value" hint="e.g. 10.00 or 5 (percent)" error={fieldError("discountValue")}>
          <Input name="discountValue" inputMode="decimal" defaultValue={values?.discountValue ?? discount.value} maxLength={16} />
        </Field>
      </div>
      <Field id="returned-parts" label="Returned-parts note" hint="Printed on the invoice, e.g. where the old parts are" error={fieldError("returnedPartsNote")}>
        <Textarea name="returnedPartsNote" rows={2} maxLength={500} defaultValue={values?.returnedPartsNote ?? returnedPartsNote ?? ""} />
      </Field>
      <Field id="invoice-note" label="Note on the invoice (optional)" error={fieldError("note")}>
        <Textarea name="note" rows={2} maxLength={1000} defaultValue={values?.note ?? note ?? ""} />
      </Field>
      <Button type="submit" variant="secondary" loading={form.pending}>
        Save discount and notes
      </Button>
      {form.state?.ok ? <p role="status">Saved.</p> : null}
    </form>
  );
}

export function IssueForm({ refs, blocked, to }: { refs: Ref; blocked: string | null; to: string }) {
  const form = useBenchForm(issueInvoiceAction, { visible: FORM_FIELDS.issue.visible });
  const [confirming, setConfirming] = useState(false);
  if (blocked) return <Alert tone="warning" title="Not ready to issue">{blocked}</Alert>;
  return (
    <form action={form.formAction} className="space-y-2">
      <Hidden fields={{ ...hidden(refs), confirmed: "yes" }} />
      <FormError message={form.formError} />
      {confirming ? (
        <div role="group" aria-label="Confirm issuing" className="flex flex-wrap items-center gap-2 rounded-lg bg-oil-soft p-3">
          <span className="flex-1 font-semibold text-ink">Issue the invoice? {to}</span>
          <Button type="submit" loading={form.pending} icon={<Send aria-hidden className="size-5" />}>
            Yes, issue it
          </Button>
          <Button variant="secondary" onClick={() => setConfirming(false)}>
            Not yet
          </Button>
        </div>
      ) : (
        <Button size="lg" onClick={() => setConfirming(true)} icon={<Send aria-hidden className="size-5" />}>
          Issue the invoice
        </Button>
      )}
    </form>
  );
}

export function VoidForm({ refs }: { refs: Ref }) {
  const form = useBenchForm(voidInvoiceAction, { visible: FORM_FIELDS.void.visible });
  const [open, setOpen] = useState(false);
  if (!open) {
    return (
      <Button variant="secondary" onClick={() => setOpen(true)} icon={<Ban aria-hidden className="size-5" />}>
        Cancel this invoice
      </Button>
    );
  }
  return (
    <form key={formKey(form.state, refs.version)} action={form.formAction} role="group" aria-label="Confirm cancelling" className="space-y-3 rounded-lg bg-rust-soft p-3">
      <Hidden fields={{ ...hidden(refs), confirmed: "yes" }} />
      <FormError message={form.formError} />
      <Field id="void-reason" label="Why it is cancelled" error={form.fieldError("reason")} required>
        <Input name="reason" maxLength={300} defaultValue={form.values?.reason} />
      </Field>
      <p className="text-sm">Its number stays used. Payments already taken stay on the job and count towards the next invoice.</p>
      <div className="flex flex-wrap gap-2">
        <Button type="submit" variant="danger" loading={form.pending}>
          Cancel the invoice
        </Button>
        <Button variant="secondary" onClick={() => setOpen(false)}>
          Keep it
        </Button>
      </div>
    </form>
  );
}
