import "server-only";
import { inboxRecipients, jobForInbox, markReadFor, shopForInbox } from "@/db/queries/inbox";
import { enqueueMail } from "@/db/queries/outbox";
import { recordEvent } from "@/db/queries/shop-events";
import type { Tx } from "@/db/transaction";
import { type InboxItem, oneLine, readPayload } from "@/lib/inbox";
import { roleAllows, type StaffRole } from "@/lib/permissions";
import { formatJobNumber } from "@/lib/schemas/jobs";
import { DEFAULT_DELIVERY, INBOX_KIND_LABEL, type InboxKind } from "@/lib/shop-events";
import { appUrl } from "@/lib/server/config";
import { type InboxMailItem, renderInboxNowMail } from "@/lib/server/emails/inbox-email";

// The one way something lands in the desk inbox: recordInboxEvent, inside the transaction of the
// change it reports. It records the shop event (so the list and the live stream see it), marks
// it read for whoever caused it, and queues an e-mail through the outbox to each active staff
// member who chose "e-mail at once" for its kind. The morning digest picks up the rest
// (lib/server/inbox-digest.ts). Technicians' mail never carries amounts.

/** Outbox kinds of the inbox's own mail: an undeliverable one of these is not reported again (no loop). */
export const INBOX_MAIL_KINDS = ["inbox", "inbox-digest"] as const;

export type InboxEvent = {
  shopId: number;
  jobId: number | null;
  kind: InboxKind;
  /** Who caused it, when a person did (staff, or the machine's owner); null for a service or the worker. */
  actorUserId: number | null;
  /** The inbox line, without money: "Ada Marsh agreed to the story being shown". */
  summary: string;
  detail?: string | null;
  /** An amount, shown only to staff who may see money. */
  amountMinor?: number;
  currency?: string;
  /** Anything else worth keeping with the item (ids, codes). No money here. */
  extra?: Record<string, unknown>;
  /** Whether the job's owner hears of it (their page refreshes). */
  ownerVisible?: boolean;
};

export async function recordInboxEvent(tx: Tx, e: InboxEvent): Promise<number> {
  const payload: Record<string, unknown> = { ...e.extra, summary: oneLine(e.summary, 300) };
  if (e.detail) payload.detail = oneLine(e.detail, 500);
  if (e.amountMinor != null && e.currency) Object.assign(payload, { amountMinor: e.amountMinor, currency: e.currency.toUpperCase() });
  const id = await recordEvent(tx, { shopId: e.shopId, jobId: e.jobId, kind: e.kind, actorUserId: e.actorUserId, payload, ownerVisible: e.ownerVisible });

  const staff = await inboxRecipients(tx, { shopId: e.shopId, kind: e.kind });
  const now = [];
  for (const person of staff) {
    // Nobody is told, or mailed, what they did themselves.
    if (person.userId === e.actorUserId) await markReadFor(tx, { userId: person.userId, eventId: id });
    else if ((person.delivery ?? DEFAULT_DELIVERY[e.kind]) === "now") now.push(person);
  }
  if (!now.length) return id;

  const shop = await shopForInbox(tx, e.shopId);
  const job = e.jobId == null ? null : await jobForInbox(tx, { shopId: e.shopId, jobId: e.jobId });
  const item: InboxItem = { id, kind: e.kind, at: new Date().toISOString(), read: false, ...readPayload(e.kind, payload), job, actorName: null };
  // At most two renderings: with the amount, and without it.
  const rendered = new Map<boolean, Promise<{ subject: string; html: string; text: string }>>();
  for (const person of now) {
    const money = mayMailMoney(person.role);
    if (!rendered.has(money)) rendered.set(money, renderInboxNowMail({ shopName: shop.name, item: mailItem(item, { ...shop, money }), ...inboxLinks(shop.slug) }));
    const mail = await rendered.get(money)!;
    await enqueueMail(tx, { shopId: e.shopId, kind: "inbox", to: person.email, ...mail, replyTo: null, dedupeKey: `inbox:${id}:${person.userId}` });
  }
  return id;
}

/** Amounts go only to roles the permission table lets see money. */
export function mayMailMoney(role: StaffRole): boolean {
  return roleAllows(role, "money:view");
}

export function inboxLinks(slug: string) {
  const base = `${appUrl()}/shop/${slug}/inbox`;
  return { inboxUrl: base, settingsUrl: `${base}/settings` };
}

/** The shop's time zone, or UTC if it isn't one Intl knows. */
export function safeTimeZone(timeZone: string): string {
  try {
    new Intl.DateTimeFormat("en-US", { timeZone });
    return timeZone;
  } catch {
    return "UTC";
  }
}

/** An item as a mail shows it: the amount only with `money`, times in the shop's zone, links to the job. */
export function mailItem(item: InboxItem, shop: { slug: string; timezone: string; money: boolean }): InboxMailItem {
  const when = new Intl.DateTimeFormat("en-US", { timeZone: safeTimeZone(shop.timezone), month: "short", day: "numeric", hour: "numeric", minute: "2-digit" });
  return {
    label: INBOX_KIND_LABEL[item.kind],
    summary: item.summary,
    detail: item.detail,
    money: shop.money ? (item.amount ?? null) : null,
    job: item.job ? [formatJobNumber(item.job.number), item.job.machine].filter(Boolean).join(" · ") : null,
    when: when.format(new Date(item.at)),
    url: item.job ? `${appUrl()}/shop/${shop.slug}/jobs/${item.job.number}` : inboxLinks(shop.slug).inboxUrl,
  };
}

/**
 * A notice by text to a machine's owner didn't reach them (the service or the carrier refused it,
 * it couldn't be delivered, or the worker gave up): the desk hears whom it was for and why, so the
 * owner can be reached another way. Keyword answers (STOP, HELP…) are left out.
 */
export async function reportUndeliveredText(tx: Tx, text: { shopId: number; jobId: number | null; purpose: string; kind: string; to: string; error: string }): Promise<number | null> {
  if (text.purpose !== "notice") return null;
  return recordInboxEvent(tx, {
    shopId: text.shopId,
    jobId: text.jobId,
    kind: "text_undeliverable",
    actorUserId: null,
    summary: `Text to ${text.to} (${text.kind.replace(/_/g, " ")}) not delivered`,
    detail: text.error,
    extra: { to: text.to, textKind: text.kind },
  });
}

/**
 * The outbox gave up on a mail (its last try failed, or it can't be sent any more): the desk
 * hears who it was for and what it was. Mail of no shop (sign-in links) and the inbox's own
 * mail are left out, so a failing mail service can't feed itself.
 */
export async function reportUndeliverable(tx: Tx, mail: { shopId: number | null; jobId?: number | null; kind: string; to: string; subject: string; error: string }): Promise<number | null> {
  if (mail.shopId == null || (INBOX_MAIL_KINDS as readonly string[]).includes(mail.kind)) return null;
  return recordInboxEvent(tx, {
    shopId: mail.shopId,
    jobId: mail.jobId ?? null,
    kind: "mail_undeliverable",
    actorUserId: null,
    summary: `To ${mail.to}: ${mail.subject}`,
    detail: mail.error,
    extra: { to: mail.to, subject: oneLine(mail.subject, 300), mailKind: mail.kind },
  });
}
