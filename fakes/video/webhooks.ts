// Webhook events POSTed to the app, signed the way the hosted service signs them and retried with
// exponential back-off until the app answers 2xx. Every retry carries the same event id.
import { createHmac, randomUUID } from "node:crypto";
import type { VideoStore } from "./store";
import type { DeliveryAttempt, MuxAsset, MuxUpload, WebhookDelivery, WebhookType } from "./types";

export type WebhookOptions = {
  url: string | undefined;
  secret: string | undefined;
  /** Delay before the 2nd attempt; doubles for each later one. */
  retryBaseMs: number;
  maxAttempts: number;
  timeoutMs: number;
};

/** `mux-signature: t=<unix seconds>,v1=<hex HMAC-SHA256 of "${t}.${rawBody}">`, as `mux.webhooks.unwrap` verifies it. */
export function signatureHeader(rawBody: string, secret: string, unixSeconds = Math.floor(Date.now() / 1000)): string {
  const v1 = createHmac("sha256", secret).update(`${unixSeconds}.${rawBody}`).digest("hex");
  return `t=${unixSeconds},v1=${v1}`;
}

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

export class WebhookSender {
  /** The drop switch: events are recorded as `dropped` instead of sent, and pending retries stop. */
  drop = false;
  private closed = false;
  /** Bumped by cancelPending, so attempts scheduled before it are forgotten. */
  private generation = 0;
  private readonly timers = new Set<NodeJS.Timeout>();
  private readonly inflight = new Set<AbortController>();
  private readonly store: VideoStore;
  private readonly opts: WebhookOptions;

  constructor(store: VideoStore, opts: WebhookOptions) {
    this.store = store;
    this.opts = opts;
  }

  emit(type: WebhookType, object: WebhookDelivery["object"], data: MuxAsset | MuxUpload): WebhookDelivery {
    const delivery: WebhookDelivery = {
      event_id: randomUUID(),
      type,
      object,
      created_at: new Date().toISOString(),
      // A snapshot: later changes to the asset must not rewrite an event already sent.
      data: structuredClone(data),
      state: this.drop ? "dropped" : this.opts.url ? "pending" : "unconfigured",
      attempts: [],
    };
    this.store.addDelivery(delivery);
    if (delivery.state === "pending") this.schedule(delivery, 0);
    this.persist();
    return delivery;
  }

  /** After a restart: carry on with deliveries that still had attempts left. */
  resumePending(): void {
    for (const delivery of this.store.deliveries) {
      if (delivery.state === "pending") this.schedule(delivery, this.opts.retryBaseMs);
    }
  }

  /** Stops retries of everything still pending (used by reset). */
  cancelPending(): void {
    for (const timer of this.timers) clearTimeout(timer);
    this.timers.clear();
    for (const controller of this.inflight) controller.abort();
    this.generation += 1;
  }

  close(): void {
    this.closed = true;
    this.cancelPending();
  }

  private persist(): void {
    if (this.closed) return;
    this.store.save().catch((error: unknown) => console.error("video fake: could not save state", error));
  }

  private schedule(delivery: WebhookDelivery, delayMs: number): void {
    const generation = this.generation;
    const timer = setTimeout(() => {
      this.timers.delete(timer);
      void this.attempt(delivery, generation);
    }, delayMs);
    // Pending retries alone must not keep a finished process alive.
    timer.unref();
    this.timers.add(timer);
  }

  private async attempt(delivery: WebhookDelivery, generation: number): Promise<void> {
    const { url, secret, maxAttempts } = this.opts;
    if (this.closed || generation !== this.generation || delivery.state !== "pending" || !url || !secret) return;
    if (this.drop) {
      delivery.state = "dropped";
      this.persist();
      return;
    }
    const rawBody = JSON.stringify({
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
    });
    const attempt: DeliveryAttempt = { id: randomUUID(), at: new Date().toISOString(), status: null, error: null };
    const controller = new AbortController();
    const timeout = setTimeout(() => controller.abort(), this.opts.timeoutMs);
    this.inflight.add(controller);
    try {
      const res = await fetch(url, {
        method: "POST",
        headers: {
          "content-type": "application/json",
          "mux-signature": signatureHeader(rawBody, secret),
          "user-agent": "Mux Webhooks (Benchside video fake)",
        },
        body: rawBody,
        redirect: "manual",
        signal: controller.signal,
      });
      attempt.status = res.status;
      await res.arrayBuffer().catch(() => undefined);
    } catch (error) {
      attempt.error = controller.signal.aborted ? "no answer in time" : error instanceof Error ? error.message : String(error);
    } finally {
      clearTimeout(timeout);
      this.inflight.delete(controller);
    }
    if (this.closed || generation !== this.generation) return;
    delivery.attempts.push(attempt);
    if (attempt.status !== null && attempt.status >= 200 && attempt.status < 300) {
      delivery.state = "delivered";
    } else if (delivery.attempts.length >= maxAttempts) {
      delivery.state = "failed";
      console.warn(`video fake: gave up on ${delivery.type} ${delivery.event_id} after ${maxAttempts} attempts`);
    } else {
      this.schedule(delivery, this.opts.retryBaseMs * 2 ** (delivery.attempts.length - 1));
    }
    this.persist();
  }
}
