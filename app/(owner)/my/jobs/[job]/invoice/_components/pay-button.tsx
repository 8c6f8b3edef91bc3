"use client";
import { CreditCard } from "lucide-react";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { Button } from "@/components/ui";
import { payDepositAction, payInvoiceAction } from "../actions";

/** One big button: to the payment page for exactly what is owed (the amount is worked out on the server). */
export function PayButton({ target, label }: { target: { invoice: string } | { deposit: string }; label: string }) {
  const form = useBenchForm("invoice" in target ? payInvoiceAction : payDepositAction, { visible: [] });
  return (
    <form action={form.formAction} className="space-y-2">
      {"invoice" in target ? <input type="hidden" name="invoice" value={target.invoice} /> : <input type="hidden" name="deposit" value={target.deposit} />}
      <FormError message={form.formError} />
      <Button type="submit" size="lg" fullWidth loading={form.pending} icon={<CreditCard aria-hidden className="size-5" />}>
        {label}
      </Button>
    </form>
  );
}
