import "server-only";
import { db } from "@/db/client";
import type { OutboxTable } from "@/db/tables";
import type { SentMessage } from "@/lib/mail-log";

/** Sent mail is deleted after this many days (lib/server/notify-sweep.ts); failed and queued mail stays. */
export const SENT_MAIL_KEEP_DAYS = 30;

/** How many of a job's messages the log shows at most (newest first). */
export const MAIL_LOG_LIMIT = 200;

/**
 * Everything sent (or being sent) about one job, newest first, for the desk's "did they get it?".
 * One query, scoped by shop and job (the outbox_job_log index). Only e-mail exists today; a text
 * channel joins here as a UNION ALL of its own table mapped to the same SentMessage shape, with
 * `channel: "text"`, ordered together by `queuedAt`.
 */
export async function listJobMessages({ shopId, jobId, limit = MAIL_LOG_LIMIT }: { shopId: number; jobId: number; limit?: number }): Promise<SentMessage[]> {
  const rows: Pick<
    OutboxTable,
    "id" | "kind" | "to_email" | "subject" | "state" | "attempts" | "last_error" | "provider_id" | "created_at" | "sent_at" | "next_attempt_at" | "send_before"
  >[] = await db()("outbox")
    .where({ shop_id: shopId, job_id: jobId })
    .orderBy("id", "desc")
    .limit(Math.max(1, Math.min(limit, MAIL_LOG_LIMIT)))
    .select("id", "kind", "to_email", "subject", "state", "attempts", "last_error", "provider_id", "created_at", "sent_at", "next_attempt_at", "send_before");
  return rows.map((r) => ({
    channel: "email" as const,
    id: Number(r.id),
    kind: String(r.kind),
    to: String(r.to_email),
    subject: String(r.subject),
    state: r.state,
    attempts: Number(r.attempts),
    lastError: r.last_error ?? null,
    providerId: r.provider_id ?? null,
    queuedAt: new Date(r.created_at),
    sentAt: r.sent_at == null ? null : new Date(r.sent_at),
    nextAttemptAt: new Date(r.next_attempt_at),
    sendBefore: r.send_before == null ? null : new Date(r.send_before),
  }));
}
