// What happens to money in the fake, shared by the API and the payment page: sessions expiring, a
// card being tried on a session, refunds. Each change is saved and announced with its webhook.
import type { ApiFailure, FailureSwitch } from "../shared/control";
import { newId, nowSeconds, type PaymentsStore } from "./store";
import { invalidRequest, PaymentsApiError } from "./errors";
import type { Charge, CheckoutSession, PaymentError, PaymentIntent, Refund, StoredSession } from "./types";
import type { PaymentsWebhooks } from "./webhooks";

export type FakeContext = {
  store: PaymentsStore;
  webhooks: PaymentsWebhooks;
  /** Base of the payment page URLs handed out. */
  publicUrl: string;
  /** The one secret key accepted; null accepts any `sk_test_…` key. */
  secretKey: string | null;
  apiFailures: FailureSwitch<ApiFailure>;
};

export function persist(ctx: FakeContext): void {
  ctx.store.save().catch((error: unknown) => console.error("payments fake: could not save state", error));
}

export function publicSession(s: StoredSession): CheckoutSession {
  const { line_items: _items, intent_metadata: _meta, ...session } = s;
  return session;
}

/** Test card numbers: the only ones the page takes (our own list; any other number is refused). */
export const TEST_CARDS: Record<string, { outcome: "succeed" } | { outcome: "decline"; error: PaymentError }> = {
  "4242424242424242": { outcome: "succeed" },
  "4000000000000002": { outcome: "decline", error: { type: "card_error", code: "card_declined", decline_code: "generic_decline", message: "Your card was declined." } },
  "4000000000009995": { outcome: "decline", error: { type: "card_error", code: "card_declined", decline_code: "insufficient_funds", message: "Your card has insufficient funds." } },
};

export function expireSession(ctx: FakeContext, s: StoredSession, idempotencyKey: string | null = null): void {
  s.status = "expired";
  s.url = null;
  persist(ctx);
  ctx.webhooks.emit("checkout.session.expired", publicSession(s), { idempotencyKey });
}

/** Sessions lapse when next looked at after expires_at: the same outcome as a sweeper, for a test server. */
export function expireIfDue(ctx: FakeContext, s: StoredSession): void {
  if (s.status === "open" && nowSeconds() >= s.expires_at) expireSession(ctx, s);
}

function intentFor(ctx: FakeContext, s: StoredSession): PaymentIntent {
  const existing = s.payment_intent ? ctx.store.intents.get(s.payment_intent) : undefined;
  if (existing) return existing;
  const intent: PaymentIntent = {
    id: newId("pi_"),
    object: "payment_intent",
    amount: s.amount_total,
    amount_received: 0,
    currency: s.currency,
    status: "requires_payment_method",
    latest_charge: null,
    last_payment_error: null,
    metadata: { ...s.intent_metadata },
    created: nowSeconds(),
    livemode: false,
  };
  ctx.store.intents.set(intent.id, intent);
  s.payment_intent = intent.id;
  return intent;
}

export type CardResult = { ok: true; redirect: string } | { ok: false; error: PaymentError };

/** A card tried on the payment page. A decline leaves the session open for another card. */
export function payWithCard(ctx: FakeContext, s: StoredSession, cardNumber: string): CardResult {
  const card = TEST_CARDS[cardNumber.replace(/[\s-]/g, "")];
  if (!card) {
    return { ok: false, error: { type: "card_error", code: "incorrect_number", message: "This test page takes only the test card numbers listed below." } };
  }
  const intent = intentFor(ctx, s);
  if (card.outcome === "decline") {
    intent.last_payment_error = card.error;
    persist(ctx);
    // As the hosted service does for each failed attempt; the session stays open for another card.
    ctx.webhooks.emit("payment_intent.payment_failed", intent);
    return { ok: false, error: card.error };
  }
  const charge: Charge = {
    id: newId("ch_"),
    object: "charge",
    amount: s.amount_total,
    amount_captured: s.amount_total,
    amount_refunded: 0,
    currency: s.currency,
    payment_intent: intent.id,
    paid: true,
    refunded: false,
    status: "succeeded",
    metadata: { ...intent.metadata },
    created: nowSeconds(),
    livemode: false,
  };
  ctx.store.charges.set(charge.id, charge);
  Object.assign(intent, { status: "succeeded", amount_received: s.amount_total, latest_charge: charge.id, last_payment_error: null });
  Object.assign(s, { status: "complete", payment_status: "paid", url: null });
  persist(ctx);
  ctx.webhooks.emit("checkout.session.completed", publicSession(s));
  return { ok: true, redirect: s.success_url.replaceAll("{CHECKOUT_SESSION_ID}", s.id) };
}

/** The charge as the API and the `charge.refunded` event show it: with its refunds. */
export function chargeWithRefunds(ctx: FakeContext, charge: Charge) {
  const data = ctx.store.refundsOf(charge.id);
  return { ...charge, refunds: { object: "list", data, has_more: false, url: `/v1/charges/${charge.id}/refunds` } };
}

const REASONS = new Set(["duplicate", "fraudulent", "requested_by_customer"]);

/** Refunds part or all of what is left of a paid intent's charge; never more than that. */
export function createRefund(
  ctx: FakeContext,
  intent: PaymentIntent,
  input: { amount?: number; reason?: string; metadata: Record<string, string> },
  idempotencyKey: string | null,
): Refund {
  const charge = ctx.store.chargeOf(intent);
  if (intent.status !== "succeeded" || !charge) throw invalidRequest(`PaymentIntent ${intent.id} has no successful payment to refund.`, "payment_intent");
  const left = charge.amount - charge.amount_refunded;
  if (left <= 0) throw new PaymentsApiError(400, "invalid_request_error", `Charge ${charge.id} has already been refunded in full.`, { code: "charge_already_refunded" });
  const amount = input.amount ?? left;
  if (amount > left) {
    throw new PaymentsApiError(400, "invalid_request_error", `Refund amount (${amount}) is more than what is left to refund on ${charge.id} (${left}).`, { code: "amount_too_large", param: "amount" });
  }
  if (input.reason !== undefined && !REASONS.has(input.reason)) throw invalidRequest("reason must be duplicate, fraudulent or requested_by_customer.", "reason");
  const refund: Refund = {
    id: newId("re_"),
    object: "refund",
    amount,
    charge: charge.id,
    payment_intent: intent.id,
    currency: charge.currency,
    status: "succeeded",
    reason: input.reason ?? null,
    metadata: input.metadata,
    created: nowSeconds(),
  };
  ctx.store.refunds.set(refund.id, refund);
  charge.amount_refunded += amount;
  charge.refunded = charge.amount_refunded === charge.amount;
  persist(ctx);
  ctx.webhooks.emit("charge.refunded", chargeWithRefunds(ctx, charge), { idempotencyKey });
  return refund;
}
