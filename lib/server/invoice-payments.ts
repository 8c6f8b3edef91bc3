import "server-only";
import { getRequestByPublicId } from "@/db/queries/approvals";
import { getLiveInvoice, lockJob } from "@/db/queries/invoices";
import { insertEntry } from "@/db/queries/entries";
import { getDepositByPublicId, getMoneyJob, insertCheckout, insertDeposit, listJobPayments, listOpenCheckouts, setDepositStatus } from "@/db/queries/payments";
import { getShopCurrency, getShopName } from "@/db/queries/shops";
import { type Tx, transaction } from "@/db/transaction";
import { AppError } from "@/lib/errors";
import { type PaymentEntryBody, formatInvoiceNumber } from "@/lib/invoices";
import { formatMoney, parseMoney } from "@/lib/money";
import type { Actor } from "@/lib/permissions";
import type { RecordDepositInput, RecordPaymentInput, RefundInput, RequestDepositInput } from "@/lib/schemas/invoices";
import { formatJobNumber } from "@/lib/schemas/jobs";
import type { JobAccess, Resolved } from "@/lib/server/access";
import { appUrl } from "@/lib/server/config";
import { ownerInvoicePath, queueDepositMail } from "@/lib/server/invoice-mail";
import { recordMoney } from "@/lib/server/money-moved";
import { paymentsError, stripe } from "@/lib/server/payments";

// Taking money: counter payments and deposits the desk records, parts deposits it asks for, online
// checkout for the owner, and refunds by the shop owner. Amounts are typed text read in the
// invoice's currency; nothing is taken past what is owed. Who may do each is declared by the handler
// or action ("jobMoney", "invoice", "deposit" in lib/server/access.ts).

/** A typed amount of money, more than zero, refused beside `field` otherwise. */
export function positiveAmount(text: string, currency: string, field = "amount"): number {
  try {
    const n = parseMoney(text, currency);
    if (n <= 0) throw new AppError("invalid", "The amount must be more than zero.");
    return n;
  } catch (error) {
    if (error instanceof AppError) throw new AppError("invalid", error.message, { [field]: [error.message] });
    throw error;
  }
}

/** The desk records cash, a card at the counter or a cheque against an issued invoice. */
export async function recordCounterPayment(actor: Actor, { invoice, job }: Resolved<"invoice">, input: RecordPaymentInput) {
  const minor = positiveAmount(input.amount, invoice.currency);
  await transaction(async (tx) => {
    await lockJob(tx, { shopId: job.shopId, jobId: job.id });
    const live = await getLiveInvoice({ shopId: job.shopId, jobId: job.id }, tx, true);
    if (!live || live.id !== invoice.id || live.status === "draft") throw new AppError("conflict", "Payments are taken against an issued invoice. Issue it first.");
    if (live.balanceMinor <= 0) throw new AppError("conflict", "Nothing is left to pay on this invoice.");
    if (minor > live.balanceMinor) {
      const due = formatMoney(live.balanceMinor, live.currency);
      throw new AppError("invalid", `That is more than the balance due (${due}).`, { amount: [`The balance due is ${due}.`] });
    }
    await recordMoney(tx, { shopId: job.shopId, jobId: job.id, kind: "payment", method: input.method, amountMinor: minor, currency: live.currency, reference: input.reference, invoiceId: live.id, userId: actor.userId, authorId: actor.userId });
  });
  return { job };
}

