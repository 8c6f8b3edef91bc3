import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import type { MachinesTable, Nullable, ShopEventsTable } from "@/db/tables";
import { type InboxItem, UNREAD_WINDOW, readPayload } from "@/lib/inbox";
import { describeMachine } from "@/lib/machine";
import type { StaffRole } from "@/lib/permissions";
import type { Delivery, InboxKind } from "@/lib/shop-events";

// The desk inbox: a shop's shop_events with inbox = 1, read per person (inbox_reads), and each
// person's e-mail choices (inbox_preferences) and digest progress (inbox_digests). Every list is
// one query whatever its length; the unread count reads a fixed window of the index.

type Reader = { shopId: number; userId: number };
export type InboxFilter = { kinds?: readonly InboxKind[]; jobNumber?: number };

type ItemRow = Pick<ShopEventsTable, "id" | "kind" | "payload" | "created_at"> & {
  read_event: number | null;
  job_number: number | null;
  actor_name: string | null;
} & Pick<Nullable<MachinesTable>, "year" | "make" | "model">;

/** Inbox items of the shop with this reader's read flag, the job's number and machine, and who caused it. */
function itemQuery(k: Knex, { shopId, userId }: Reader) {
  return k("shop_events as e")
    .leftJoin("inbox_reads as r", (j) => j.on("r.event_id", "=", "e.id").andOnVal("r.user_id", "=", userId))
    .leftJoin("jobs as j", (j) => j.on("j.id", "=", "e.job_id").andOn("j.shop_id", "=", "e.shop_id"))
    .leftJoin("machines as m", (j) => j.on("m.id", "=", "j.machine_id").andOn("m.shop_id", "=", "j.shop_id"))
    .leftJoin("users as u", "u.id", "e.actor_user_id")
    .where("e.shop_id", shopId)
    .andWhere("e.inbox", true)
    .select("e.id", "e.kind", "e.payload", "e.created_at", "r.event_id as read_event", "j.number as job_number", "m.year", "m.make", "m.model", "u.name as actor_name");
}

/** Kinds and job: the filters the list, "mark all read" and the digest share. */
function applyFilter(k: Knex, q: Knex.QueryBuilder, shopId: number, f: InboxFilter) {
  if (f.kinds?.length) q.whereIn("e.kind", f.kinds);
  // One job's items through the (job_id, id) index; a number that isn't the shop's matches nothing.
  if (f.jobNumber != null) q.where("e.job_id", k("jobs").where({ shop_id: shopId, number: f.jobNumber }).select("id"));
}

function toItem(r: ItemRow): InboxItem {
  const kind = r.kind as InboxKind;
  const payload = typeof r.payload === "string" ? (JSON.parse(r.payload) as Record<string, unknown>) : ((r.payload ?? {}) as Record<string, unknown>);
  return {
    id: Number(r.id),
    kind,
    at: new Date(r.created_at).toISOString(),
    read: r.read_event != null,
    ...readPayload(kind, payload),
    job: r.job_number == null ? null : { number: Number(r.job_number), machine: r.make ? describeMachine({ year: r.year, make: r.make, model: r.model ?? "" }) : "" },
    actorName: r.actor_name ?? null,
  };
}

/** One page, newest first: items older than `before` (keyset), `limit` of them, and the cursor of the next page. */
export async function listInbox(
  p: Reader & InboxFilter & { before?: number; unreadOnly?: boolean; limit: number },
  k: Knex = db(),
): Promise<{ items: InboxItem[]; next: number | null }> {
  const q = itemQuery(k, p);
  applyFilter(k, q, p.shopId, p);
  if (p.before != null) q.where("e.id", "<", p.before);
  if (p.unreadOnly) q.whereNull("r.event_id");
  const rows: ItemRow[] = await q.orderBy("e.id", "desc").limit(p.limit + 1);
  const items = rows.slice(0, p.limit).map(toItem);
  return { items, next: rows.length > p.limit ? items[items.length - 1]!.id : null };
}

/** Unread items among the shop's newest UNREAD_WINDOW: a bounded index range, whatever the history. */
export async function countUnread({ shopId, userId }: Reader, k: Knex = db()): Promise<number> {
  const recent = k("shop_events").where({ shop_id: shopId, inbox: true }).orderBy("id", "desc").limit(UNREAD_WINDOW).select("id");
  // A key lookup per item of the window (eq_ref on the primary key), not a scan of all this person's reads.
  const row = await k
    .from(recent.as("e"))
    .leftJoin("inbox_reads as r", (j) => j.on("r.event_id", "=", "e.id").andOnVal("r.user_id", "=", userId))
    .whereNull("r.event_id")
    .count({ n: "*" })
    .first();
  return Number(row?.n ?? 0);
}

