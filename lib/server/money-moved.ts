import "server-only";
import type { Tx } from "@/db/transaction";
import { getLiveInvoice, lockJob } from "@/db/queries/invoices";
import { insertEntry } from "@/db/queries/entries";
import { getMoneyJob, insertPayment, listJobPayments, type NewPayment } from "@/db/queries/payments";
import { type PaymentEntryBody, type PaymentKind, type PaymentMethod, formatInvoiceNumber } from "@/lib/invoices";
import { ownerReference, receiptNumbers } from "@/lib/receipts";
import { queueReceiptMail } from "@/lib/server/invoice-mail";
import { recordInboxEvent } from "@/lib/server/inbox";
import { recompute } from "@/lib/server/invoices";

// The one way money is recorded, whoever reports it (the desk, the payments webhook, the owner's
// return from paying, a refund's API answer): in the caller's transaction, with the job row locked,
// insert the payment (a provider id already recorded means "already done": nothing else happens),
// re-price the live invoice, post a shared timeline entry without amounts and queue the receipt.

export type RecordedMoney = { paymentId: number; balanceMinor: number | null } | null;

export async function recordMoney(tx: Tx, p: NewPayment & { authorId: number | null }): Promise<RecordedMoney> {
  const owner = await lockJob(tx, { shopId: p.shopId, jobId: p.jobId });
  if (!owner) throw new Error(`job ${p.jobId} not found`);
  const live = await getLiveInvoice({ shopId: p.shopId, jobId: p.jobId }, tx, true);
  const paymentId = await insertPayment(tx, { ...p, invoiceId: p.invoiceId ?? (live && live.status !== "draft" ? live.id : null) });
  if (paymentId === null) return null;

  let invoice = live;
  if (live) {
    await recompute(tx, live);
    invoice = await getLiveInvoice({ shopId: p.shopId, jobId: p.jobId }, tx);
  }
  const shown = invoice && invoice.status !== "draft" ? invoice : null;
  const event: PaymentEntryBody["event"] =
    p.kind === "refund" ? "refunded" : p.kind === "deposit" ? "deposit_paid" : shown && shown.balanceMinor <= 0 ? "paid_in_full" : "part_paid";
  const body: PaymentEntryBody = { event, invoice: shown?.publicId ?? null, number: shown ? formatInvoiceNumber(shown.number) : null, method: p.method };
  await insertEntry(tx, { shopId: p.shopId, jobId: p.jobId, kind: "payment", authorId: p.authorId, visibility: "shared", body });
  // The desk's inbox: the amount rides beside the line, for staff who may see money only.
  await recordInboxEvent(tx, {
    shopId: p.shopId,
    jobId: p.jobId,
    kind: p.kind === "refund" ? "payment_refunded" : "payment_received",
    actorUserId: p.authorId,
    summary: inboxLine(p.kind, event, p.method, body.number),
    amountMinor: p.amountMinor,
    currency: p.currency,
    extra: { payment: paymentId, method: p.method },
  });
  if (owner.customerEmail) {
    const job = (await getMoneyJob(tx, p.jobId))!;
    // The receipt carries the shop's own number, never the payments service's id.
    const receipt = receiptNumbers(job.number, await listJobPayments({ shopId: p.shopId, jobId: p.jobId }, tx)).get(paymentId)!;
    await queueReceiptMail(tx, {
      to: owner.customerEmail,
      ownerName: owner.customerName,
      paymentId,
      kind: p.kind,
      method: p.method,
      amountMinor: p.amountMinor,
      currency: p.currency,
      receipt,
      reference: ownerReference({ reference: p.reference ?? null, providerPaymentId: p.providerPaymentId, providerRefundId: p.providerRefundId }),
      invoice: shown,
      job,
    });
  }
  return { paymentId, balanceMinor: shown?.balanceMinor ?? null };
}

const HOW: Record<PaymentMethod, string> = { online: "online", cash: "in cash", card_terminal: "by card at the counter", cheque: "by cheque" };

/** The inbox line for money that moved, without the amount. */
function inboxLine(kind: PaymentKind, event: PaymentEntryBody["event"], method: PaymentMethod, invoiceNumber: string | null): string {
  const on = invoiceNumber ? ` on invoice ${invoiceNumber}` : "";
  if (kind === "refund") return `Refund${on} ${method === "online" ? "through the payments service" : `paid back ${HOW[method]}`}`;
  if (kind === "deposit") return `Parts deposit paid ${HOW[method]}`;
  return event === "paid_in_full" ? `Paid in full ${HOW[method]}${on}` : `Part payment ${HOW[method]}${on}`;
}