/** The desk asks for a parts deposit, on its own or with an approval request of the job. */
export async function requestDeposit(
  actor: Actor,
  { job }: JobAccess,
  input: RequestDepositInput,
  /** More work in the deposit's transaction (issue 19: link it to a special-order part); a throw undoes the deposit. */
  inTx?: (tx: Tx, depositId: number) => Promise<void>,
) {
  if (input.request) {
    const request = await getRequestByPublicId({ publicId: input.request });
    if (!request || request.jobId !== job.id) throw new AppError("invalid", "That approval request isn't on this job.", { request: ["Choose a request of this job."] });
  }
  const currency = await getShopCurrency({ shopId: job.shopId });
  const minor = positiveAmount(input.amount, currency);
  return transaction(async (tx) => {
    const owner = (await lockJob(tx, { shopId: job.shopId, jobId: job.id }))!;
    const deposit = await insertDeposit(tx, { shopId: job.shopId, jobId: job.id, amountMinor: minor, currency, note: input.note, requestPublicId: input.request, userId: actor.userId });
    if (inTx) await inTx(tx, deposit.id);
    const body: PaymentEntryBody = { event: "deposit_requested", invoice: null, number: null, method: null };
    await insertEntry(tx, { shopId: job.shopId, jobId: job.id, kind: "payment", authorId: actor.userId, visibility: "shared", body });
    if (owner.customerEmail) await queueDepositMail(tx, { to: owner.customerEmail, ownerName: owner.customerName, deposit, job: (await getMoneyJob(tx, job.id))! });
    return { job, deposit };
  });
}

/** The desk records a deposit paid at the counter: the whole amount asked for. */
export async function recordDeposit(actor: Actor, { deposit, job }: Resolved<"deposit">, input: RecordDepositInput) {
  await transaction(async (tx) => {
    await lockJob(tx, { shopId: job.shopId, jobId: job.id });
    const fresh = (await getDepositByPublicId({ publicId: deposit.publicId }, tx, true))!;
    if (fresh.status !== "open") throw new AppError("conflict", fresh.status === "paid" ? "This deposit is already paid." : "This deposit request was cancelled.");
    await recordMoney(tx, { shopId: job.shopId, jobId: job.id, kind: "deposit", method: input.method, amountMinor: fresh.amountMinor, currency: fresh.currency, reference: input.reference, depositId: fresh.id, userId: actor.userId, authorId: actor.userId });
    await setDepositStatus(tx, { shopId: job.shopId, id: fresh.id, status: "paid" });
  });
  return { job };
}

type Target = { kind: "invoice"; id: number; publicId: string; number: number } | { kind: "deposit"; id: number; publicId: string };

/** Opens (or reuses) a hosted checkout for what is owed, and returns where to send the owner. */
async function checkout(actor: Actor, job: { id: number; shopId: number; number: number; publicId: string }, target: Target, amountMinor: number, currency: string): Promise<{ url: string }> {
  const key = { shopId: job.shopId, jobId: job.id, invoiceId: target.kind === "invoice" ? target.id : null, depositId: target.kind === "deposit" ? target.id : null };
  const open = await listOpenCheckouts(key);
  const hour = Date.now() - 3600_000;
  const reusable = open.find((c) => c.amountMinor === amountMinor && c.url && new Date(c.createdAt).getTime() > hour);
  if (reusable?.url) return { url: reusable.url };

  const shopName = await getShopName({ shopId: job.shopId });
  const what = target.kind === "invoice" ? `Invoice ${formatInvoiceNumber(target.number)}` : "Parts deposit";
  const metadata = { job: job.publicId, [target.kind]: target.publicId, purpose: target.kind === "invoice" ? "balance" : "deposit" };
  const back = `${appUrl()}${ownerInvoicePath(job.publicId)}`;
  let session;
  try {
    session = await stripe().checkout.sessions.create(
      {
        mode: "payment",
        line_items: [{ quantity: 1, price_data: { currency: currency.toLowerCase(), unit_amount: amountMinor, product_data: { name: `${what} · ${formatJobNumber(job.number)} · ${shopName}`.slice(0, 250) } } }],
        // Our own reference in the owner's address bar, never the service's session id (issue 20 §4).
        success_url: `${back}?paid=${target.publicId}`,
        cancel_url: `${back}?cancelled=1`,
        client_reference_id: target.publicId,
        customer_email: actor.email,
        metadata,
        payment_intent_data: { metadata },
      },
      // A double tap within ten minutes gets the same session, not two.
      { idempotencyKey: `checkout:${target.kind}:${target.publicId}:${amountMinor}:${Math.floor(Date.now() / 600_000)}` },
    );
  } catch (error) {
    throw paymentsError(error, "starting the payment");
  }
  if (!session.url) throw new AppError("unavailable", "The payments service gave no payment page. Try again in a moment.");
  // The same session comes back for a repeated tap (idempotency key): record it once.
  await insertCheckout({ ...key, sessionId: session.id, url: session.url, amountMinor, currency, userId: actor.userId }).catch((error: unknown) => {
    if ((error as { code?: string }).code !== "ER_DUP_ENTRY") throw error;
  });
  // Older pages for the same thing would let it be paid twice: close them (best effort; their expiry webhooks mark them).
  for (const old of open.filter((c) => c.sessionId !== session.id)) await stripe().checkout.sessions.expire(old.sessionId).catch(() => undefined);
  return { url: session.url };
}

