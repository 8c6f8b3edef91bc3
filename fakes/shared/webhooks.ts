// Events POSTed to the app, signed the way the hosted services sign them (`t=<unix seconds>,v1=<hex
// HMAC-SHA256 of "${t}.${rawBody}">`) and retried with exponential back-off until the app answers 2xx.
// Every retry (and a redelivery) carries the same event id; only the signature's time changes. Each
// fake supplies its flavour: the header names, the body, what an event is about.
import { createHmac } from "node:crypto";

/**
 * pending: still being tried; delivered: answered 2xx; failed: out of attempts;
 * dropped: the drop switch was on; unconfigured: no webhook URL was set.
 */
export type DeliveryState = "pending" | "delivered" | "failed" | "dropped" | "unconfigured";
export type DeliveryAttempt = { at: string; status: number | null; error: string | null };
/** One event and what happened to it, as `/_fake/webhooks` lists it. */
export type BaseDelivery = { state: DeliveryState; attempts: DeliveryAttempt[] };

/** Where deliveries are logged and kept (the fake's store). */
export type DeliveryLog<D> = { deliveries: D[]; addDelivery(delivery: D): void; save(): Promise<void> };

export type WebhookOptions = {
  url: string | undefined;
  secret: string | undefined;
  /** Delay before the 2nd attempt; doubles for each later one. */
  retryBaseMs: number;
  maxAttempts: number;
  timeoutMs: number;
};

/** The webhook part of a fake's options. */
export type WebhookFakeOptions = {
  /** The app's webhook endpoint; needs `webhookSecret`. Without it events are only recorded. */
  webhookUrl?: string;
  webhookSecret?: string;
  /** Delay before the first retry (doubles after each); default 1000 ms. */
  webhookRetryBaseMs?: number;
  /** Default 8 (about 2 minutes of retries at the default base). */
  webhookMaxAttempts?: number;
  webhookTimeoutMs?: number;
};

