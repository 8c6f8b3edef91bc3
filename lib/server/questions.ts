import "server-only";
import { enqueueMail } from "@/db/queries/outbox";
import {
  insertQuestionRow,
  listThreadRows,
  lockOwnerQuestion,
  markInboxItemReadForStaff,
  markQuestionAnswered,
  questionBySourceRef,
  questionJobFacts,
  replyTokenFor,
  requestLineOf,
  setQuestionInboxEvent,
} from "@/db/queries/questions";
import { recordEvent } from "@/db/queries/shop-events";
import { type Tx, transaction } from "@/db/transaction";
import { AppError } from "@/lib/errors";
import type { Actor } from "@/lib/permissions";
import type { AnswerQuestionInput, AskQuestionInput } from "@/lib/schemas/questions";
import type { JobAccess } from "@/lib/server/access";
import { oneLine } from "@/lib/inbox";
import { QUESTION_MAX, type QuestionVia, type ThreadMessage, VIA_LABEL, lineLabel, replyAddress } from "@/lib/questions";
import { formatJobNumber } from "@/lib/schemas/jobs";
import { appUrl } from "@/lib/server/config";
import { renderQuestionAnswerMail } from "@/lib/server/emails/question-answer";
import { recordInboxEvent } from "@/lib/server/inbox";
import { noticeChannels, queueNoticeText, textLinkTo } from "@/lib/server/texts";

// Questions on a job (issue 21 §4). The owner asks (job page, a line of an approval request, a
// reply to a text or an e-mail); the question lands in the desk inbox; the desk answers from the
// staff job page, which clears the inbox item for everyone and mails the answer to the owner with
// the job's reply-to address. Nothing here reads or writes approval requests' decisions: a
// question never changes what was agreed (tests/integration/questions.test.ts checks).

/** The domain of the reply-to addresses (the inbound side of the mail service). */
export function inboundDomain(): string {
  return (process.env.MAIL_INBOUND_DOMAIN || "reply.benchside.test").toLowerCase();
}

export type OwnerQuestion = {
  shopId: number;
  jobId: number;
  /** Must be the job's owner. */
  customerId: number;
  body: string;
  via: QuestionVia;
  /** The line of an approval request of this job it is about (the snapshot's line number). */
  approvalLine?: { requestPublicId: string; lineNo: number } | null;
  /** The owner's sign-in when they asked on a page (named in the inbox); null for a text or a mail. */
  actorUserId?: number | null;
  /** The provider's id of an inbound text or mail: a retried delivery files one question. */
  sourceRef?: string | null;
};

const refuseBody = (message: string): never => {
  throw new AppError("invalid", message, { body: [message] });
};

/** The text of a question or an answer: trimmed; empty refused; too long refused on a page, cut short from a text or a mail. */
function cleanBody(body: string, via: QuestionVia | "answer"): string {
  const trimmed = body.replace(/\r\n?/g, "\n").replace(/\n{3,}/g, "\n\n").trim();
  if (!trimmed) refuseBody(via === "answer" ? "Write the answer first." : "Write your question first.");
  if (trimmed.length <= QUESTION_MAX) return trimmed;
  if (via === "page" || via === "answer") refuseBody(`Keep it under ${QUESTION_MAX} characters (this is ${trimmed.length}).`);
  return `${trimmed.slice(0, QUESTION_MAX - 1)}…`;
}

/**
 * Files an owner's question on the job inside the caller's transaction: the thread row, an
 * `owner_question` inbox item (e-mailed at once to staff who chose so), a live update for open
 * pages. A question from the same provider message twice returns the first one.
 */
export async function recordOwnerQuestion(tx: Tx, q: OwnerQuestion): Promise<{ id: number }> {
  if (q.sourceRef) {
    const existing = await questionBySourceRef(tx, { shopId: q.shopId, sourceRef: q.sourceRef });
    if (existing) return { id: existing };
  }
  const body = cleanBody(q.body, q.via);
  const job = await questionJobFacts(tx, q);
  if (!job) throw new AppError("not_found", "That job doesn't exist.");
  if (job.customerId !== q.customerId) throw new AppError("forbidden", "Only the machine's owner can ask on this job.");

  let line: { requestId: number; lineNo: number; description: string } | null = null;
  if (q.approvalLine) {
    const found = await requestLineOf(tx, { shopId: q.shopId, jobId: q.jobId, ...q.approvalLine });
    if (!found) throw new AppError("invalid", "That line isn't on this request. Reload the page and ask again.", { line: ["That line isn't on this request."] });
    line = { requestId: found.requestId, lineNo: q.approvalLine.lineNo, description: found.description };
  }

  const id = await insertQuestionRow(tx, {
    shopId: q.shopId,
    jobId: q.jobId,
    author: "owner",
    customerId: q.customerId,
    userId: q.actorUserId ?? null,
    body,
    via: q.via,
    approvalRequestId: line?.requestId ?? null,
    lineNo: line?.lineNo ?? null,
    answersQuestionId: null,
    sourceRef: q.sourceRef ?? null,
  });
  const about = line ? ` about line ${line.lineNo} (${oneLine(line.description, 60)})` : "";
  const eventId = await recordInboxEvent(tx, {
    shopId: q.shopId,
    jobId: q.jobId,
    kind: "owner_question",
    actorUserId: q.actorUserId ?? null,
    summary: `${job.customerName} asked${q.via === "page" ? "" : ` ${VIA_LABEL[q.via]}`}${about}: ${body}`,
    extra: { questionId: id, via: q.via },
    ownerVisible: true,
  });
  await setQuestionInboxEvent(tx, { shopId: q.shopId, questionId: id, eventId });
  return { id };
}

