import "server-only";
import type { Knex } from "knex";
import { AppError } from "@/lib/errors";
import { type AlertKind, type Frequency, MAX_FOLLOWERS, type SubscriberRole } from "@/lib/following";
import { MONEY_ENTRY_KINDS } from "@/lib/journal";
import { db } from "@/db/client";
import type { JobSubscribersTable, JobsTable, MachinesTable } from "@/db/tables";
import { type Tx, transaction } from "@/db/transaction";
import { queueReadyText } from "@/lib/server/texts";

// Who follows a job, and the two queues that become their e-mail: shared entries wait in
// job_update_queue for the digest window; job_alerts go out at the next sweep. Nothing here
// renders mail: the worker does (lib/server/notify-sweep.ts), outside the web app.

const isDuplicateKey = (error: unknown) => (error as { code?: string } | null)?.code === "ER_DUP_ENTRY";

export type Subscriber = {
  id: number;
  email: string;
  userId: number | null;
  role: SubscriberRole;
  frequency: Frequency;
  unsubscribedAt: Date | null;
  createdAt: Date;
};

const SUBSCRIBER_COLUMNS = ["id", "email", "user_id", "role", "frequency", "unsubscribed_at", "created_at"] as const;
function toSubscriber(r: Pick<JobSubscribersTable, (typeof SUBSCRIBER_COLUMNS)[number]>): Subscriber {
  return {
    id: Number(r.id),
    email: String(r.email),
    userId: r.user_id == null ? null : Number(r.user_id),
    role: r.role,
    frequency: r.frequency,
    unsubscribedAt: r.unsubscribed_at ?? null,
    createdAt: r.created_at,
  };
}

/** The machine's owner follows their job (at check-in, inside its transaction; or later, on the pool). */
export async function subscribeOwner(s: { shopId: number; jobId: number; email: string; userId: number | null }, k: Knex = db()): Promise<void> {
  await k("job_subscribers")
    .insert({ shop_id: s.shopId, job_id: s.jobId, email: s.email.toLowerCase(), user_id: s.userId, role: "owner" })
    .onConflict(["job_id", "email"])
    .merge({ role: "owner" });
}

/**
 * Called wherever an entry becomes shared, in the same transaction. Money and decision entries
 * are left to their own module's alert (notifyNow); "ready to collect" goes out at once; every
 * other entry waits for the digest window. Sharing the same entry again queues nothing new.
 */
export async function recordSharedEntry(
  k: Knex,
  e: { shopId: number; jobId: number; entryId: number; kind: string; body?: unknown; alert?: "parts_in" },
): Promise<void> {
  if (MONEY_ENTRY_KINDS.includes(e.kind)) return;
  // An entry that is news of its own (the last part arrived) goes out at once, not in a digest.
  if (e.alert) {
    await notifyNow(k, { shopId: e.shopId, jobId: e.jobId, kind: e.alert, dedupeKey: `${e.alert}:${e.entryId}` });
    return;
  }
  const to = (e.body as { to?: unknown } | null | undefined)?.to;
  if (e.kind === "status" && to === "ready") {
    // By text, if the owner chose it (issue 21; entries are written inside their change's
    // transaction), and by e-mail to the followers and to the owner unless they chose text only.
    const { ownerEmail } = await queueReadyText(k as Tx, { shopId: e.shopId, jobId: e.jobId, entryId: e.entryId });
    await notifyNow(k, { shopId: e.shopId, jobId: e.jobId, kind: "ready", followersOnly: !ownerEmail, dedupeKey: `ready:${e.entryId}` });
    return;
  }
  await k("job_update_queue").insert({ shop_id: e.shopId, job_id: e.jobId, entry_id: e.entryId }).onConflict("entry_id").ignore();
}

/**
 * Mail that goes out at the next sweep (seconds) to every subscriber of the job who hasn't
 * stopped e-mail, whatever their frequency: "ready" and "approval_request". Call it inside the
 * transaction that makes the change. Followers' copies never show `payload.title` or prices.
 * `followersOnly` when the caller mails the owner itself (an approval request's own e-mail).
 * The same dedupeKey on the same job queues one alert only. Returns the alert id.
 */
