// The fake's state in one JSON file, reloaded at start so `npm start` survives restarts: every message
// (sent by the app, or a tester's reply) and the log of callbacks and inbound webhooks.
import { isObject, JsonStateStore, randomAlphanumeric } from "../shared/json-store";
import type { Delivery, StoredMessage } from "./types";

/** Message sids are "SM" + 32 hex digits. */
export const newSid = (prefix: string): string => `${prefix}${Buffer.from(randomAlphanumeric(16)).toString("hex").slice(0, 32)}`;

/** The API's dates are RFC 2822 in UTC ("Sat, 05 Dec 2026 06:01:02 +0000"). */
export const rfc2822 = (ms = Date.now()): string => new Date(ms).toUTCString().replace("GMT", "+0000");

export class SmsStore extends JsonStateStore<Delivery> {
  readonly messages = new Map<string, StoredMessage>();
  protected readonly label = "sms fake";

  protected restore(state: Record<string, unknown>): void {
    const rows = Array.isArray(state.messages) ? (state.messages as StoredMessage[]).filter((m) => isObject(m) && typeof m.sid === "string") : [];
    for (const m of rows) this.messages.set(m.sid, m);
    this.deliveries = Array.isArray(state.deliveries) ? (state.deliveries as Delivery[]).filter((d) => isObject(d) && isObject(d.params) && Array.isArray(d.attempts)) : [];
  }

  protected snapshot() {
    return { messages: [...this.messages.values()], deliveries: this.deliveries };
  }

  /** Newest first. */
  list(): StoredMessage[] {
    return [...this.messages.values()].sort((a, b) => b.created_ms - a.created_ms);
  }

  async wipe(): Promise<void> {
    this.messages.clear();
    this.deliveries = [];
    await this.save();
  }
}
