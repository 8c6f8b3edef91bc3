// The objects the payments fake keeps and returns, in the shapes the `stripe` SDK reads (the fields
// Benchside and its tests use; amounts in the currency's smallest unit, times in unix seconds).
import type { BaseDelivery } from "../shared/webhooks";

export type Metadata = Record<string, string>;

export type LineItem = { name: string; currency: string; unit_amount: number; quantity: number };

export type CheckoutSession = {
  id: string;
  object: "checkout.session";
  /** The hosted payment page while the session is open; null once it is complete or expired. */
  url: string | null;
  status: "open" | "complete" | "expired";
  payment_status: "unpaid" | "paid";
  mode: "payment";
  amount_subtotal: number;
  amount_total: number;
  currency: string;
  success_url: string;
  cancel_url: string | null;
  metadata: Metadata;
  client_reference_id: string | null;
  customer_email: string | null;
  payment_intent: string | null;
  created: number;
  expires_at: number;
  livemode: false;
};

/** A session plus what the fake needs privately (never sent). */
export type StoredSession = CheckoutSession & { line_items: LineItem[]; intent_metadata: Metadata };

export type PaymentError = { type: "card_error"; code: string; decline_code?: string; message: string };

export type PaymentIntent = {
  id: string;
  object: "payment_intent";
  amount: number;
  amount_received: number;
  currency: string;
  status: "requires_payment_method" | "succeeded";
  latest_charge: string | null;
  last_payment_error: PaymentError | null;
  metadata: Metadata;
  created: number;
  livemode: false;
};

export type Refund = {
  id: string;
  object: "refund";
  amount: number;
  charge: string;
  payment_intent: string;
  currency: string;
  status: "succeeded";
  reason: string | null;
  metadata: Metadata;
  created: number;
};

export type Charge = {
  id: string;
  object: "charge";
  amount: number;
  amount_captured: number;
  amount_refunded: number;
  currency: string;
  payment_intent: string;
  paid: true;
  refunded: boolean;
  status: "succeeded";
  metadata: Metadata;
  created: number;
  livemode: false;
};

export type EventType = "checkout.session.completed" | "checkout.session.expired" | "charge.refunded" | "payment_intent.payment_failed";

export type StripeEvent = {
  id: string;
  object: "event";
  api_version: string;
  created: number;
  type: EventType;
  data: { object: unknown };
  livemode: false;
  pending_webhooks: number;
  request: { id: string | null; idempotency_key: string | null };
};

/** One event and what happened to it, as `/_fake/webhooks` lists it. */
export type Delivery = BaseDelivery & { event: StripeEvent; object_id: string };

/** A POST answered once: the same Idempotency-Key with the same body gets the same answer again. */
export type IdempotentAnswer = { key: string; request: string; status: number; body: unknown; at: number };
