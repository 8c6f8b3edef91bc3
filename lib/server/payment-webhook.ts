import "server-only";
import type Stripe from "stripe";
import type { z } from "zod";
import { lockJob } from "@/db/queries/invoices";
import { getJobByPublicId } from "@/db/queries/jobs";
import { closeCheckout, getCheckoutBySessionId, getPaymentByProviderId, getReturnCheckout, listJobPayments, recordWebhookEvent, setDepositStatus } from "@/db/queries/payments";
import { type Tx, transaction } from "@/db/transaction";
import { JOB_PUBLIC_ID_PATTERN } from "@/lib/journal";
import { recordInboxEvent } from "@/lib/server/inbox";
import { recordMoney } from "@/lib/server/money-moved";
import { stripe, verifyWebhook } from "@/lib/server/payments";
import { PAYMENT_EVENT_OBJECTS, firstIssue, paymentEventSchema, type paymentIntentSchema } from "@/lib/schemas/webhooks";

// What the payments service tells us, applied exactly once: the event id is recorded in the same
// transaction as its effect (a redelivery finds it and does nothing), and the provider's payment and
// refund ids are unique keys (the owner's return and the webhook can't both record one payment).

const idOf = (v: string | { id: string } | null | undefined) => (typeof v === "string" ? v : (v?.id ?? null));

/** A completed, paid session: the payment, the deposit or invoice it settles, entry and receipt. */
export async function applyCheckoutCompleted(tx: Tx, session: Stripe.Checkout.Session): Promise<boolean> {
  if (session.payment_status !== "paid") return false;
  const found = await getCheckoutBySessionId({ sessionId: session.id }, tx);
  if (!found) return false; // not one of ours (another integration on the same account)
  await lockJob(tx, { shopId: found.shopId, jobId: found.jobId });
  const checkout = (await getCheckoutBySessionId({ sessionId: session.id }, tx, true))!;
  await closeCheckout(tx, { id: checkout.id, status: "complete" });
  const intent = idOf(session.payment_intent as string | { id: string } | null);
  const recorded = await recordMoney(tx, {
    shopId: checkout.shopId,
    jobId: checkout.jobId,
    kind: checkout.depositId ? "deposit" : "payment",
    method: "online",
    // What was actually paid, as the service reports it.
    amountMinor: session.amount_total ?? checkout.amountMinor,
    currency: (session.currency ?? checkout.currency).toUpperCase(),
    reference: intent,
    invoiceId: checkout.invoiceId,
    depositId: checkout.depositId,
    providerPaymentId: intent ?? `session:${session.id}`,
    providerSessionId: session.id,
    userId: null,
    authorId: null,
  });
  if (recorded && checkout.depositId) await setDepositStatus(tx, { shopId: checkout.shopId, id: checkout.depositId, status: "paid" });
  return recorded !== null;
}

type RefundLike = { id: string; amount: number; payment_intent: string | { id: string } | null };

/** Refunds the service made (ours, or from its dashboard): each recorded once, by its id. */
export async function applyChargeRefunded(tx: Tx, charge: Stripe.Charge & { refunds?: { data?: RefundLike[] } | null }): Promise<boolean> {
  const intent = idOf(charge.payment_intent as string | { id: string } | null);
  const original = intent ? await getPaymentByProviderId(tx, intent) : null;
  if (!original) return false;
  await lockJob(tx, { shopId: original.shopId, jobId: original.jobId });
  let applied = false;
  const refunds = charge.refunds?.data;
  const base = { shopId: original.shopId, jobId: original.jobId, kind: "refund" as const, method: "online" as const, currency: original.currency, refundOfPaymentId: original.id, invoiceId: original.invoiceId, userId: null, authorId: null };
  if (refunds?.length) {
    for (const r of refunds) {
      if (idOf(r.payment_intent) !== intent) continue;
      applied = (await recordMoney(tx, { ...base, amountMinor: r.amount, reference: r.id, providerRefundId: r.id })) !== null || applied;
    }
    return applied;
  }
  // Without the list (some API versions leave it out): record whatever part of amount_refunded is new.
  const known = (await listJobPayments({ shopId: original.shopId, jobId: original.jobId }, tx)).filter((p) => p.refundOfPaymentId === original.id).reduce((s, p) => s + p.amountMinor, 0);
  const missing = charge.amount_refunded - known;
  if (missing <= 0) return false;
  return (await recordMoney(tx, { ...base, amountMinor: missing, reference: charge.id })) !== null;
}

async function applyCheckoutExpired(tx: Tx, session: Stripe.Checkout.Session): Promise<boolean> {
  const checkout = await getCheckoutBySessionId({ sessionId: session.id }, tx);
  if (!checkout || checkout.status !== "open") return false;
  await closeCheckout(tx, { id: checkout.id, status: "expired" });
  return true;
}

type FailedIntent = z.output<typeof paymentIntentSchema>;

/**
 * A payment attempt that failed (a declined card; the owner may try another): nothing about the
 * money changes, the desk hears why. The job is the one our checkout named in the intent's metadata.
 */
