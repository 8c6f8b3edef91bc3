// The fake's state in one JSON file (rewritten atomically), reloaded at start so `npm start` survives
// restarts: checkout sessions, payment intents, charges, refunds, webhook deliveries and the answers
// kept for idempotency keys.
import { createHash, randomBytes } from "node:crypto";
import { mkdir, readFile, rename, writeFile } from "node:fs/promises";
import path from "node:path";
import type { Charge, Delivery, IdempotentAnswer, PaymentIntent, Refund, StoredSession } from "./types";

const STATE_FILE = "state.json";
/** Keeps test aids (the delivery log, idempotency answers) from growing without bound. */
const MAX_DELIVERIES = 1000;
const IDEMPOTENCY_TTL_MS = 24 * 3600 * 1000;
const ALPHANUMERIC = "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789";

export function newId(prefix: string, length = 24): string {
  let out = "";
  while (out.length < length) {
    for (const byte of randomBytes(length)) {
      // 248 = 4 × 62: rejecting the rest keeps every character equally likely.
      if (byte < 248 && out.length < length) out += ALPHANUMERIC[byte % 62];
    }
  }
  return `${prefix}${out}`;
}

export const nowSeconds = () => Math.floor(Date.now() / 1000);
export const digest = (text: string) => createHash("sha256").update(text).digest("hex");

type StateFile = {
  version: 1;
  sessions: StoredSession[];
  intents: PaymentIntent[];
  charges: Charge[];
  refunds: Refund[];
  deliveries: Delivery[];
  idempotency: IdempotentAnswer[];
};

const isObject = (v: unknown): v is Record<string, unknown> => typeof v === "object" && v !== null && !Array.isArray(v);

export class PaymentsStore {
  readonly sessions = new Map<string, StoredSession>();
  readonly intents = new Map<string, PaymentIntent>();
  readonly charges = new Map<string, Charge>();
  readonly refunds = new Map<string, Refund>();
  readonly idempotency = new Map<string, IdempotentAnswer>();
  deliveries: Delivery[] = [];
  private chain: Promise<void> = Promise.resolve();
  private queued: Promise<void> | null = null;

  private constructor(readonly dir: string) {}

  static async open(dir: string): Promise<PaymentsStore> {
    const store = new PaymentsStore(dir);
    await mkdir(dir, { recursive: true });
    await store.load();
    return store;
  }

  private async load(): Promise<void> {
    const file = path.join(this.dir, STATE_FILE);
    let parsed: unknown;
    try {
      parsed = JSON.parse(await readFile(file, "utf8"));
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code === "ENOENT") return;
      // Keep the bad file for a human to look at, and start empty rather than refuse to run.
      const aside = `${file}.unreadable-${Date.now()}`;
      await rename(file, aside).catch(() => undefined);
      console.warn(`payments fake: ${STATE_FILE} was unreadable; moved it to ${aside} and started empty`);
      return;
    }
    if (!isObject(parsed) || parsed.version !== 1) {
      console.warn(`payments fake: ${STATE_FILE} is not a payments fake state file; starting empty`);
      return;
    }
    const rows = <T>(value: unknown) => (Array.isArray(value) ? value.filter((r) => isObject(r) && typeof r.id === "string") : []) as T[];
    for (const s of rows<StoredSession>(parsed.sessions)) this.sessions.set(s.id, s);
    for (const p of rows<PaymentIntent>(parsed.intents)) this.intents.set(p.id, p);
    for (const c of rows<Charge>(parsed.charges)) this.charges.set(c.id, c);
    for (const r of rows<Refund>(parsed.refunds)) this.refunds.set(r.id, r);
    const answers = Array.isArray(parsed.idempotency) ? (parsed.idempotency as IdempotentAnswer[]).filter((a) => isObject(a) && typeof a.key === "string") : [];
    for (const a of answers) this.idempotency.set(a.key, a);
    this.deliveries = Array.isArray(parsed.deliveries) ? (parsed.deliveries as Delivery[]).filter((d) => isObject(d) && isObject(d.event) && Array.isArray(d.attempts)) : [];
  }

  /** The charge of a payment intent, with its refunds, newest last. */
  chargeOf(intent: PaymentIntent): Charge | undefined {
    return intent.latest_charge ? this.charges.get(intent.latest_charge) : undefined;
  }

  refundsOf(chargeId: string): Refund[] {
    return [...this.refunds.values()].filter((r) => r.charge === chargeId);
  }

  addDelivery(delivery: Delivery): void {
    this.deliveries.push(delivery);
    let excess = this.deliveries.length - MAX_DELIVERIES;
    // Settled deliveries go first; pending ones still have retries scheduled.
    if (excess > 0) this.deliveries = this.deliveries.filter((d) => excess <= 0 || d.state === "pending" || excess-- <= 0);
  }

  remember(answer: IdempotentAnswer): void {
    const cutoff = Date.now() - IDEMPOTENCY_TTL_MS;
    for (const [key, a] of this.idempotency) if (a.at < cutoff) this.idempotency.delete(key);
    this.idempotency.set(answer.key, answer);
  }

  /** Coalesces bursts: a save requested while another is queued shares that write. */
  save(): Promise<void> {
    if (this.queued) return this.queued;
    const next = this.chain.then(() => {
      this.queued = null;
      return this.writeNow();
    });
    this.queued = next;
    this.chain = next.catch(() => undefined);
    return next;
  }

  private async writeNow(): Promise<void> {
    const state: StateFile = {
      version: 1,
      sessions: [...this.sessions.values()],
      intents: [...this.intents.values()],
      charges: [...this.charges.values()],
      refunds: [...this.refunds.values()],
      deliveries: this.deliveries,
      idempotency: [...this.idempotency.values()],
    };
    const file = path.join(this.dir, STATE_FILE);
    // Write-then-rename so a crash never leaves a truncated state file.
    await writeFile(`${file}.tmp`, `${JSON.stringify(state, null, 1)}\n`, "utf8");
    await rename(`${file}.tmp`, file);
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
