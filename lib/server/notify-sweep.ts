import "server-only";
import {
  type MailJob,
  type Recipient,
  type UpdateColumn,
  dueAlertIds,
  dueDailyJobs,
  dueProgressJobs,
  getInviterName,
  lockAlert,
  lockPendingUpdates,
  mailJob,
  mailRecipients,
  markAlertSent,
  markUpdatesSent,
  pruneNotifications,
  sharedEntriesForMail,
  shopsWithPendingDaily,
} from "@/db/queries/notifications";
import { SENT_MAIL_KEEP_DAYS } from "@/db/queries/mail-log";
import { enqueueMail } from "@/db/queries/outbox";
import { lastDailyCutoff } from "@/lib/following";
import { type Tx, transaction } from "@/db/transaction";
import { type Composed, composeAlert, composeProgress, entryViews } from "@/lib/server/emails/compose";
import { renderMail } from "@/lib/server/emails/render";

// Turns due notifications into outbox rows. Each job (or alert) is one transaction: the queue
// rows are locked (SKIP LOCKED), the mail for every recipient is queued, the rows are marked,
// and all of it commits together, so a crash mid-way leaves nothing half-sent or sent twice.

const LIMIT = 50;
const PRUNE_EVERY_MS = 3_600_000;
let prunedAt = 0;

export function dailyDigestHour(): number {
  const n = Number(process.env.DAILY_DIGEST_HOUR ?? 18);
  return Number.isInteger(n) && n >= 0 && n <= 23 ? n : 18;
}

async function queue(tx: Tx, job: MailJob, r: Recipient, composed: Composed, kind: string, dedupeKey: string) {
  const { html, text } = await renderMail(composed.element);
  await enqueueMail(tx, { shopId: job.shopId, jobId: job.id, kind, to: r.email, subject: composed.subject, html, text, headers: composed.headers, dedupeKey });
}

/** One alert: to its one subscriber (invitations) or to everyone on the job who hasn't stopped e-mail. */
async function sendAlert(alertId: number): Promise<number> {
  return transaction(async (tx) => {
    const alert = await lockAlert(tx, alertId);
    if (!alert) return 0;
    const job = await mailJob(tx, alert.jobId);
    const everyone = job ? await mailRecipients(tx, { jobId: alert.jobId, subscriberId: alert.subscriberId }) : [];
    const recipients = alert.payload?.followersOnly === true ? everyone.filter((r) => r.role === "follower") : everyone;
    let queued = 0;
    for (const r of recipients) {
      const extra = alert.kind === "invitation" ? { inviterName: await getInviterName({ subscriberId: r.id }, tx) } : {};
      const composed = composeAlert(job!, r, alert.kind, alert.payload, extra);
      if (!composed) continue;
      await queue(tx, job!, r, composed, alert.kind.replace("_", "-"), `alert:${alert.id}:${r.id}`);
      queued++;
    }
    await markAlertSent(tx, alert.id);
    return queued;
  });
}

/** One job's pending updates for one kind of reader, as one e-mail per subscriber. */
async function sendDigest(jobId: number, digest: "every" | "daily", now: Date, before?: Date): Promise<number> {
  const column: UpdateColumn = digest === "every" ? "every_sent_at" : "daily_sent_at";
  return transaction(async (tx) => {
    const rows = await lockPendingUpdates(tx, { jobId, column, before });
    if (!rows.length) return 0;
    const job = await mailJob(tx, jobId);
    const entries = job ? await sharedEntriesForMail(tx, { shopId: job.shopId, entryIds: rows.map((r) => r.entryId) }) : [];
    let queued = 0;
    // Entries unshared or deleted since are left out; if none is left, there is nothing to say.
    if (job && entries.length) {
      const views = entryViews(entries, validTimeZone(job.shop.timezone), now);
      const last = rows[rows.length - 1]!.id;
      for (const r of await mailRecipients(tx, { jobId, frequencies: [digest] })) {
        await queue(tx, job, r, composeProgress(job, r, views, digest), digest === "every" ? "progress" : "daily", `${digest}:${last}:${r.id}`);
        queued++;
      }
    }
    await markUpdatesSent(tx, rows.map((r) => r.id), column);
    return queued;
  });
}

/** One job's trouble (its transaction rolled back, to be tried next round) must not hold up every other job's mail. */
async function isolated(what: string, work: () => Promise<number>): Promise<number> {
  try {
    return await work();
  } catch (error) {
    console.error(`notifications: ${what} failed; it stays queued for the next round`, error);
    return 0;
  }
}

function validTimeZone(timeZone: string): string {
  try {
    new Intl.DateTimeFormat("en-US", { timeZone });
    return timeZone;
  } catch {
    return "UTC";
  }
}

/**
 * One round: alerts first (they are the urgent ones), then jobs whose digest window has passed,
 * then daily digests for shops whose digest hour has come. `now` is for tests of the window.
 */
export async function sweepNotifications({ now = new Date() }: { now?: Date } = {}): Promise<{ alerts: number; progress: number; daily: number }> {
  const result = { alerts: 0, progress: 0, daily: 0 };
  for (const id of await dueAlertIds({ limit: LIMIT })) result.alerts += await isolated(`alert ${id}`, () => sendAlert(id));
  for (const jobId of await dueProgressJobs({ now, limit: LIMIT })) result.progress += await isolated(`job ${jobId}`, () => sendDigest(jobId, "every", now));
  const hour = dailyDigestHour();
  for (const shop of await shopsWithPendingDaily()) {
    const cutoff = lastDailyCutoff(now, validTimeZone(shop.timezone), hour);
    for (const jobId of await dueDailyJobs({ shopId: shop.shopId, cutoff, limit: LIMIT })) {
      result.daily += await isolated(`daily digest of job ${jobId}`, () => sendDigest(jobId, "daily", now, cutoff));
    }
  }
  // Forget what no digest needs any more: at a worker's first round, then hourly (at a known time,
  // not at random, so a long test run sees it once, before its checksums are taken).
  if (Date.now() - prunedAt >= PRUNE_EVERY_MS) {
    prunedAt = Date.now();
    await pruneNotifications({ queueDays: 14, outboxDays: SENT_MAIL_KEEP_DAYS });
  }
  return result;
}
