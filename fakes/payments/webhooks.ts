// Events POSTed to the app the way the hosted payments service sends them: the event as the body,
// `stripe-signature: t=<unix seconds>,v1=<hex HMAC-SHA256 of "${t}.${rawBody}">` keyed with the whole
// `whsec_…` string, as `stripe.webhooks.constructEvent` verifies it. Signing, retries and redelivery
// (/_fake/webhooks/redeliver) are the shared sender's.
import { type WebhookFlavour, type WebhookOptions, WebhookSender } from "../shared/webhooks";
import { newId, nowSeconds, type PaymentsStore } from "./store";
import type { Delivery, EventType } from "./types";

const STRIPE: WebhookFlavour<Delivery> = {
  label: "payments fake",
  signatureHeader: "stripe-signature",
  contentType: "application/json; charset=utf-8",
  userAgent: "Benchside payments fake",
  body: (delivery) => JSON.stringify(delivery.event, null, 2),
  newAttempt: (attempt) => attempt,
  describe: (delivery) => ({ type: delivery.event.type, eventId: delivery.event.id, objectId: delivery.object_id }),
};

export class PaymentsWebhooks extends WebhookSender<Delivery> {
  constructor(
    store: PaymentsStore,
    opts: WebhookOptions,
    private readonly apiVersion: string,
  ) {
    super(store, opts, STRIPE);
  }

  emit(type: EventType, object: { id: string }, request: { idempotencyKey: string | null } = { idempotencyKey: null }): Delivery {
    return this.record((state) => ({
      event: {
        id: newId("evt_"),
        object: "event",
        api_version: this.apiVersion,
        created: nowSeconds(),
        type,
        // A snapshot: later changes to the object must not rewrite an event already sent.
        data: { object: structuredClone(object) },
        livemode: false,
        pending_webhooks: 1,
        request: { id: request.idempotencyKey ? newId("req_", 14) : null, idempotency_key: request.idempotencyKey },
      },
      object_id: object.id,
      state,
      attempts: [],
    }));
  }
}