/** Throws unless a webhook URL is http(s) and comes with the secret (named `secretName` in the environment). */
export function checkWebhookOptions(label: string, opts: WebhookFakeOptions, secretName: string): void {
  if (!opts.webhookUrl) return;
  if (!/^https?:\/\//.test(opts.webhookUrl) || !URL.canParse(opts.webhookUrl)) throw new Error(`${label}: the webhook URL "${opts.webhookUrl}" is not an http(s) URL`);
  if (!opts.webhookSecret) throw new Error(`${label}: a webhook URL needs ${secretName} to sign the events`);
}

/** The webhook target from the environment, for a fake run as a process. */
export function webhookEnv(urlName: string, secretName: string): WebhookFakeOptions {
  return { webhookUrl: process.env[urlName] || undefined, webhookSecret: process.env[secretName] || undefined };
}

/** For the start-up line: where events go, or that they are only recorded. */
export function webhookTarget(urlName: string, what: string): string {
  const url = process.env[urlName];
  return url ? `, webhooks to ${url}` : ` (no ${urlName}: ${what} are only recorded)`;
}

export function webhookOptions(opts: WebhookFakeOptions): WebhookOptions {
  return {
    url: opts.webhookUrl || undefined,
    secret: opts.webhookSecret || undefined,
    retryBaseMs: opts.webhookRetryBaseMs ?? 1000,
    maxAttempts: opts.webhookMaxAttempts ?? 8,
    timeoutMs: opts.webhookTimeoutMs ?? 10_000,
  };
}

/** The signature header's value, as the hosted services' SDKs verify it. */
export function signatureHeader(rawBody: string, secret: string, unixSeconds = Math.floor(Date.now() / 1000)): string {
  const v1 = createHmac("sha256", secret).update(`${unixSeconds}.${rawBody}`, "utf8").digest("hex");
  return `t=${unixSeconds},v1=${v1}`;
}

/** How one hosted service shapes its deliveries. */
export type WebhookFlavour<D extends BaseDelivery> = {
  /** "video fake", for log lines. */
  label: string;
  signatureHeader: string;
  contentType: string;
  userAgent: string;
  /** The raw body of the next attempt (signed as is). */
  body(delivery: D, target: { url: string; maxAttempts: number }): string;
  /** The record of an attempt about to be made (a fake may add an id). */
  newAttempt(attempt: DeliveryAttempt): D["attempts"][number];
  describe(delivery: D): { type: string; eventId: string; objectId: string };
  /** Where this delivery goes, when each event names its own address (an SMS status callback); default the configured URL. */
  target?(delivery: D): string | null;
  /** The signature header's value, for a service that doesn't sign the shared way (`signatureHeader`). */
  sign?(rawBody: string, secret: string, url: string): string;
  /** Several signing headers instead of one (Standard Webhooks: id, timestamp, signature); replaces `signatureHeader`. */
  signingHeaders?(delivery: D, rawBody: string, secret: string): Record<string, string>;
};

export class WebhookSender<D extends BaseDelivery> {
  /** The drop switch: events are recorded as `dropped` instead of sent, and pending retries stop. */
  drop = false;
  private closed = false;
  /** Bumped by cancelPending, so attempts scheduled before it are forgotten. */
  private generation = 0;
  private readonly timers = new Set<NodeJS.Timeout>();
  private readonly inflight = new Set<AbortController>();

  constructor(
    private readonly store: DeliveryLog<D>,
    protected readonly opts: WebhookOptions,
    private readonly flavour: WebhookFlavour<D>,
  ) {}

  /** Logs a new event and, unless dropped or unconfigured, starts sending it. */
  protected record(build: (state: DeliveryState) => D): D {
    const delivery = build(this.drop ? "dropped" : "pending");
    if (delivery.state === "pending" && !this.urlOf(delivery)) delivery.state = "unconfigured";
    this.store.addDelivery(delivery);
    if (delivery.state === "pending") this.schedule(delivery, 0);
    this.persist();
    return delivery;
  }

  /** The delivery log, filtered by event type and by the object the event is about. */
  list(type: string | null, objectId: string | null): D[] {
    return this.store.deliveries.filter((d) => {
      const about = this.flavour.describe(d);
      return (type === null || about.type === type) && (objectId === null || about.objectId === objectId);
    });
  }

  find(eventId: unknown): D | undefined {
    return this.store.deliveries.find((d) => this.flavour.describe(d).eventId === eventId);
  }

  /** Sends an event again, as a hosted dashboard's "resend" does: same id, same body. */
  redeliver(delivery: D): void {
    if (!this.urlOf(delivery)) return;
    delivery.state = "pending";
    // Room for at least one more try within the attempt limit; the log keeps the latest ones.
    delivery.attempts = delivery.attempts.slice(Math.max(0, delivery.attempts.length - (this.opts.maxAttempts - 1)));
    this.schedule(delivery, 0);
  }

  /** After a restart: carry on with deliveries that still had attempts left. */
  resumePending(): void {
    for (const delivery of this.store.deliveries) if (delivery.state === "pending") this.schedule(delivery, this.opts.retryBaseMs);
  }

  /** Stops retries of everything still pending. */
  cancelPending(): void {
    for (const timer of this.timers) clearTimeout(timer);
    this.timers.clear();
    for (const controller of this.inflight) controller.abort();
    this.generation += 1;
  }

  /** The switch off, nothing pending, an empty log (POST /_fake/reset). */
  reset(): void {
    this.drop = false;
    this.cancelPending();
    this.store.deliveries = [];
  }

  close(): void {
    this.closed = true;
    this.cancelPending();
  }

  private urlOf(delivery: D): string | null {
    return this.flavour.target ? this.flavour.target(delivery) : (this.opts.url ?? null);
  }

  private persist(): void {
    if (this.closed) return;
    this.store.save().catch((error: unknown) => console.error(`${this.flavour.label}: could not save state`, error));
  }

  private schedule(delivery: D, delayMs: number): void {
    const generation = this.generation;
    const timer = setTimeout(() => {
      this.timers.delete(timer);
      void this.attempt(delivery, generation);
    }, delayMs);
    // Pending retries alone must not keep a finished process alive.
    timer.unref();
    this.timers.add(timer);
  }

  private async attempt(delivery: D, generation: number): Promise<void> {
    const { secret, maxAttempts } = this.opts;
    const url = this.urlOf(delivery);
    if (this.closed || generation !== this.generation || delivery.state !== "pending" || !url || !secret) return;
    if (this.drop) {
      delivery.state = "dropped";
      this.persist();
      return;
    }
    const { flavour } = this;
    const rawBody = flavour.body(delivery, { url, maxAttempts });
    const attempt = flavour.newAttempt({ at: new Date().toISOString(), status: null, error: null });
    const controller = new AbortController();
    const timeout = setTimeout(() => controller.abort(), this.opts.timeoutMs);
    this.inflight.add(controller);
    try {
      const res = await fetch(url, {
        method: "POST",
        headers: {
          "content-type": flavour.contentType,
          ...(flavour.signingHeaders ? flavour.signingHeaders(delivery, rawBody, secret) : { [flavour.signatureHeader]: flavour.sign ? flavour.sign(rawBody, secret, url) : signatureHeader(rawBody, secret) }),
          "user-agent": flavour.userAgent,
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
      const about = flavour.describe(delivery);
      console.warn(`${flavour.label}: gave up on ${about.type} ${about.eventId} after ${maxAttempts} attempts`);
    } else {
      this.schedule(delivery, this.opts.retryBaseMs * 2 ** (delivery.attempts.length - 1));
    }
    this.persist();
  }
}
