import "server-only";
import crypto from "node:crypto";
import type { Knex } from "knex";
import { db } from "@/db/client";
import { describeMachine } from "@/lib/machine";
import type { JobQuestionsTable, QuestionAuthor, QuestionVia } from "@/db/tables";

// Questions on a job (migration 35): the thread of owner questions and desk answers, the per-job
// reply-to token of mail about the job, and the mail service's webhook deliveries already handled.
// A thread is read in one query whatever its length.

type JobRef = { shopId: number; jobId: number };

export type NewQuestionRow = JobRef & {
  author: QuestionAuthor;
  customerId: number | null;
  userId: number | null;
  body: string;
  via: QuestionVia;
  approvalRequestId: number | null;
  lineNo: number | null;
  answersQuestionId: number | null;
  sourceRef: string | null;
};

export async function insertQuestionRow(k: Knex, r: NewQuestionRow): Promise<number> {
  const [id] = await k("job_questions").insert({
    shop_id: r.shopId,
    job_id: r.jobId,
    author: r.author,
    customer_id: r.customerId,
    user_id: r.userId,
    body: r.body,
    via: r.via,
    approval_request_id: r.approvalRequestId,
    line_no: r.lineNo,
    answers_question_id: r.answersQuestionId,
    source_ref: r.sourceRef,
  });
  return Number(id);
}

/** A question already filed from this provider message (a retried delivery), if any. */
export async function questionBySourceRef(k: Knex, { shopId, sourceRef }: { shopId: number; sourceRef: string }): Promise<number | null> {
  const row = await k("job_questions").where({ shop_id: shopId, source_ref: sourceRef }).first("id");
  return row ? Number(row.id) : null;
}

export async function setQuestionInboxEvent(k: Knex, { shopId, questionId, eventId }: { shopId: number; questionId: number; eventId: number }): Promise<void> {
  await k("job_questions").where({ shop_id: shopId, id: questionId }).update({ inbox_event_id: eventId });
}

/** The question, locked, if it is an owner's question on this job. */
export async function lockOwnerQuestion(tx: Knex.Transaction, { shopId, jobId, questionId }: JobRef & { questionId: number }) {
  const row: Pick<JobQuestionsTable, "id" | "answered_at" | "inbox_event_id" | "via" | "body"> | undefined = await tx("job_questions")
    .where({ shop_id: shopId, job_id: jobId, id: questionId, author: "owner" })
    .forUpdate()
    .first("id", "answered_at", "inbox_event_id", "via", "body");
  return row ? { id: Number(row.id), answeredAt: row.answered_at, inboxEventId: row.inbox_event_id == null ? null : Number(row.inbox_event_id), via: row.via, body: row.body } : null;
}

export async function markQuestionAnswered(tx: Knex.Transaction, { shopId, questionId }: { shopId: number; questionId: number }): Promise<void> {
  await tx("job_questions").where({ shop_id: shopId, id: questionId }).update({ answered_at: tx.fn.now(3) });
}

/** An answered question leaves everyone's unread count: its inbox item is read for the whole active staff. */
export async function markInboxItemReadForStaff(tx: Knex.Transaction, { shopId, eventId }: { shopId: number; eventId: number }): Promise<void> {
  await tx.raw(
    `INSERT IGNORE INTO inbox_reads (user_id, event_id)
     SELECT m.user_id, ? FROM memberships m WHERE m.shop_id = ? AND m.deactivated_at IS NULL`,
    [eventId, shopId],
  );
}

/** The request line a question is about: the request must be of this job and have that line. */
export async function requestLineOf(k: Knex, { shopId, jobId, requestPublicId, lineNo }: JobRef & { requestPublicId: string; lineNo: number }) {
  const row: { id: number; description: string | null } | undefined = await k("approval_requests")
    .where({ shop_id: shopId, job_id: jobId, public_id: requestPublicId })
    .first("id", k.raw("JSON_UNQUOTE(JSON_EXTRACT(snapshot, CONCAT('$.lines[', ?, '].description'))) as description", [lineNo - 1]));
  if (!row) return null;
  const { description } = row;
  return description == null || description === "null" ? null : { requestId: Number(row.id), description };
}

