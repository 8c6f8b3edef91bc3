// The fake's state in one JSON file (rewritten atomically), reloaded at start so `npm start` survives
// restarts: checkout sessions, payment intents, charges, refunds, webhook deliveries and the answers
// kept for idempotency keys.
import { createHash } from "node:crypto";
import { isObject, JsonStateStore, randomAlphanumeric } from "../shared/json-store";
import type { Charge, Delivery, IdempotentAnswer, PaymentIntent, Refund, StoredSession } from "./types";

/** Keeps the idempotency answers (a test aid) from growing without bound. */
const IDEMPOTENCY_TTL_MS = 24 * 3600 * 1000;

export const newId = (prefix: string, length = 24): string => `${prefix}${randomAlphanumeric(length)}`;
export const nowSeconds = () => Math.floor(Date.now() / 1000);
export const digest = (text: string) => createHash("sha256").update(text).digest("hex");

export class PaymentsStore extends JsonStateStore<Delivery> {
  readonly sessions = new Map<string, StoredSession>();
  readonly intents = new Map<string, PaymentIntent>();
  readonly charges = new Map<string, Charge>();
  readonly refunds = new Map<string, Refund>();
  readonly idempotency = new Map<string, IdempotentAnswer>();
  protected readonly label = "payments fake";

  protected restore(state: Record<string, unknown>): void {
    const rows = <T>(value: unknown) => (Array.isArray(value) ? value.filter((r) => isObject(r) && typeof r.id === "string") : []) as T[];
    for (const s of rows<StoredSession>(state.sessions)) this.sessions.set(s.id, s);
    for (const p of rows<PaymentIntent>(state.intents)) this.intents.set(p.id, p);
    for (const c of rows<Charge>(state.charges)) this.charges.set(c.id, c);
    for (const r of rows<Refund>(state.refunds)) this.refunds.set(r.id, r);
    const answers = Array.isArray(state.idempotency) ? (state.idempotency as IdempotentAnswer[]).filter((a) => isObject(a) && typeof a.key === "string") : [];
    for (const a of answers) this.idempotency.set(a.key, a);
    this.deliveries = Array.isArray(state.deliveries) ? (state.deliveries as Delivery[]).filter((d) => isObject(d) && isObject(d.event) && Array.isArray(d.attempts)) : [];
  }

  protected snapshot() {
    return {
      sessions: [...this.sessions.values()],
      intents: [...this.intents.values()],
      charges: [...this.charges.values()],
      refunds: [...this.refunds.values()],
      deliveries: this.deliveries,
      idempotency: [...this.idempotency.values()],
    };
  }

  /** The charge of a payment intent, with its refunds, newest last. */
  chargeOf(intent: PaymentIntent): Charge | undefined {
    return intent.latest_charge ? this.charges.get(intent.latest_charge) : undefined;
  }

  refundsOf(chargeId: string): Refund[] {
    return [...this.refunds.values()].filter((r) => r.charge === chargeId);
  }

  remember(answer: IdempotentAnswer): void {
    const cutoff = Date.now() - IDEMPOTENCY_TTL_MS;
    for (const [key, a] of this.idempotency) if (a.at < cutoff) this.idempotency.delete(key);
    this.idempotency.set(answer.key, answer);
  }

  async wipe(): Promise<void> {
    this.sessions.clear();
    this.intents.clear();
    this.charges.clear();
    this.refunds.clear();
    this.idempotency.clear();
    this.deliveries = [];
    await this.save();
  }
}
