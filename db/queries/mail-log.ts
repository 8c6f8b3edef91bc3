import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import type { OutboxTable, TextOutboxTable } from "@/db/tables";
import type { MessageChannel, SentMessage } from "@/lib/mail-log";

/** Sent mail is deleted after this many days (lib/server/notify-sweep.ts); failed and queued mail stays. */
export const SENT_MAIL_KEEP_DAYS = 30;

/** How many of a job's messages the log shows at most (newest first). */
export const MAIL_LOG_LIMIT = 200;

/**
 * Everything sent (or being sent) about one job, newest first, for the desk's "did they get it?": the
 * mail outbox and the texts' outbox (migration 34) as one UNION ALL, each side scoped by shop and job
 * (the outbox_job_log index; text_outbox's (shop_id, job_id, id)), ordered together by when queued.
 */
export async function listJobMessages({ shopId, jobId, limit = MAIL_LOG_LIMIT }: { shopId: number; jobId: number; limit?: number }): Promise<SentMessage[]> {
  const k = db();
  const mail = k("outbox")
    .where({ shop_id: shopId, job_id: jobId })
    .select(k.raw("'email' AS channel"), "id", "kind", "to_email AS to_address", "subject", "state", "attempts", "last_error", "provider_id", "created_at", "sent_at", "next_attempt_at", "send_before", k.raw("NULL AS delivery"), k.raw("NULL AS held_reason"));
  const texts = (q: Knex.QueryBuilder) =>
    q
      .from("text_outbox")
      .where({ shop_id: shopId, job_id: jobId })
      .select(k.raw("'text' AS channel"), "id", "kind", "to_phone AS to_address", "body AS subject", "state", "attempts", "last_error", "provider_sid AS provider_id", "created_at", "sent_at", "next_attempt_at", k.raw("NULL AS send_before"), "delivery", "held_reason");
  const rows: (Pick<OutboxTable, "id" | "kind" | "subject" | "state" | "attempts" | "last_error" | "provider_id" | "created_at" | "sent_at" | "next_attempt_at" | "send_before"> &
    Pick<TextOutboxTable, "delivery" | "held_reason"> & { channel: MessageChannel; to_address: string })[] = await k
    .select("*")
    .from(mail.unionAll(texts, true).as("m"))
    .orderBy("created_at", "desc")
    .orderBy("id", "desc")
    .limit(Math.max(1, Math.min(limit, MAIL_LOG_LIMIT)));
  return rows.map((r) => ({
    channel: r.channel,
    id: Number(r.id),
    kind: String(r.kind),
    to: String(r.to_address),
    subject: String(r.subject),
    state: r.state,
    attempts: Number(r.attempts),
    lastError: r.last_error ?? null,
    providerId: r.provider_id ?? null,
    queuedAt: new Date(r.created_at),
    sentAt: r.sent_at == null ? null : new Date(r.sent_at),
    nextAttemptAt: new Date(r.next_attempt_at),
    sendBefore: r.send_before == null ? null : new Date(r.send_before),
    delivery: r.delivery ?? null,
    heldReason: r.held_reason ?? null,
  }));
}
