// Events POSTed to the app, signed the way the hosted service signs them and retried with
// exponential back-off until the app answers 2xx. Every retry (and a redelivery asked for through
// /_fake/webhooks/redeliver) carries the same event id and body; only the signature's time changes.
import { createHmac } from "node:crypto";
import { newId, nowSeconds, type PaymentsStore } from "./store";
import type { Delivery, DeliveryAttempt, EventType } from "./types";

export type WebhookOptions = {
  url: string | undefined;
  secret: string | undefined;
  /** Delay before the 2nd attempt; doubles for each later one. */
  retryBaseMs: number;
  maxAttempts: number;
  timeoutMs: number;
  apiVersion: string;
};

/**
 * `stripe-signature: t=<unix seconds>,v1=<hex HMAC-SHA256 of "${t}.${rawBody}">`, keyed with the whole
 * `whsec_…` string, as `stripe.webhooks.constructEvent` verifies it.
 */
export function signatureHeader(rawBody: string, secret: string, unixSeconds = nowSeconds()): string {
  const v1 = createHmac("sha256", secret).update(`${unixSeconds}.${rawBody}`, "utf8").digest("hex");
  return `t=${unixSeconds},v1=${v1}`;
}

export class WebhookSender {
  /** The drop switch: events are recorded as `dropped` instead of sent, and pending retries stop. */
  drop = false;
  private closed = false;
  /** Bumped by cancelPending, so attempts scheduled before it are forgotten. */
  private generation = 0;
  private readonly timers = new Set<NodeJS.Timeout>();
  private readonly inflight = new Set<AbortController>();

  constructor(
    private readonly store: PaymentsStore,
    private readonly opts: WebhookOptions,
  ) {}

  emit(type: EventType, object: { id: string }, request: { idempotencyKey: string | null } = { idempotencyKey: null }): Delivery {
    const delivery: Delivery = {
      event: {
        id: newId("evt_"),
        object: "event",
        api_version: this.opts.apiVersion,
        created: nowSeconds(),
        type,
        // A snapshot: later changes to the object must not rewrite an event already sent.
        data: { object: structuredClone(object) },
        livemode: false,
        pending_webhooks: 1,
        request: { id: request.idempotencyKey ? newId("req_", 14) : null, idempotency_key: request.idempotencyKey },
      },
      object_id: object.id,
      state: this.drop ? "dropped" : this.opts.url ? "pending" : "unconfigured",
      attempts: [],
    };
    this.store.addDelivery(delivery);
    if (delivery.state === "pending") this.schedule(delivery, 0);
    this.persist();
    return delivery;
  }

  /** Sends an event again, as the hosted dashboard's "resend" does: same id, same body. */
  redeliver(delivery: Delivery): void {
    if (!this.opts.url) return;
    delivery.state = "pending";
    // Room for at least one more try within the attempt limit; the log keeps the latest ones.
    delivery.attempts = delivery.attempts.slice(Math.max(0, delivery.attempts.length - (this.opts.maxAttempts - 1)));
    this.schedule(delivery, 0);
  }

  /** After a restart: carry on with deliveries that still had attempts left. */
  resumePending(): void {
    for (const delivery of this.store.deliveries) if (delivery.state === "pending") this.schedule(delivery, this.opts.retryBaseMs);
  }

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
    this.store.save().catch((error: unknown) => console.error("payments fake: could not save state", error));
  }

  private schedule(delivery: Delivery, delayMs: number): void {
    const generation = this.generation;
    const timer = setTimeout(() => {
      this.timers.delete(timer);
      void this.attempt(delivery, generation);
    }, delayMs);
    // Pending retries alone must not keep a finished process alive.
    timer.unref();
    this.timers.add(timer);
  }

  private async attempt(delivery: Delivery, generation: number): Promise<void> {
    const { url, secret, maxAttempts } = this.opts;
    if (this.closed || generation !== this.generation || delivery.state !== "pending" || !url || !secret) return;
    if (this.drop) {
      delivery.state = "dropped";
      this.persist();
      return;
    }
    const rawBody = JSON.stringify(delivery.event, null, 2);
    const attempt: DeliveryAttempt = { at: new Date().toISOString(), status: null, error: null };
    const controller = new AbortController();
    const timeout = setTimeout(() => controller.abort(), this.opts.timeoutMs);
    this.inflight.add(controller);
    try {
      const res = await fetch(url, {
        method: "POST",
        headers: { "content-type": "application/json; charset=utf-8", "stripe-signature": signatureHeader(rawBody, secret), "user-agent": "Benchside payments fake" },
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
      console.warn(`payments fake: gave up on ${delivery.event.type} ${delivery.event.id} after ${maxAttempts} attempts`);
    } else {
      this.schedule(delivery, this.opts.retryBaseMs * 2 ** (delivery.attempts.length - 1));
    }
    this.persist();
  }
}