export async function startInvoiceCheckout(actor: Actor, { invoice, job }: Resolved<"invoice">) {
  if (invoice.status === "void") throw new AppError("conflict", "This invoice was cancelled by the shop.");
  if (invoice.balanceMinor <= 0) throw new AppError("conflict", "Nothing is left to pay on this invoice.");
  return checkout(actor, job, { kind: "invoice", id: invoice.id, publicId: invoice.publicId, number: invoice.number }, invoice.balanceMinor, invoice.currency);
}

export async function startDepositCheckout(actor: Actor, { deposit, job }: Resolved<"deposit">) {
  if (deposit.status !== "open") throw new AppError("conflict", deposit.status === "paid" ? "This deposit is already paid." : "The shop cancelled this deposit request.");
  return checkout(actor, job, { kind: "deposit", id: deposit.id, publicId: deposit.publicId }, deposit.amountMinor, deposit.currency);
}

/**
 * The shop owner refunds part or all of a payment: online ones through the payments service (the
 * refund is recorded from its answer; the webhook that follows finds it recorded), counter ones
 * are recorded as handed back the same way. Never more than what is left of that payment.
 */
export async function refundPayment(actor: Actor, { job }: JobAccess, input: RefundInput) {
  await transaction(async (tx) => {
    await lockJob(tx, { shopId: job.shopId, jobId: job.id });
    const payments = await listJobPayments({ shopId: job.shopId, jobId: job.id }, tx);
    const original = payments.find((p) => p.id === input.payment);
    // The payment must be this job's: the form names both, and the job is what access was checked on.
    if (!original) throw new AppError("not_found", "No such payment on this job.");
    if (original.kind === "refund") throw new AppError("invalid", "Only a payment or a deposit can be refunded.");
    const refunded = payments.filter((p) => p.refundOfPaymentId === original.id).reduce((sum, p) => sum + p.amountMinor, 0);
    const left = original.amountMinor - refunded;
    const minor = positiveAmount(input.amount, original.currency);
    if (minor > left) {
      const most = formatMoney(left, original.currency);
      throw new AppError("invalid", left <= 0 ? "This payment has already been refunded in full." : `At most ${most} of this payment can still be refunded.`, { amount: [`At most ${most}.`] });
    }
    let providerRefundId: string | null = null;
    if (original.method === "online") {
      if (!original.providerPaymentId) throw new AppError("conflict", "This online payment has no payment id to refund against.");
      try {
        const refund = await stripe().refunds.create(
          { payment_intent: original.providerPaymentId, amount: minor, reason: "requested_by_customer", metadata: { job: job.publicId, payment: String(original.id) } },
          { idempotencyKey: `refund:${original.id}:${refunded}:${minor}` },
        );
        providerRefundId = refund.id;
      } catch (error) {
        throw paymentsError(error, "refunding");
      }
    }
    const reference = input.reason ? `Refund: ${input.reason}`.slice(0, 120) : (providerRefundId ?? null);
    await recordMoney(tx, { shopId: job.shopId, jobId: job.id, kind: "refund", method: original.method, amountMinor: minor, currency: original.currency, reference, providerRefundId, refundOfPaymentId: original.id, invoiceId: original.invoiceId, userId: actor.userId, authorId: actor.userId });
  });
  return { job };
}