/** The job's owner and what a question or an answer needs to name them. */
export async function questionJobFacts(k: Knex, { shopId, jobId }: JobRef) {
  const row = await k("jobs as j")
    .join("customers as c", (j) => j.on("c.id", "=", "j.customer_id").andOn("c.shop_id", "=", "j.shop_id"))
    .join("machines as m", (j) => j.on("m.id", "=", "j.machine_id").andOn("m.shop_id", "=", "j.shop_id"))
    .join("shops as s", "s.id", "j.shop_id")
    .where({ "j.shop_id": shopId, "j.id": jobId })
    .first("j.number", "j.public_id", "m.year", "m.make", "m.model", "c.id as customer_id", "c.name as customer_name", "c.email as customer_email", "c.user_id as customer_user_id", "s.name as shop_name");
  if (!row) return null;
  return {
    number: Number(row.number),
    publicId: String(row.public_id),
    customerId: Number(row.customer_id),
    customerName: String(row.customer_name),
    customerEmail: (row.customer_email as string | null) ?? null,
    customerUserId: row.customer_user_id == null ? null : Number(row.customer_user_id),
    shopName: String(row.shop_name),
    machine: describeMachine({ year: row.year, make: row.make, model: row.model }),
  };
}

export type ThreadRow = {
  id: number;
  author: QuestionAuthor;
  authorName: string | null;
  body: string;
  via: QuestionVia;
  requestPublicId: string | null;
  lineNo: number | null;
  lineDescription: string | null;
  answersQuestionId: number | null;
  answeredAt: Date | null;
  createdAt: Date;
};

/** The job's thread, oldest first, with who wrote each message and the line it is about. One query. */
export async function listThreadRows({ shopId, jobId }: JobRef, k: Knex = db()): Promise<ThreadRow[]> {
  const rows = await k("job_questions as q")
    .leftJoin("customers as c", (j) => j.on("c.id", "=", "q.customer_id").andOn("c.shop_id", "=", "q.shop_id"))
    .leftJoin("users as u", "u.id", "q.user_id")
    .leftJoin("approval_requests as r", (j) => j.on("r.id", "=", "q.approval_request_id").andOn("r.shop_id", "=", "q.shop_id"))
    .where({ "q.shop_id": shopId, "q.job_id": jobId })
    .orderBy("q.id", "asc")
    .select(
      "q.id",
      "q.author",
      "q.body",
      "q.via",
      "q.line_no",
      "q.answers_question_id",
      "q.answered_at",
      "q.created_at",
      "c.name as customer_name",
      "u.name as user_name",
      "r.public_id as request_public_id",
      k.raw("JSON_UNQUOTE(JSON_EXTRACT(r.snapshot, CONCAT('$.lines[', q.line_no - 1, '].description'))) as line_description"),
    );
  return rows.map((r: Record<string, unknown>) => ({
    id: Number(r.id),
    author: r.author as QuestionAuthor,
    authorName: ((r.author === "owner" ? r.customer_name : r.user_name) as string | null) ?? null,
    body: String(r.body),
    via: r.via as QuestionVia,
    requestPublicId: (r.request_public_id as string | null) ?? null,
    lineNo: r.line_no == null ? null : Number(r.line_no),
    lineDescription: (r.line_description as string | null) ?? null,
    answersQuestionId: r.answers_question_id == null ? null : Number(r.answers_question_id),
    answeredAt: (r.answered_at as Date | null) ?? null,
    createdAt: r.created_at as Date,
  }));
}

// ---------------------------------------------------------------- reply-to tokens

/** 26 lower-case base-32 characters (130 bits): survives a mail system folding the address's case. */
function newToken(): string {
  const alphabet = "abcdefghijklmnopqrstuvwxyz234567";
  const bytes = crypto.randomBytes(26);
  return Array.from(bytes, (b) => alphabet[b & 31]).join("");
}

/** The job's reply token, made on first use. */
export async function replyTokenFor(k: Knex, { shopId, jobId }: JobRef): Promise<string> {
  const found = await k("job_reply_tokens").where({ shop_id: shopId, job_id: jobId }).first("token");
  if (found) return String(found.token);
  await k("job_reply_tokens").insert({ shop_id: shopId, job_id: jobId, token: newToken() }).onConflict(["shop_id", "job_id"]).ignore();
  const row = await k("job_reply_tokens").where({ shop_id: shopId, job_id: jobId }).first("token");
  return String(row!.token);
}

export async function jobByReplyToken(token: string, k: Knex = db()): Promise<JobRef | null> {
  const row = await k("job_reply_tokens").where({ token }).first("shop_id", "job_id");
  return row ? { shopId: Number(row.shop_id), jobId: Number(row.job_id) } : null;
}

/** Records a webhook delivery of the mail service; false if it was handled before (a replay or a retry). */
export async function firstMailWebhookDelivery(k: Knex, { eventId, type }: { eventId: string; type: string }): Promise<boolean> {
  const [result] = (await k.raw("INSERT IGNORE INTO mail_webhook_events (event_id, type) VALUES (?, ?)", [eventId, type])) as [{ affectedRows: number }];
  return Number(result.affectedRows) === 1;
}
