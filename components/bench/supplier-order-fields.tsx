"use client";
import { Field, Input } from "@/components/ui";

// Where and when a supplier order was placed: the same four fields on the bench page's order
// form (one job) and the parts page's (several jobs). What was typed comes back after an error.

export function SupplierOrderFields({
  idPrefix,
  today,
  values,
  fieldError,
}: {
  /** Keeps the inputs' ids apart when both forms could share a page. */
  idPrefix: string;
  /** The shop's calendar day, the order date's default. */
  today: string;
  /** What was typed, after an error. */
  values: Record<string, string> | undefined;
  fieldError: (name: string) => string | undefined;
}) {
  return (
    <div className="grid gap-3 sm:grid-cols-2">
      <Field id={`${idPrefix}-supplier`} label="Supplier" error={fieldError("supplier")}>
        <Input name="supplier" maxLength={120} defaultValue={values?.supplier} />
      </Field>
      <Field id={`${idPrefix}-reference`} label="Order reference (optional)" error={fieldError("reference")}>
        <Input name="reference" maxLength={80} defaultValue={values?.reference} />
      </Field>
      <Field id={`${idPrefix}-ordered-on`} label="Ordered on" error={fieldError("orderedOn")}>
        <Input name="orderedOn" type="date" defaultValue={values?.orderedOn ?? today} />
      </Field>
      <Field id={`${idPrefix}-expected-on`} label="Expected (optional)" error={fieldError("expectedOn")}>
        <Input name="expectedOn" type="date" defaultValue={values?.expectedOn} />
      </Field>
    </div>
  );
}