/** Marks one item read for this person; false if the shop has no such item. Doing it twice is the same as once. */
export async function markRead({ shopId, userId, eventId }: Reader & { eventId: number }, k: Knex = db()): Promise<boolean> {
  const found = await k("shop_events").where({ id: eventId, shop_id: shopId, inbox: true }).first("id");
  if (!found) return false;
  await k("inbox_reads").insert({ user_id: userId, event_id: eventId }).onConflict(["user_id", "event_id"]).ignore();
  return true;
}

/**
 * Marks read every item up to `through` (the newest the reader had in front of them, so one
 * that arrives meanwhile stays unread) that matches the filter. Returns how many were unread.
 */
export async function markAllRead(p: Reader & InboxFilter & { through: number }, k: Knex = db()): Promise<number> {
  const q = k("shop_events as e").where("e.shop_id", p.shopId).andWhere("e.inbox", true).andWhere("e.id", "<=", p.through).select(k.raw("?", [p.userId]), "e.id");
  applyFilter(k, q, p.shopId, p);
  const { sql, bindings } = q.toSQL();
  const [result] = (await k.raw(`INSERT IGNORE INTO inbox_reads (user_id, event_id) ${sql}`, bindings as readonly Knex.Value[])) as [{ affectedRows: number }];
  return Number(result.affectedRows ?? 0);
}

/** The one who caused an item has seen it: it is read for them from the start. */
export async function markReadFor(k: Knex, { userId, eventId }: { userId: number; eventId: number }): Promise<void> {
  await k("inbox_reads").insert({ user_id: userId, event_id: eventId }).onConflict(["user_id", "event_id"]).ignore();
}

export type InboxRecipient = { userId: number; email: string; name: string; role: StaffRole; delivery: Delivery | null };