async function applyPaymentFailed(tx: Tx, intent: FailedIntent): Promise<boolean> {
  const publicId = intent.metadata?.job;
  const job = publicId && JOB_PUBLIC_ID_PATTERN.test(publicId) ? await getJobByPublicId({ publicId }) : null;
  if (!job) return false; // not one of ours
  const error = intent.last_payment_error;
  const reason = error?.decline_code ?? error?.code ?? null;
  await recordInboxEvent(tx, {
    shopId: job.shopId,
    jobId: job.id,
    kind: "payment_failed",
    actorUserId: null,
    summary: `Online payment didn't go through: ${error?.message ?? "the payment was not completed."}`,
    detail: reason ? `Reason given by the payments service: ${reason}` : null,
    amountMinor: intent.amount,
    currency: intent.currency.toUpperCase(),
    extra: { intent: intent.id, reason },
  });
  return true;
}

/** A delayed payment method (a bank debit) that failed after checkout: the desk hears of it. */
async function applyAsyncPaymentFailed(tx: Tx, session: Stripe.Checkout.Session): Promise<boolean> {
  const checkout = await getCheckoutBySessionId({ sessionId: session.id }, tx);
  if (!checkout) return false;
  await recordInboxEvent(tx, {
    shopId: checkout.shopId,
    jobId: checkout.jobId,
    kind: "payment_failed",
    actorUserId: null,
    summary: "Online payment didn't go through: the bank turned it down after checkout.",
    amountMinor: session.amount_total ?? checkout.amountMinor,
    currency: (session.currency ?? checkout.currency).toUpperCase(),
    extra: { session: session.id },
  });
  return true;
}

export type WebhookAnswer = { received: true; duplicate: boolean; applied: boolean; ignored?: string };

/**
 * POST /api/webhooks/payments: verify on the raw body, check its shape, then apply once. A signed
 * delivery we can't use (not JSON, wrong shape, a type we don't handle) is logged, acknowledged
 * and changes nothing: the service would retry anything but a 2xx for days.
 */
export async function receivePaymentWebhook(rawBody: string, signature: string | null): Promise<WebhookAnswer> {
  const parsed = paymentEventSchema.safeParse(verifyWebhook(rawBody, signature));
  if (!parsed.success) return ignored(`unusable payment event (${firstIssue(parsed.error)})`);
  const event = parsed.data;
  const objectSchema = PAYMENT_EVENT_OBJECTS[event.type as keyof typeof PAYMENT_EVENT_OBJECTS];
  if (!objectSchema) return ignored(`payment event ${event.id} of type ${event.type}: not one we act on`);
  const object = objectSchema.safeParse(event.data.object);
  if (!object.success) return ignored(`payment event ${event.id} (${event.type}): ${firstIssue(object.error)}`);
  // The shapes above are the SDK's types trimmed to what the apply functions read.
  const data = object.data as unknown;
  return transaction(async (tx) => {
    if (!(await recordWebhookEvent(tx, { eventId: event.id, type: event.type }))) return { received: true, duplicate: true, applied: false };
    let applied = false;
    if (event.type === "checkout.session.completed" || event.type === "checkout.session.async_payment_succeeded") applied = await applyCheckoutCompleted(tx, data as Stripe.Checkout.Session);
    else if (event.type === "checkout.session.expired") applied = await applyCheckoutExpired(tx, data as Stripe.Checkout.Session);
    else if (event.type === "charge.refunded") applied = await applyChargeRefunded(tx, data as Stripe.Charge);
    else if (event.type === "payment_intent.payment_failed") applied = await applyPaymentFailed(tx, data as FailedIntent);
    else if (event.type === "checkout.session.async_payment_failed") applied = await applyAsyncPaymentFailed(tx, data as Stripe.Checkout.Session);
    return { received: true, duplicate: false, applied };
  });
}

function ignored(reason: string): WebhookAnswer {
  console.warn(`payments webhook ignored: ${reason}`);
  return { received: true, duplicate: false, applied: false, ignored: reason };
}

export type ReturnState = "paid" | "open" | "expired" | "unknown";

/**
 * The owner is back from the payment page with ?paid=<invoice or deposit public id>. The webhook
 * may not have arrived yet: ask the service about that target's newest checkout, and record the
 * payment now if it is done (the webhook then finds it recorded). `job` is one whose money the
 * caller may see (the page resolves "jobMoney"); a reference of another job is "unknown".
 */
export async function confirmReturn(job: { id: number }, targetPublicId: string): Promise<ReturnState> {
  const checkout = await getReturnCheckout({ jobId: job.id, targetPublicId });
  if (!checkout) return "unknown";
  const sessionId = checkout.sessionId;
  if (checkout.status === "complete") return "paid";
  try {
    const session = await stripe().checkout.sessions.retrieve(sessionId);
    if (session.status === "complete" && session.payment_status === "paid") {
      await transaction((tx) => applyCheckoutCompleted(tx, session));
      return "paid";
    }
    return session.status === "expired" ? "expired" : "open";
  } catch (error) {
    console.error(error);
    return "unknown";
  }
}