export async function notifyNow(
  k: Knex,
  a: {
    shopId: number;
    jobId: number;
    kind: Exclude<AlertKind, "invitation">;
    /** title: a line for the owner's copy; link: a path on this site (e.g. /my/jobs/…/approvals/…). */
    payload?: { title?: string; link?: string } | null;
    followersOnly?: boolean;
    dedupeKey?: string | null;
  },
): Promise<number> {
  const payload = a.followersOnly ? { ...a.payload, followersOnly: true } : (a.payload ?? null);
  return insertAlert(k, { shopId: a.shopId, jobId: a.jobId, kind: a.kind, payload, dedupeKey: a.dedupeKey, subscriberId: null });
}

async function insertAlert(
  k: Knex,
  a: { shopId: number; jobId: number; kind: AlertKind; subscriberId: number | null; payload?: unknown; dedupeKey?: string | null },
): Promise<number> {
  const row = {
    shop_id: a.shopId,
    job_id: a.jobId,
    kind: a.kind,
    subscriber_id: a.subscriberId,
    payload: a.payload == null ? null : JSON.stringify(a.payload),
    dedupe_key: a.dedupeKey ?? null,
  };
  try {
    const [id] = await k("job_alerts").insert(row);
    return Number(id);
  } catch (error) {
    if (!isDuplicateKey(error) || !a.dedupeKey) throw error;
    // The unique key that refused the insert names the row that is there.
    const found = await k("job_alerts").where({ job_id: a.jobId, dedupe_key: a.dedupeKey }).first("id");
    return Number(found!.id);
  }
}

export async function listSubscribers({ shopId, jobId }: { shopId: number; jobId: number }): Promise<Subscriber[]> {
  const rows = await db()("job_subscribers").where({ shop_id: shopId, job_id: jobId }).orderByRaw("role = 'owner' DESC").orderBy("id").select(...SUBSCRIBER_COLUMNS);
  return rows.map(toSubscriber);
}

/** The signed-in person's own subscription to this job: by account, or by the address it was made for. */
export async function getOwnSubscription({ jobId, userId, email }: { jobId: number; userId: number; email: string }): Promise<Subscriber | null> {
  const row = await db()("job_subscribers")
    .where("job_id", jobId)
    .where((w) => w.where("user_id", userId).orWhere("email", email.toLowerCase()))
    .orderByRaw("user_id <=> ? DESC", [userId])
    .first(...SUBSCRIBER_COLUMNS);
  return row ? toSubscriber(row) : null;
}

/** Signed-in followers of the job, for the permission check (a follower role on this job). */
export async function followerUserIds({ jobId }: { jobId: number }): Promise<number[]> {
  const rows = await db()("job_subscribers").where({ job_id: jobId, role: "follower" }).whereNotNull("user_id").select("user_id");
  return rows.map((r) => Number(r.user_id));
}

/**
 * A new follower and their invitation e-mail, in one transaction. Refuses the owner, a repeat, and
 * more than MAX_FOLLOWERS. `added` runs in the same transaction (the desk inbox hears of it).
 */
export async function inviteFollower(
  p: { shopId: number; jobId: number; email: string; invitedBy: number },
  added?: (tx: Knex.Transaction, subscriberId: number) => Promise<unknown>,
): Promise<number> {
  const email = p.email.toLowerCase();
  return transaction(async (tx) => {
    // Locking the job row makes two invitations at once count followers one after the other.
    await tx("jobs").where({ id: p.jobId, shop_id: p.shopId }).forUpdate().first("id");
    const existing = await tx("job_subscribers").where({ job_id: p.jobId, email }).first("role");
    if (existing?.role === "owner") throw new AppError("conflict", "That's the machine owner's own address: they already get these e-mails.", { email: ["That address is the owner's own."] });
    if (existing) throw new AppError("conflict", "That person already follows this job.", { email: ["Already following."] });
    const count = await tx("job_subscribers").where({ job_id: p.jobId, role: "follower" }).count({ n: "*" }).first();
    if (Number(count?.n ?? 0) >= MAX_FOLLOWERS) {
      throw new AppError("conflict", `A job can have at most ${MAX_FOLLOWERS} followers. Remove someone first.`, { email: [`At most ${MAX_FOLLOWERS} followers.`] });
    }
    const user = await tx("users").where({ email }).first("id");
    let id: number | undefined;
    try {
      [id] = await tx("job_subscribers").insert({ shop_id: p.shopId, job_id: p.jobId, email, user_id: user ? Number(user.id) : null, role: "follower", invited_by_user_id: p.invitedBy });
    } catch (error) {
      if (isDuplicateKey(error)) throw new AppError("conflict", "That person already follows this job.", { email: ["Already following."] });
      throw error;
    }
    await insertAlert(tx, { shopId: p.shopId, jobId: p.jobId, kind: "invitation", subscriberId: Number(id) });
    if (added) await added(tx, Number(id));
    return Number(id);
  });
}

