"use client";
import { useState } from "react";
import { Button, Field, Input, Select } from "@/components/ui";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { SupplierOrderFields } from "@/components/bench/supplier-order-fields";
import { FORM_FIELDS } from "@/lib/schemas/form-fields";
import { backOrderAction, coreChargeAction, movePartAction, orderPartsAction, partDepositAction } from "../part-order-actions";

// The bench page's ordering forms (issue 19). Every field shows its own message; the ids the page
// fills (job, part) go to the banner.

function FieldNote({ id, message }: { id: string; message: string | undefined }) {
  return message ? (
    <p id={id} className="text-sm font-medium text-rust">
      {message}
    </p>
  ) : null;
}

/** This job's needed parts onto one supplier order: tick the parts, say where and when. */
export function OrderPartsForm({ jobPublicId, needed, today }: { jobPublicId: string; needed: { id: number; description: string }[]; today: string }) {
  const [ticked, setTicked] = useState<number[]>(needed.map((p) => p.id));
  const form = useBenchForm(orderPartsAction, { visible: FORM_FIELDS.orderParts.visible });
  return (
    <form action={form.formAction} className="space-y-3" aria-label="Order parts">
      <input type="hidden" name="job" value={jobPublicId} />
      <input type="hidden" name="parts" value={ticked.join(",")} />
      <FormError message={form.formError} />
      <fieldset className="space-y-1" aria-describedby={form.fieldError("parts") ? "order-parts-error" : undefined}>
        <legend className="font-semibold text-ink">Parts on this order</legend>
        {needed.map((p) => (
          <label key={p.id} className="flex min-h-tap items-center gap-2">
            <input
              type="checkbox"
              className="size-5"
              checked={ticked.includes(p.id)}
              onChange={(e) => setTicked((t) => (e.target.checked ? [...t, p.id] : t.filter((x) => x !== p.id)))}
            />
            {p.description}
          </label>
        ))}
      </fieldset>
      <FieldNote id="order-parts-error" message={form.fieldError("parts")} />
      <SupplierOrderFields idPrefix="order" today={today} values={form.values} fieldError={form.fieldError} />
      <Button type="submit" loading={form.pending}>
        Put on order
      </Button>
    </form>
  );
}

/** The supplier put a part on order back: it stays awaited, with the new date (or none yet). */
export function BackOrderForm({ jobPublicId, partId, description }: { jobPublicId: string; partId: number; description: string }) {
  const form = useBenchForm(backOrderAction, { visible: FORM_FIELDS.backOrder.visible });
  return (
    <form action={form.formAction} className="flex flex-wrap items-end gap-3">
      <input type="hidden" name="job" value={jobPublicId} />
      <input type="hidden" name="part" value={partId} />
      <Field id={`backorder-${partId}`} label={`Back-ordered: new date for ${description} (optional)`} error={form.fieldError("expectedOn")}>
        <Input name="expectedOn" type="date" />
      </Field>
      <Button type="submit" variant="secondary" loading={form.pending}>
        Mark back-ordered
      </Button>
      <FormError message={form.formError} />
    </form>
  );
}

/** A part that arrived goes to another job of the shop; this job can ask for another one. */
export function MovePartForm({ jobPublicId, partId, description }: { jobPublicId: string; partId: number; description: string }) {
  const form = useBenchForm(movePartAction, { visible: FORM_FIELDS.movePart.visible });
  return (
    <form action={form.formAction} className="space-y-2">
      <input type="hidden" name="job" value={jobPublicId} />
      <input type="hidden" name="part" value={partId} />
      <FormError message={form.formError} />
      <div className="flex flex-wrap items-end gap-3">
        <Field id={`move-${partId}`} label={`Move ${description} to job`} hint="e.g. J-0042" error={form.fieldError("toJob")}>
          <Input name="toJob" maxLength={12} defaultValue={form.values?.toJob} />
        </Field>
        <Field
          id={`move-${partId}-this`}
          label="And this job"
          hint="No longer needs it: a line the owner approved for this part is withdrawn, never billed here."
          error={form.fieldError("thisJob")}
        >
          <Select name="thisJob" defaultValue={form.values?.thisJob ?? "swap"} key={form.values?.thisJob}>
            <option value="swap">Takes that job&apos;s awaited one (its order comes here)</option>
            <option value="needs">Still needs one (add it as needed)</option>
            <option value="done">No longer needs it</option>
          </Select>
        </Field>
      </div>
      <Button type="submit" variant="secondary" loading={form.pending}>
        Move part
      </Button>
      {form.state?.ok ? <p role="status">Moved to job J-{String(form.state.data.toJob).padStart(4, "0")}.</p> : null}
    </form>
  );
}

/** The core charge on a part (blank clears it); refunded once the old part goes back. */
export function CoreChargeForm({ jobPublicId, partId, currency, current }: { jobPublicId: string; partId: number; currency: string; current: string }) {
  const form = useBenchForm(coreChargeAction, { visible: FORM_FIELDS.coreCharge.visible });
  return (
    <form action={form.formAction} className="flex flex-wrap items-end gap-3">
      <input type="hidden" name="job" value={jobPublicId} />
      <input type="hidden" name="part" value={partId} />
      <Field id={`core-${partId}`} label={`Core charge (${currency}, optional)`} error={form.fieldError("charge")}>
        <Input name="charge" inputMode="decimal" maxLength={16} defaultValue={form.values?.charge ?? current} />
      </Field>
      <Button type="submit" variant="secondary" loading={form.pending}>
        Save core charge
      </Button>
      <FormError message={form.formError} />
    </form>
  );
}

/** A deposit asked before a special-order part is ordered (the job's deposit requests). */
export function PartDepositForm({ jobPublicId, partId, currency }: { jobPublicId: string; partId: number; currency: string }) {
  const form = useBenchForm(partDepositAction, { visible: FORM_FIELDS.partDeposit.visible });
  return (
    <form action={form.formAction} className="space-y-2">
      <input type="hidden" name="job" value={jobPublicId} />
      <input type="hidden" name="part" value={partId} />
      <FormError message={form.formError} />
      <div className="grid gap-3 sm:grid-cols-2">
        <Field id={`deposit-${partId}`} label={`Deposit (${currency}, optional)`} hint="Blank: the part's sell price" error={form.fieldError("amount")}>
          <Input name="amount" inputMode="decimal" maxLength={16} defaultValue={form.values?.amount} />
        </Field>
        <Field id={`deposit-${partId}-note`} label="Note to the owner (optional)" error={form.fieldError("note")}>
          <Input name="note" maxLength={500} defaultValue={form.values?.note} />
        </Field>
      </div>
      <Button type="submit" variant="secondary" loading={form.pending}>
        Ask a deposit for this part
      </Button>
      {form.state?.ok ? <p role="status">Deposit asked: the owner can pay it from their job page.</p> : null}
    </form>
  );
}
