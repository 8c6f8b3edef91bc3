import "server-only";
import type { Knex } from "knex";
import type { Frequency, SubscriberRole } from "@/lib/following";
import type { JobStatus } from "@/lib/job-status";
import { MONEY_ENTRY_KINDS } from "@/lib/journal";
import type { MachineKind } from "@/lib/machine";
import { db } from "@/db/client";
import type { CustomersTable, JobsTable, JournalEntriesTable, MachinesTable, ShopsTable } from "@/db/tables";

// What the notification sweep (lib/server/notify-sweep.ts) reads and marks. The "lock…"
// functions take rows with FOR UPDATE SKIP LOCKED inside the sweep's transaction, so two
// workers sweeping at once never turn the same alert or update into mail twice.

export type UpdateColumn = "every_sent_at" | "daily_sent_at";

export type MailJob = {
  id: number;
  shopId: number;
  publicId: string;
  number: number;
  status: JobStatus;
  customerName: string;
  machine: { kind: MachineKind; year: number | null; make: string; model: string };
  shop: { name: string; email: string | null; phone: string | null; timezone: string };
};

export async function mailJob(k: Knex, jobId: number): Promise<MailJob | null> {
  type Row = Pick<JobsTable, "id" | "shop_id" | "public_id" | "number" | "status"> &
    Pick<MachinesTable, "kind" | "year" | "make" | "model"> &
    Pick<ShopsTable, "timezone"> & { customer_name: CustomersTable["name"]; shop_name: string; shop_email: string | null; shop_phone: string | null };
  const r: Row | undefined = await k("jobs as j")
    .join("customers as c", "c.id", "j.customer_id")
    .join("machines as m", "m.id", "j.machine_id")
    .join("shops as s", "s.id", "j.shop_id")
    .where("j.id", jobId)
    .first("j.id", "j.shop_id", "j.public_id", "j.number", "j.status", "c.name as customer_name", "m.kind", "m.year", "m.make", "m.model", "s.name as shop_name", "s.email as shop_email", "s.phone as shop_phone", "s.timezone");
  if (!r) return null;
  return {
    id: Number(r.id),
    shopId: Number(r.shop_id),
    publicId: String(r.public_id),
    number: Number(r.number),
    status: r.status,
    customerName: String(r.customer_name),
    machine: { kind: r.kind, year: r.year == null ? null : Number(r.year), make: String(r.make), model: String(r.model) },
    shop: { name: String(r.shop_name), email: r.shop_email ?? null, phone: r.shop_phone ?? null, timezone: String(r.timezone) },
  };
}

export type Recipient = { id: number; email: string; role: SubscriberRole; frequency: Frequency };

/** Subscribers who haven't stopped e-mail: all of them, those of some frequencies, or one. */
export async function mailRecipients(k: Knex, p: { jobId: number; frequencies?: Frequency[]; subscriberId?: number | null }): Promise<Recipient[]> {
  const q = k("job_subscribers").where("job_id", p.jobId).whereNull("unsubscribed_at").orderBy("id");
  if (p.frequencies) q.whereIn("frequency", p.frequencies);
  if (p.subscriberId != null) q.where("id", p.subscriberId);
  const rows = await q.select("id", "email", "role", "frequency");
  return rows.map((r) => ({ id: Number(r.id), email: String(r.email), role: r.role, frequency: r.frequency }));
}

/** Who invited this follower (their invitation names them); null for the owner or a removed inviter. */
export async function getInviterName({ subscriberId }: { subscriberId: number }, k: Knex = db()): Promise<string | null> {
  const row = await k("job_subscribers as s").join("users as u", "u.id", "s.invited_by_user_id").where("s.id", subscriberId).first("u.name");
  return row ? String(row.name) : null;
}

export async function dueAlertIds({ limit }: { limit: number }): Promise<number[]> {
  const rows = await db()("job_alerts").whereNull("sent_at").orderBy("id").limit(limit).select("id");
  return rows.map((r) => Number(r.id));
}

export type Alert = { id: number; shopId: number; jobId: number; kind: string; subscriberId: number | null; payload: Record<string, unknown> | null };

export async function lockAlert(tx: Knex.Transaction, id: number): Promise<Alert | null> {
  const r = await tx("job_alerts").where({ id }).whereNull("sent_at").forUpdate().skipLocked().first();
  if (!r) return null;
  const payload = typeof r.payload === "string" ? (JSON.parse(r.payload) as Record<string, unknown>) : ((r.payload as Record<string, unknown> | null) ?? null);
  return { id: Number(r.id), shopId: Number(r.shop_id), jobId: Number(r.job_id), kind: String(r.kind), subscriberId: r.subscriber_id == null ? null : Number(r.subscriber_id), payload };
}

export async function markAlertSent(tx: Knex.Transaction, id: number): Promise<void> {
  await tx("job_alerts").where({ id }).update({ sent_at: tx.fn.now(3) });
}

