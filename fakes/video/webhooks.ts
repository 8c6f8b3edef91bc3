// Webhook events POSTed to the app the way the hosted video service sends them: its JSON envelope with
// the previous attempts, signed `mux-signature: t=<unix seconds>,v1=<hex HMAC-SHA256 of "${t}.${rawBody}">`
// as `mux.webhooks.unwrap` verifies it. Signing and retries are the shared sender's.
import { randomUUID } from "node:crypto";
import { type WebhookFlavour, type WebhookOptions, WebhookSender } from "../shared/webhooks";
import type { VideoStore } from "./store";
import type { DeliveryAttempt, MuxAsset, MuxUpload, WebhookDelivery, WebhookType } from "./types";

/** Previous attempts in the shape of the hosted payload's `attempts` field. */
function toPayloadAttempt(attempt: DeliveryAttempt, address: string, maxAttempts: number) {
  return {
    id: attempt.id,
    address,
    created_at: attempt.at,
    max_attempts: maxAttempts,
    response_status_code: attempt.status ?? 0,
    response_body: attempt.error,
    response_headers: {},
    webhook_id: 1,
  };
}

const MUX: WebhookFlavour<WebhookDelivery> = {
  label: "video fake",
  signatureHeader: "mux-signature",
  contentType: "application/json",
  userAgent: "Mux Webhooks (Benchside video fake)",
  body: (delivery, { url, maxAttempts }) =>
    JSON.stringify({
      type: delivery.type,
      object: delivery.object,
      id: delivery.event_id,
      environment: { name: "Development", id: "benchside-video-fake" },
      data: delivery.data,
      created_at: delivery.created_at,
      attempts: delivery.attempts.map((a) => toPayloadAttempt(a, url, maxAttempts)),
      accessor_source: null,
      accessor: null,
      request_id: null,
    }),
  newAttempt: (attempt) => ({ id: randomUUID(), ...attempt }),
  describe: (delivery) => ({ type: delivery.type, eventId: delivery.event_id, objectId: delivery.object.id }),
};

export class VideoWebhooks extends WebhookSender<WebhookDelivery> {
  constructor(store: VideoStore, opts: WebhookOptions) {
    super(store, opts, MUX);
  }

  emit(type: WebhookType, object: WebhookDelivery["object"], data: MuxAsset | MuxUpload): WebhookDelivery {
    return this.record((state) => ({
      event_id: randomUUID(),
      type,
      object,
      created_at: new Date().toISOString(),
      // A snapshot: later changes to the asset must not rewrite an event already sent.
      data: structuredClone(data),
      state,
      attempts: [],
    }));
  }
}
