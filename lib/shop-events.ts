// What happened in a shop, as the desk inbox and the live views read it. Pure: no I/O.
// Every row of `shop_events` has one of these kinds. Inbox kinds are items someone at the desk
// acts on; the rest only tell open pages (board, job page, owner's page) to refresh.

export const INBOX_KINDS = [
  "owner_answered",
  "payment_received",
  "payment_failed",
  "payment_refunded",
  "consent_given",
  "consent_refused",
  "consent_withdrawn",
  "follower_added",
  "mail_undeliverable",
  "text_undeliverable",
  "parts_received",
  "core_credit_owed",
  "owner_question",
  "booking_request",
] as const;

export const LIVE_KINDS = ["entry_added", "entry_changed", "status_moved", "job_changed"] as const;

export type InboxKind = (typeof INBOX_KINDS)[number];
export type LiveKind = (typeof LIVE_KINDS)[number];
export type ShopEventKind = InboxKind | LiveKind;

export function isInboxKind(kind: string): kind is InboxKind {
  return (INBOX_KINDS as readonly string[]).includes(kind);
}

export const INBOX_KIND_LABEL: Record<InboxKind, string> = {
  owner_answered: "Owner answered",
  payment_received: "Payment received",
  payment_failed: "Payment failed",
  payment_refunded: "Payment refunded",
  consent_given: "Portfolio consent given",
  consent_refused: "Portfolio consent refused",
  consent_withdrawn: "Portfolio consent withdrawn",
  follower_added: "Follower added",
  mail_undeliverable: "Mail not delivered",
  text_undeliverable: "Text not delivered",
  parts_received: "Parts received",
  core_credit_owed: "Core credit owed",
  owner_question: "Question from an owner",
  booking_request: "Booking request",
};

/** How a staff member hears of an inbox kind by e-mail. */
export const DELIVERIES = ["now", "digest", "off"] as const;
export type Delivery = (typeof DELIVERIES)[number];

/** Until someone chooses: what can't wait comes at once, the rest in the day's digest. */
export const DEFAULT_DELIVERY: Record<InboxKind, Delivery> = {
  owner_answered: "now",
  payment_received: "digest",
  payment_failed: "now",
  payment_refunded: "digest",
  consent_given: "digest",
  consent_refused: "digest",
  consent_withdrawn: "now",
  follower_added: "off",
  mail_undeliverable: "now",
  text_undeliverable: "now",
  parts_received: "digest",
  // The owner paid (or was billed) a core charge that has since come back: money the desk owes.
  core_credit_owed: "now",
  owner_question: "now",
  // Someone new asking for a slot: the desk answers while they still want it.
  booking_request: "now",
};

/** One event as the stream sends it and the inbox lists it (JSON-safe). */
export type ShopEvent = {
  id: number;
  shopId: number;
  jobId: number | null;
  kind: ShopEventKind;
  inbox: boolean;
  ownerVisible: boolean;
  payload: Record<string, unknown>;
  actorUserId: number | null;
  at: string;
};