/** Takes a follower off the job: their e-mail and their access go together. The owner can't be removed. */
export async function removeFollower({ shopId, jobId, subscriberId }: { shopId: number; jobId: number; subscriberId: number }): Promise<boolean> {
  const removed = await db()("job_subscribers").where({ id: subscriberId, shop_id: shopId, job_id: jobId, role: "follower" }).delete();
  return removed === 1;
}

/** Chooses how often, and starts e-mail again if it was stopped. */
export async function setFrequency({ subscriberId, frequency }: { subscriberId: number; frequency: Frequency }): Promise<void> {
  await db()("job_subscribers").where({ id: subscriberId }).update({ frequency, unsubscribed_at: null });
}

/** Stops all e-mail about the job for this subscriber; true if there is such a subscriber (stopping twice is fine). */
export async function unsubscribe({ subscriberId }: { subscriberId: number }): Promise<boolean> {
  const row = await db()("job_subscribers").where({ id: subscriberId }).first("id");
  if (!row) return false;
  await db()("job_subscribers").where({ id: subscriberId }).whereNull("unsubscribed_at").update({ unsubscribed_at: db().fn.now(3) });
  return true;
}

type MachineName = Pick<MachinesTable, "year" | "make" | "model">;

/** What the unsubscribe page names: the machine and the shop, nothing else. */
export async function describeSubscription({ subscriberId }: { subscriberId: number }) {
  const row: (Pick<JobSubscribersTable, "email" | "unsubscribed_at"> & Pick<JobsTable, "public_id"> & MachineName & { shop_name: string }) | undefined = await db()("job_subscribers as s")
    .join("jobs as j", "j.id", "s.job_id")
    .join("machines as m", "m.id", "j.machine_id")
    .join("shops as sh", "sh.id", "s.shop_id")
    .where("s.id", subscriberId)
    .first("s.email", "s.unsubscribed_at", "j.public_id", "m.year", "m.make", "m.model", "sh.name as shop_name");
  if (!row) return null;
  return {
    email: String(row.email),
    unsubscribed: row.unsubscribed_at != null,
    jobPublicId: String(row.public_id),
    machine: { year: row.year == null ? null : Number(row.year), make: String(row.make), model: String(row.model) },
    shopName: String(row.shop_name),
  };
}

/** Jobs this person follows (not as the owner), at any shop. */
export async function listFollowedJobs({ userId }: { userId: number }) {
  const rows: (Pick<JobsTable, "id" | "public_id" | "number" | "status"> & MachineName & { shop_name: string })[] = await db()("job_subscribers as s")
    .join("jobs as j", "j.id", "s.job_id")
    .join("machines as m", "m.id", "j.machine_id")
    .join("shops as sh", "sh.id", "s.shop_id")
    .where({ "s.user_id": userId, "s.role": "follower" })
    .orderByRaw("j.status = 'picked_up'")
    .orderBy("j.updated_at", "desc")
    .limit(200)
    .select("j.id", "j.public_id", "j.number", "j.status", "m.year", "m.make", "m.model", "sh.name as shop_name");
  return rows.map((r) => ({
    id: Number(r.id),
    publicId: String(r.public_id),
    number: Number(r.number),
    status: r.status,
    machine: { year: r.year == null ? null : Number(r.year), make: String(r.make), model: String(r.model) },
    shopName: String(r.shop_name),
  }));
}

/** After a link sign-in: follower rows made for this address become this person's. */
export async function claimFollowerRows(tx: Knex, { email, userId }: { email: string; userId: number }): Promise<void> {
  await tx("job_subscribers").where({ email: email.toLowerCase() }).whereNull("user_id").update({ user_id: userId });
}

/** Sign-in links go to followers too, not only to shops' customers. */
export async function isFollowerAddress({ email }: { email: string }): Promise<boolean> {
  return !!(await db()("job_subscribers").where({ email: email.toLowerCase(), role: "follower" }).first("id"));
}
