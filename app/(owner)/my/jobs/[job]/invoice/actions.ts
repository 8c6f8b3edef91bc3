"use server";
import { redirect } from "next/navigation";
import { formAction } from "@/lib/action";
import { payDepositSchema, payInvoiceSchema } from "@/lib/schemas/invoices";
import { startDepositCheckout, startInvoiceCheckout } from "@/lib/server/invoice-payments";

// The owner's Pay buttons: open (or reuse) a checkout at the payments service for what is owed,
// then send the browser to its payment page. It comes back to the invoice page either way.

export const payInvoiceAction = formAction({ input: payInvoiceSchema, resource: "invoice", permission: "invoice:pay" }, async ({ actor, found }) => {
  const { url } = await startInvoiceCheckout(actor, found);
  redirect(url);
});

export const payDepositAction = formAction({ input: payDepositSchema, resource: "deposit", permission: "invoice:pay" }, async ({ actor, found }) => {
  const { url } = await startDepositCheckout(actor, found);
  redirect(url);
});
