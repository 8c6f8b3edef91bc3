import "server-only";
import crypto from "node:crypto";
import type { Knex } from "knex";
import { z } from "zod";
import { AppError } from "@/lib/errors";
import { JOB_PUBLIC_ID_PATTERN } from "@/lib/journal";
import { db } from "@/db/client";
import type { OutboxTable } from "@/db/tables";
import { transaction } from "@/db/transaction";
import { MAIL_FROM } from "@/lib/server/mail";

export type OutboxState = "queued" | "sending" | "retrying" | "sent" | "dead";

/** Outbox priorities above ordinary mail (0). */
export const MAIL_PRIORITY = { signInLink: 10 } as const;

export type NewMail = {
  /** The shop the mail speaks for (its name in From, its e-mail as Reply-To); null for mail of no shop. */
  shopId: number | null;
  /** The job it is about (its sent log, db/queries/mail-log.ts), by id or public id, within `shopId`; left out for mail of no job. */
  jobId?: number | null;
  jobPublicId?: string | null;
  /** What the mail is, for the staff list and logs: "progress", "daily", "ready", "invitation", … */
  kind: string;
  to: string;
  subject: string;
  html: string;
  text: string;
  /** Left out: the shop's own e-mail. null: no Reply-To. */
  replyTo?: string | null;
  headers?: Record<string, string>;
  /** Not before this time (e.g. a reminder); default now. */
  sendAfter?: Date | null;
  /** Useless after this time (an expired sign-in link): dead-lettered instead of sent, and retried until then. */
  sendBefore?: Date | null;
  /** Higher goes first, through the worker's fast lane (sign-in links: MAIL_PRIORITY.signInLink); default 0. */
  priority?: number;
  /** The same key for the same shop queues one mail only; the first row's id is returned. */
  dedupeKey?: string | null;
};

