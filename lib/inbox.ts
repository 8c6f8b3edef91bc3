// The desk inbox as its readers get it. Pure: no I/O.
// An inbox item is a shop_events row with inbox = 1 (lib/shop-events.ts). Its payload carries a
// one-line `summary` written when it happened, without money; an amount rides beside it as
// `amountMinor` + `currency`, so the money rule (lib/money-fields.ts) strips it for staff who
// may not see money (technicians), in the list and in their e-mail alike.

import { formatMoney } from "@/lib/money";
import { DEFAULT_DELIVERY, type Delivery, INBOX_KINDS, INBOX_KIND_LABEL, type InboxKind } from "@/lib/shop-events";

export type InboxItem = {
  id: number;
  kind: InboxKind;
  /** ISO time it happened. */
  at: string;
  /** This reader has marked it read (or caused it). */
  read: boolean;
  summary: string;
  /** A second line when there is one (the error of an undelivered mail…). */
  detail: string | null;
  /** Only for readers who may see money: the amount, and as the shop writes it ("$46.01"). */
  amountMinor?: number;
  currency?: string;
  amount?: string;
  job: { number: number; machine: string } | null;
  /** Who caused it (a staff member, or the machine's owner signed in), or null for a service or the mail worker. */
  actorName: string | null;
};

export type InboxPage = {
  items: InboxItem[];
  /** Pass as `before` for the next (older) page; null on the last page. */
  next: number | null;
  unread: number;
};

/** Items per page of the inbox list. */
export const INBOX_PAGE_SIZE = 25;

/**
 * The unread count looks at the shop's newest this-many items only, so the header badge costs
 * the same whatever the shop's history (an index range and as many key lookups). Anything older
 * is history, not news.
 */
export const UNREAD_WINDOW = 500;

/** The badge text: "99+" past 99. */
export function unreadBadge(n: number): string {
  return n > 99 ? "99+" : String(n);
}

/** What an inbox payload holds (written by lib/server/inbox.ts recordInboxEvent). */
export type InboxPayload = { summary?: unknown; detail?: unknown; amountMinor?: unknown; currency?: unknown };

/** The reader's view of a payload: the summary (the kind's label if there is none), the detail, the amount if any. */
export function readPayload(kind: InboxKind, payload: InboxPayload): Pick<InboxItem, "summary" | "detail" | "amountMinor" | "currency" | "amount"> {
  const summary = typeof payload.summary === "string" && payload.summary.trim() ? payload.summary : INBOX_KIND_LABEL[kind];
  const detail = typeof payload.detail === "string" && payload.detail.trim() ? payload.detail : null;
  const money =
    typeof payload.amountMinor === "number" && Number.isSafeInteger(payload.amountMinor) && typeof payload.currency === "string" && /^[A-Z]{3}$/.test(payload.currency)
      ? { amountMinor: payload.amountMinor, currency: payload.currency, amount: formatted(payload.amountMinor, payload.currency) }
      : {};
  return { summary, detail, ...money };
}

function formatted(minor: number, currency: string): string {
  try {
    return formatMoney(minor, currency);
  } catch {
    return `${minor} ${currency} (minor units)`; // a code we don't know: shown as stored rather than guessed
  }
}

/** A person's delivery for every kind: what they chose, else the default. */
export function effectiveDeliveries(chosen: Partial<Record<string, Delivery>>): Record<InboxKind, Delivery> {
  return Object.fromEntries(INBOX_KINDS.map((k) => [k, chosen[k] ?? DEFAULT_DELIVERY[k]])) as Record<InboxKind, Delivery>;
}

export const DELIVERY_LABEL: Record<Delivery, string> = {
  now: "E-mail at once",
  digest: "In the morning e-mail",
  off: "No e-mail",
};

/** One line of text, at most `max` characters: payloads and subjects never carry line breaks. */
export function oneLine(text: string, max: number): string {
  const flat = text.replace(/\s+/g, " ").trim();
  return flat.length > max ? `${flat.slice(0, max - 1)}…` : flat;
}