/** Jobs whose first unsent shared entry is older than their shop's digest window at `now`. */
export async function dueProgressJobs({ now, limit }: { now: Date; limit: number }): Promise<number[]> {
  const rows: { job_id: number }[] = await db()("job_update_queue as q")
    .join("shops as s", "s.id", "q.shop_id")
    .whereNull("q.every_sent_at")
    .groupBy("q.job_id")
    .havingRaw("MIN(q.shared_at) <= CAST(? AS DATETIME(3)) - INTERVAL MAX(s.digest_window_minutes) MINUTE", [now])
    .orderByRaw("MIN(q.shared_at)")
    .limit(limit)
    .select("q.job_id");
  return rows.map((r) => Number(r.job_id));
}

/** Shops with entries not yet in a daily digest, with their time zone (the digest hour is on the shop's clock). */
export async function shopsWithPendingDaily(): Promise<{ shopId: number; timezone: string }[]> {
  const rows: { shop_id: number; timezone: string }[] = await db()("job_update_queue as q").join("shops as s", "s.id", "q.shop_id").whereNull("q.daily_sent_at").distinct("q.shop_id", "s.timezone");
  return rows.map((r) => ({ shopId: Number(r.shop_id), timezone: String(r.timezone) }));
}

export async function dueDailyJobs({ shopId, cutoff, limit }: { shopId: number; cutoff: Date; limit: number }): Promise<number[]> {
  const rows = await db()("job_update_queue").whereNull("daily_sent_at").where("shop_id", shopId).where("shared_at", "<", cutoff).distinct("job_id").limit(limit);
  return rows.map((r) => Number(r.job_id));
}

/** The job's unsent updates for one kind of reader (only those shared before `before`, if given), locked. */
export async function lockPendingUpdates(tx: Knex.Transaction, p: { jobId: number; column: UpdateColumn; before?: Date }): Promise<{ id: number; entryId: number }[]> {
  const q = tx("job_update_queue").where("job_id", p.jobId).whereNull(p.column).orderBy("id").forUpdate().skipLocked().select("id", "entry_id");
  if (p.before) q.where("shared_at", "<", p.before);
  const rows = await q;
  return rows.map((r) => ({ id: Number(r.id), entryId: Number(r.entry_id) }));
}

export async function markUpdatesSent(tx: Knex.Transaction, ids: number[], column: UpdateColumn): Promise<void> {
  if (ids.length) await tx("job_update_queue").whereIn("id", ids).update({ [column]: tx.fn.now(3) });
}

export type MailEntry = {
  id: number;
  kind: string;
  createdAt: Date;
  author: string | null;
  body: unknown;
  caption: string | null;
  photoIds: string[];
};

/** Entries as mail shows them: still shared, not deleted, never money; two queries whatever the count. */
export async function sharedEntriesForMail(k: Knex, { shopId, entryIds }: { shopId: number; entryIds: number[] }): Promise<MailEntry[]> {
  if (!entryIds.length) return [];
  const rows: (Pick<JournalEntriesTable, "id" | "kind" | "created_at" | "body" | "caption"> & { author_name: string | null })[] = await k("journal_entries as e")
    .leftJoin("users as u", "u.id", "e.author_user_id")
    .where("e.shop_id", shopId)
    .whereIn("e.id", entryIds)
    .where("e.visibility", "shared")
    .whereNull("e.deleted_at")
    .whereNotIn("e.kind", MONEY_ENTRY_KINDS)
    .orderBy("e.id")
    .select("e.id", "e.kind", "e.created_at", "e.body", "e.caption", "u.name as author_name");
  const photos = await k("photos")
    .where("shop_id", shopId)
    .whereIn(
      "entry_id",
      rows.map((r) => Number(r.id)),
    )
    .orderBy(["entry_id", "position", "id"])
    .select("entry_id", "public_id");
  return rows.map((r) => ({
    id: Number(r.id),
    kind: String(r.kind),
    createdAt: r.created_at,
    author: r.author_name ?? null,
    body: typeof r.body === "string" ? JSON.parse(r.body) : (r.body ?? null),
    caption: r.caption ?? null,
    photoIds: photos.filter((p) => Number(p.entry_id) === Number(r.id)).map((p) => String(p.public_id)),
  }));
}

/** Forgets queue rows both digests are done with, and sent mail, after a while. */
export async function pruneNotifications({ queueDays, outboxDays }: { queueDays: number; outboxDays: number }): Promise<void> {
  await db()("job_update_queue").whereNotNull("every_sent_at").whereNotNull("daily_sent_at").where("shared_at", "<", db().raw("NOW() - INTERVAL ? DAY", [queueDays])).delete();
  await db()("job_alerts").whereNotNull("sent_at").where("created_at", "<", db().raw("NOW() - INTERVAL ? DAY", [queueDays])).delete();
  await db()("outbox").where("state", "sent").where("sent_at", "<", db().raw("NOW() - INTERVAL ? DAY", [outboxDays])).delete();
  // Sent texts (migration 34) go with the mail: the job's sent log keeps the same window for both.
  await db()("text_outbox").where("state", "sent").where("sent_at", "<", db().raw("NOW() - INTERVAL ? DAY", [outboxDays])).delete();
}