export type DeskAnswer = { shopId: number; jobId: number; questionId: number; userId: number; userName: string; body: string };

/**
 * The desk answers one open question: the answer goes on the thread, the question is marked
 * answered (its inbox item read for the whole staff), and the owner gets the answer by e-mail
 * through the outbox, with the job's reply-to address. An answered question can't be answered
 * again (two people at the desk): 409.
 */
export async function answerQuestion(tx: Tx, a: DeskAnswer): Promise<{ id: number }> {
  const body = cleanBody(a.body, "answer");
  const question = await lockOwnerQuestion(tx, a);
  if (!question) throw new AppError("not_found", "That question isn't on this job.", { question: ["That question isn't on this job."] });
  if (question.answeredAt) throw new AppError("conflict", "Someone has answered this question already. Reload the page to see the answer.");
  const job = await questionJobFacts(tx, a);
  if (!job) throw new AppError("not_found", "That job doesn't exist.");

  const id = await insertQuestionRow(tx, {
    shopId: a.shopId,
    jobId: a.jobId,
    author: "staff",
    customerId: null,
    userId: a.userId,
    body,
    via: "page",
    approvalRequestId: null,
    lineNo: null,
    answersQuestionId: question.id,
    sourceRef: null,
  });
  await markQuestionAnswered(tx, { shopId: a.shopId, questionId: question.id });
  if (question.inboxEventId != null) await markInboxItemReadForStaff(tx, { shopId: a.shopId, eventId: question.inboxEventId });
  await recordEvent(tx, { shopId: a.shopId, jobId: a.jobId, kind: "job_changed", actorUserId: a.userId, payload: { questionId: question.id, answerId: id }, ownerVisible: true });

  // The owner's choice of e-mail, text or both (issue 21 §3; a text only with their consent).
  const channels = await noticeChannels(tx, { shopId: a.shopId, customerId: job.customerId });
  if (channels.text) {
    const link = await textLinkTo(tx, { email: job.customerEmail, nextPath: `/my/jobs/${job.publicId}` });
    await queueNoticeText(tx, { shopId: a.shopId, jobId: a.jobId, customerId: job.customerId, notice: { kind: "answer", machine: job.machine, excerpt: body, link }, dedupeKey: `question-answer:${id}` });
  }
  if (job.customerEmail && channels.email) {
    const thread = await listThreadRows({ shopId: a.shopId, jobId: a.jobId }, tx);
    const asked = thread.find((m) => m.id === question.id);
    const token = await replyTokenFor(tx, a);
    const mail = await renderQuestionAnswerMail({
      shopName: job.shopName,
      job: [formatJobNumber(job.number), job.machine].filter(Boolean).join(" · "),
      question: question.body,
      lineLabel: asked?.requestPublicId && asked.lineNo != null ? lineLabel({ requestPublicId: asked.requestPublicId, no: asked.lineNo, description: asked.lineDescription }) : null,
      answer: body,
      answeredBy: `${a.userName}, ${job.shopName}`,
      jobUrl: `${appUrl()}/my/jobs/${job.publicId}`,
    });
    await enqueueMail(tx, { shopId: a.shopId, jobId: a.jobId, kind: "question-answer", to: job.customerEmail, ...mail, replyTo: replyAddress(token, inboundDomain()), dedupeKey: `question-answer:${id}` });
  }
  return { id };
}

/** The job's thread for a page or a handler, oldest first. */
export async function jobThread(ref: { shopId: number; jobId: number }, k?: Tx): Promise<ThreadMessage[]> {
  const rows = await listThreadRows(ref, k);
  return rows.map((r) => ({
    id: r.id,
    author: r.author,
    authorName: r.authorName,
    body: r.body,
    via: r.via,
    line: r.requestPublicId && r.lineNo != null ? { requestPublicId: r.requestPublicId, no: r.lineNo, description: r.lineDescription } : null,
    answersQuestionId: r.answersQuestionId,
    answeredAt: r.answeredAt ? new Date(r.answeredAt).toISOString() : null,
    at: new Date(r.createdAt).toISOString(),
  }));
}

/** The owner asks from a page (the action's resolver has checked `questions:ask` on the job). */
export async function askAs(actor: Actor, { job }: JobAccess, input: AskQuestionInput): Promise<{ id: number }> {
  const approvalLine = input.request && input.line ? { requestPublicId: input.request, lineNo: input.line } : null;
  return transaction((tx) => recordOwnerQuestion(tx, { shopId: job.shopId, jobId: job.id, customerId: job.customerId, body: input.body, via: "page", approvalLine, actorUserId: actor.userId }));
}

/** The desk answers from the staff job page (`questions:answer` checked by the resolver). */
export async function answerAs(actor: Actor, { job }: JobAccess, input: AnswerQuestionInput): Promise<{ id: number }> {
  return transaction((tx) => answerQuestion(tx, { shopId: job.shopId, jobId: job.id, questionId: input.question, userId: actor.userId, userName: actor.name, body: input.body }));
}