/** The shop's active staff, each with their chosen delivery for `kind` (null: not chosen). */
export async function inboxRecipients(k: Knex, { shopId, kind }: { shopId: number; kind: InboxKind }): Promise<InboxRecipient[]> {
  const rows: { user_id: number; email: string; name: string; role: StaffRole; delivery: Delivery | null }[] = await k("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .leftJoin("inbox_preferences as p", (j) => j.on("p.user_id", "=", "m.user_id").andOn("p.shop_id", "=", "m.shop_id").andOnVal("p.kind", "=", kind))
    .where("m.shop_id", shopId)
    .whereNull("m.deactivated_at")
    .orderBy("m.user_id")
    .select("m.user_id", "u.email", "u.name", "m.role", "p.delivery");
  return rows.map((r) => ({ userId: Number(r.user_id), email: String(r.email), name: String(r.name), role: r.role, delivery: r.delivery ?? null }));
}

/** The job an item is about, as a mail line names it. */
export async function jobForInbox(k: Knex, { shopId, jobId }: { shopId: number; jobId: number }): Promise<{ number: number; machine: string } | null> {
  const r = await k("jobs as j").join("machines as m", "m.id", "j.machine_id").where({ "j.id": jobId, "j.shop_id": shopId }).first("j.number", "m.year", "m.make", "m.model");
  return r ? { number: Number(r.number), machine: describeMachine({ year: r.year, make: r.make, model: r.model }) } : null;
}

export async function shopForInbox(k: Knex, shopId: number): Promise<{ id: number; name: string; slug: string; timezone: string }> {
  const r = await k("shops").where({ id: shopId }).first("id", "name", "slug", "timezone");
  if (!r) throw new Error(`shop ${shopId} not found`);
  return { id: Number(r.id), name: String(r.name), slug: String(r.slug), timezone: String(r.timezone) };
}

/** What this person chose, kind by kind (kinds never chosen are left out: the default applies). */
export async function listInboxPreferences({ shopId, userId }: Reader, k: Knex = db()): Promise<Partial<Record<InboxKind, Delivery>>> {
  const rows = await k("inbox_preferences").where({ shop_id: shopId, user_id: userId }).select("kind", "delivery");
  return Object.fromEntries(rows.map((r) => [r.kind, r.delivery]));
}

/** Saves every kind's choice at once (all of the form, or none of it). */
export async function saveInboxPreferences({ shopId, userId, choices }: Reader & { choices: Record<InboxKind, Delivery> }, k: Knex = db()): Promise<void> {
  const rows = Object.entries(choices).map(([kind, delivery]) => ({ user_id: userId, shop_id: shopId, kind, delivery }));
  if (rows.length) await k("inbox_preferences").insert(rows).onConflict(["user_id", "shop_id", "kind"]).merge(["delivery"]);
}

// ---------------------------------------------------------------- the daily digest

/** Shops with anyone on their staff, for the digest sweep. */
export async function shopsForInboxDigest(k: Knex = db()): Promise<{ id: number; name: string; slug: string; timezone: string }[]> {
  const rows = await k("shops as s")
    .whereExists(k("memberships as m").where("m.shop_id", k.ref("s.id")).whereNull("m.deactivated_at").select(k.raw("1")))
    .orderBy("s.id")
    .select("s.id", "s.name", "s.slug", "s.timezone");
  return rows.map((r) => ({ id: Number(r.id), name: String(r.name), slug: String(r.slug), timezone: String(r.timezone) }));
}

/** Active staff of the shop whose digest for `day` (YYYY-MM-DD, the shop's calendar) has not been done. */
export async function dueInboxDigests({ shopId, day }: { shopId: number; day: string }, k: Knex = db()): Promise<Omit<InboxRecipient, "delivery">[]> {
  const rows: { user_id: number; email: string; name: string; role: StaffRole }[] = await k("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .leftJoin("inbox_digests as d", (j) => j.on("d.user_id", "=", "m.user_id").andOn("d.shop_id", "=", "m.shop_id"))
    .where("m.shop_id", shopId)
    .whereNull("m.deactivated_at")
    .where((w) => w.whereNull("d.last_sent_on").orWhere("d.last_sent_on", "<", day))
    .select("m.user_id", "u.email", "u.name", "m.role");
  return rows.map((r) => ({ userId: Number(r.user_id), email: String(r.email), name: String(r.name), role: r.role }));
}

/** This person's digest row, locked (made on first use). `fresh`: there was none, so nothing was ever sent. */
export async function lockInboxDigest(tx: Knex.Transaction, { shopId, userId }: Reader): Promise<{ through: number; lastSentOn: string | null; fresh: boolean }> {
  let row = await tx("inbox_digests").where({ shop_id: shopId, user_id: userId }).forUpdate().first("through_event_id", "last_sent_on");
  const fresh = !row;
  if (!row) {
    await tx("inbox_digests").insert({ shop_id: shopId, user_id: userId, through_event_id: 0 }).onConflict(["user_id", "shop_id"]).ignore();
    row = (await tx("inbox_digests").where({ shop_id: shopId, user_id: userId }).forUpdate().first("through_event_id", "last_sent_on"))!;
  }
  return { through: Number(row.through_event_id), lastSentOn: row.last_sent_on ?? null, fresh: fresh && row.last_sent_on == null };
}

export async function latestInboxEventId(k: Knex, shopId: number): Promise<number> {
  const row = await k("shop_events").where({ shop_id: shopId, inbox: true }).max({ id: "id" }).first();
  return Number(row?.id ?? 0);
}

/**
 * What goes in this person's digest: unread items of the given kinds after `after` up to
 * `through`, not caused by themselves, not older than `since`, oldest first.
 */
export async function inboxDigestItems(
  k: Knex,
  p: Reader & { after: number; through: number; kinds: readonly InboxKind[]; since: Date | null; limit: number },
): Promise<InboxItem[]> {
  if (!p.kinds.length) return [];
  const q = itemQuery(k, p).where("e.id", ">", p.after).andWhere("e.id", "<=", p.through).whereIn("e.kind", p.kinds).whereNull("r.event_id");
  q.where((w) => w.whereNull("e.actor_user_id").orWhere("e.actor_user_id", "<>", p.userId));
  if (p.since) q.where("e.created_at", ">=", p.since);
  const rows: ItemRow[] = await q.orderBy("e.id", "asc").limit(p.limit);
  return rows.map(toItem);
}

export async function saveInboxDigest(tx: Knex.Transaction, p: Reader & { through: number; sentOn: string }): Promise<void> {
  await tx("inbox_digests").where({ shop_id: p.shopId, user_id: p.userId }).update({ through_event_id: p.through, last_sent_on: p.sentOn });
}