const HEADER_NAME = /^[!#$%&'*+.^_`|~0-9A-Za-z-]+$/;
// Set by the mail provider from the message itself; a caller must not forge them.
const RESERVED_HEADERS = new Set(["from", "to", "cc", "bcc", "subject", "reply-to", "sender", "date", "message-id"]);
const oneLine = (max: number, what: string) =>
  z
    .string()
    .trim()
    .min(1, `${what} is empty.`)
    .max(max, `${what} is longer than ${max} characters.`)
    .refine((s) => !/[\r\n]/.test(s), `${what} must be one line.`);
const email = z.string().trim().toLowerCase().max(254).pipe(z.email({ error: "That is not an e-mail address." }));

const mailSchema = z.object({
  shopId: z.number().int().positive().nullable(),
  jobId: z.number().int().positive().nullable().optional(),
  jobPublicId: z.string().regex(JOB_PUBLIC_ID_PATTERN, "That is not a job's public id.").nullable().optional(),
  kind: z.string().regex(/^[a-z][a-z0-9_-]{0,39}$/, "kind: lower-case letters, digits, - and _ (at most 40)."),
  to: email,
  subject: oneLine(300, "The subject"),
  html: z.string().min(1, "The HTML part is empty.").max(4_000_000),
  text: z.string().min(1, "The text part is empty.").max(4_000_000),
  replyTo: email.nullable().optional(),
  headers: z
    .record(z.string(), oneLine(2000, "A header value"))
    .refine((h) => Object.keys(h).every((name) => HEADER_NAME.test(name) && !RESERVED_HEADERS.has(name.toLowerCase())), "A header name is not allowed.")
    .optional(),
  sendAfter: z.date().nullable().optional(),
  sendBefore: z.date().nullable().optional(),
  priority: z.number().int().min(0).max(255).optional(),
  dedupeKey: oneLine(190, "The dedupe key").nullable().optional(),
}).refine((m) => (m.jobId == null && m.jobPublicId == null) || (m.shopId != null && (m.jobId == null || m.jobPublicId == null)), "A job's mail names its shop, and its job once.");

function isDuplicateKey(error: unknown): boolean {
  return (error as { code?: string } | null)?.code === "ER_DUP_ENTRY";
}

/** `"Shop name" <address of MAIL_FROM>`: the shop's name, our sending address. */
export function fromForShop(shopName: string | null): string {
  const configured = MAIL_FROM();
  if (shopName == null) return configured;
  const address = /<([^<>]+)>\s*$/.exec(configured)?.[1] ?? configured.trim();
  // A quoted display name (RFC 5322 §3.2.4) keeps commas and dots in a shop's name from splitting the header.
  const name = shopName.replace(/[\r\n]+/g, " ").replace(/["\\]/g, (ch) => `\\${ch}`).trim();
  return `"${name}" <${address}>`;
}

/**
 * Queues one e-mail inside the caller's transaction `k`, so it exists exactly when the change
 * that causes it commits. The worker sends it with the stored idempotency key (the provider then
 * drops a repeat of a send that did reach it). Returns the outbox row id.
 */
export async function enqueueMail(k: Knex, mail: NewMail): Promise<number> {
  const m = mailSchema.parse(mail);
  let from = fromForShop(null);
  let replyTo: string | null = m.replyTo ?? null;
  if (m.shopId != null) {
    const shop = (await k("shops").where({ id: m.shopId }).first("name", "email")) as { name: string; email: string | null } | undefined;
    if (!shop) throw new AppError("not_found", `No shop ${m.shopId} to send mail for.`);
    from = fromForShop(shop.name);
    if (m.replyTo === undefined) replyTo = shop.email ? shop.email.toLowerCase() : null;
  }
  let jobId = m.jobId ?? null;
  if (m.jobPublicId != null) {
    const job = await k("jobs").where({ shop_id: m.shopId!, public_id: m.jobPublicId }).first("id");
    if (!job) throw new AppError("not_found", `No job ${m.jobPublicId} in shop ${m.shopId} to send mail about.`);
    jobId = Number(job.id);
  }
  const dedupeScope = m.shopId ?? 0;
  const row = {
    shop_id: m.shopId,
    // The (shop_id, job_id) foreign key refuses a job of another shop.
    job_id: jobId,
    dedupe_scope: dedupeScope,
    dedupe_key: m.dedupeKey ?? null,
    kind: m.kind,
    from_address: from,
    to_email: m.to,
    reply_to: replyTo,
    subject: m.subject,
    html: m.html,
    text: m.text,
    headers: m.headers && Object.keys(m.headers).length ? JSON.stringify(m.headers) : null,
    idempotency_key: crypto.randomUUID(),
    next_attempt_at: m.sendAfter ?? k.fn.now(3),
    send_before: m.sendBefore ?? null,
    priority: m.priority ?? 0,
  };
  try {
    const [id] = await k("outbox").insert(row);
    return Number(id);
  } catch (error) {
    // A duplicate key fails only this statement; the caller's transaction goes on.
    if (!isDuplicateKey(error) || !m.dedupeKey) throw error;
    const existing = await k("outbox").where({ dedupe_scope: dedupeScope, dedupe_key: m.dedupeKey }).first("id");
    if (!existing) throw error;
    return Number(existing.id);
  }
}

export type ClaimedMail = {
  id: number;
  /** Whose mail it is and what about (the desk hears of mail given up on: lib/server/inbox.ts). */
  shopId: number | null;
  jobId: number | null;
  kind: string;
  claimToken: string;
  attempts: number;
  from: string;
  to: string;
  replyTo: string | null;
  subject: string;
  html: string;
  text: string;
  headers: Record<string, string> | null;
  idempotencyKey: string;
  priority: number;
  sendBefore: Date | null;
};

/**
 * The claim shared by the mail outbox and the texts' (`text_outbox`, db/queries/texts.ts): due rows
 * other workers hold are skipped (SKIP LOCKED); the claimed ones become `sending` with a lease and
 * count an attempt. Returns their ids.
 */
export async function claimDueRows(table: "outbox" | "text_outbox", { limit, leaseMs, claimToken, priorityOnly = false }: { limit: number; leaseMs: number; claimToken: string; priorityOnly?: boolean }): Promise<number[]> {
  return transaction(async (tx) => {
    const rows: Pick<OutboxTable, "id">[] = await tx
      .table(table)
      // Lease ends are stored in next_attempt_at too, so one index range finds due rows and lapsed leases.
      .whereIn("state", ["queued", "retrying", "sending"])
      .where("next_attempt_at", "<=", tx.fn.now(3))
      // The fast lane (priority mail only) reads the outbox_priority_due index.
      .modify((q) => {
        if (priorityOnly) q.where("priority", ">", 0);
      })
      .orderBy("next_attempt_at")
      .limit(limit)
      .forUpdate()
      .skipLocked()
      .select("id");
    const found = rows.map((r) => Number(r.id));
    if (!found.length) return found;
    const until = tx.raw("NOW(3) + INTERVAL ? MICROSECOND", [leaseMs * 1000]);
    await tx
      .table(table)
      .whereIn("id", found)
      .update({ state: "sending", claim_token: claimToken, locked_until: until, next_attempt_at: until, attempts: tx.raw("attempts + 1") });
    return found;
  });
}

/**
 * Takes up to `limit` due rows for this worker in one short transaction: rows other workers
 * hold are skipped (SKIP LOCKED), so workers never wait on or share a row. Claimed rows become
 * `sending` with a lease; a worker that dies leaves them to come back when the lease ends, and
 * each claim counts as an attempt, so a mail that keeps crashing its worker still dead-letters.
 */
export async function claimBatch({ limit, leaseMs, priorityOnly = false }: { limit: number; leaseMs: number; priorityOnly?: boolean }): Promise<ClaimedMail[]> {
  const claimToken = crypto.randomUUID();
  const ids = await claimDueRows("outbox", { limit, leaseMs, claimToken, priorityOnly });
  if (!ids.length) return [];
  const rows = await db()("outbox").whereIn("id", ids).where("claim_token", claimToken).orderBy("id");
  return rows.map((r) => ({
    id: Number(r.id),
    shopId: r.shop_id == null ? null : Number(r.shop_id),
    jobId: r.job_id == null ? null : Number(r.job_id),
    kind: String(r.kind),
    claimToken,
    attempts: Number(r.attempts),
    from: String(r.from_address),
    to: String(r.to_email),
    replyTo: r.reply_to ?? null,
    subject: String(r.subject),
    html: String(r.html),
    text: String(r.text),
    headers: r.headers == null ? null : typeof r.headers === "string" ? (JSON.parse(r.headers) as Record<string, string>) : (r.headers as Record<string, string>),
    idempotencyKey: String(r.idempotency_key),
    priority: Number(r.priority ?? 0),
    sendBefore: r.send_before == null ? null : new Date(r.send_before),
  }));
}

const mine = (m: Pick<ClaimedMail, "id" | "claimToken">, k: Knex = db()) => k("outbox").where({ id: m.id, claim_token: m.claimToken, state: "sending" });

/** Each outcome applies only while this worker still holds the row, so a late worker can't undo a newer claim. */
export async function markSent(m: ClaimedMail, providerId: string): Promise<void> {
  await mine(m).update({ state: "sent", sent_at: db().fn.now(3), provider_id: providerId.slice(0, 100), locked_until: null, claim_token: null, last_error: null });
}

/**
 * A failed try: retried after `retryInMs`, or (null) given up on. `onDead` runs in the transaction
 * that gives the mail up, only if this worker still held it, so the desk hears of it exactly once.
 */
export async function markFailed(m: ClaimedMail, failure: { error: string; retryInMs: number | null }, onDead?: (tx: Knex.Transaction) => Promise<unknown>): Promise<void> {
  const error = failure.error.slice(0, 500);
  if (failure.retryInMs == null) {
    await transaction(async (tx) => {
      const given = await mine(m, tx).update({ state: "dead", last_error: error, locked_until: null, claim_token: null });
      if (given === 1 && onDead) await onDead(tx);
    });
    return;
  }
  const next = db().raw("NOW(3) + INTERVAL ? MICROSECOND", [Math.max(0, Math.round(failure.retryInMs)) * 1000]);
  await mine(m).update({ state: "retrying", last_error: error, next_attempt_at: next, locked_until: null, claim_token: null });
}

/** Gives claimed rows back untried (e.g. the provider said "slow down" before they were sent). */
export async function releaseClaim(m: ClaimedMail, afterMs: number): Promise<void> {
  const next = db().raw("NOW(3) + INTERVAL ? MICROSECOND", [Math.max(0, Math.round(afterMs)) * 1000]);
  await mine(m).update({ state: "retrying", attempts: db().raw("GREATEST(attempts, 1) - 1"), next_attempt_at: next, locked_until: null, claim_token: null });
}

export type OutboxProblem = {
  id: number;
  /** The job the mail is about (for the link to its sent log), or null. */
  jobNumber: number | null;
  kind: string;
  to: string;
  subject: string;
  state: "retrying" | "dead";
  attempts: number;
  lastError: string | null;
  nextAttemptAt: Date;
  createdAt: Date;
};

/** The shop's mail that failed at least once and is not sent yet, newest first. */
export async function listOutboxProblems({ shopId, limit = 100 }: { shopId: number; limit?: number }): Promise<OutboxProblem[]> {
  const rows: (Pick<OutboxTable, "id" | "kind" | "to_email" | "subject" | "state" | "attempts" | "last_error" | "next_attempt_at" | "created_at"> & { job_number: number | null })[] = await db()(
    "outbox as o",
  )
    .leftJoin("jobs as j", function () {
      this.on("j.shop_id", "o.shop_id").andOn("j.id", "o.job_id");
    })
    .where("o.shop_id", shopId)
    .whereIn("o.state", ["retrying", "dead"])
    .orderBy("o.id", "desc")
    .limit(limit)
    .select("o.id", "o.kind", "o.to_email", "o.subject", "o.state", "o.attempts", "o.last_error", "o.next_attempt_at", "o.created_at", "j.number as job_number");
  return rows.map((r) => ({
    id: Number(r.id),
    jobNumber: r.job_number == null ? null : Number(r.job_number),
    kind: String(r.kind),
    to: String(r.to_email),
    subject: String(r.subject),
    state: r.state as "retrying" | "dead",
    attempts: Number(r.attempts),
    lastError: r.last_error ?? null,
    nextAttemptAt: r.next_attempt_at,
    createdAt: r.created_at,
  }));
}

/** Sends a failed or dead mail again now, with a fresh count of tries (and the same idempotency key). */
export async function retryOutboxMail({ shopId, id }: { shopId: number; id: number }): Promise<boolean> {
  const changed = await db()("outbox")
    .where({ id, shop_id: shopId })
    .whereIn("state", ["retrying", "dead"])
    .update({ state: "queued", attempts: 0, next_attempt_at: db().fn.now(3), last_error: null });
  return changed === 1;
}
