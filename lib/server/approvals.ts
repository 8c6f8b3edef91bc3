import "server-only";
import { type DecisionRow, insertDecision, insertRequest, latestRequestOfFinding, listDecisions, lockRequest, markReplaced, markWithdrawn, newRequestPublicId } from "@/db/queries/approvals";
import { getFinding, getMoneySettings, listEvidenceChoices, lockFinding } from "@/db/queries/findings";
import { notifyNow } from "@/db/queries/following";
import { lockJobForRequest } from "@/db/queries/jobs";
import { insertEntry } from "@/db/queries/entries";
import { applyJobEvent, lockJobRow } from "@/db/queries/workflow";
import { type Tx, transaction } from "@/db/transaction";
import { type EvidenceRef, type RequestSnapshot, asSnapshot, buildSnapshot, checkAnswers, decisionTotals, snapshotContent } from "@/lib/approvals";
import { AppError, type ErrorCode } from "@/lib/errors";
import { JOB_STATUS_LABEL, statusMoveError } from "@/lib/job-status";
import { describeMachine } from "@/lib/machine";
import type { Actor } from "@/lib/permissions";
import { readingLine } from "@/lib/reading-text";
import { clipEvidenceLabel, momentAt } from "@/lib/clips";
import type { AnswerInput, RecordDecisionInput } from "@/lib/schemas/approvals";
import { formatJobNumber } from "@/lib/schemas/jobs";
import type { JobAccess, Resolved } from "@/lib/server/access";
import { newMailToken, sealIntact, sealSnapshot } from "@/lib/server/approval-hash";
import { answerPath, cancelReminder, queueRequestMail } from "@/lib/server/approval-mail";
import { noticeChannels, queueApprovalReminderText, queueApprovalText } from "@/lib/server/texts";
import { recordInboxEvent } from "@/lib/server/inbox";
import { answerLineParts, recordRequestLines } from "@/db/queries/parts-pricing";

// Sending, withdrawing and answering approval requests. Every change runs in one transaction
// with the request row locked, so an answer, a withdrawal and a revision can't cross; the unique
// key on approval_decisions.request_id is the last word on "answered once".

export type RefusalReason = "answered" | "withdrawn" | "replaced" | "changed";

/** A refusal that carries what the client should show next: the current version or the stored decision. */
export class ApprovalRefusal extends AppError {
  constructor(
    code: ErrorCode,
    message: string,
    readonly details: { reason: RefusalReason; current: string | null; decision?: DecisionRow },
  ) {
    super(code, message);
  }
}

function evidenceLabels(choices: Awaited<ReturnType<typeof listEvidenceChoices>>, e: { kind: string; ref: string; momentMs: number | null }): EvidenceRef {
  let label: string | null = null;
  if (e.kind === "photo") label = choices.photos.find((p) => p.id === e.ref)?.caption ?? null;
  if (e.kind === "reading") {
    const r = choices.readings.find((x) => x.id === e.ref);
    // Frozen into the request: the value with its limit, source and verdict (lib/reading-text.ts).
    label = r ? readingLine(r) : null;
  }
  if (e.kind === "clip") {
    // Frozen into the request: the clip's caption and, at a marked moment, what the technician said is seen there.
    const clip = choices.clips.find((c) => c.id === e.ref);
    label = clip ? clipEvidenceLabel(clip.caption, momentAt(clip.moments, e.momentMs)) : null;
  }
  return { kind: e.kind as EvidenceRef["kind"], ref: e.ref, momentMs: e.momentMs, label };
}

/**
 * Prices the finding with the shop's settings, freezes it as a request, moves the job to
 * "waiting on the owner" (unless it is there already), posts a shared timeline entry without
 * prices, and queues the e-mail and its reminder, all in one transaction. An open request of the
 * same finding is replaced by this revision (it can no longer be answered).
 */
export async function sendRequest(actor: Actor, { job }: JobAccess, findingId: number, input: { findingVersion: number }) {
  return transaction(async (tx) => {
    const jobRow = (await lockJobForRequest(tx, { shopId: job.shopId, jobId: job.id }))!;
    await lockFinding(tx, { shopId: job.shopId, id: findingId });
    const finding = await getFinding({ shopId: job.shopId, jobId: job.id, id: findingId }, tx);
    if (!finding) throw new AppError("not_found", "That finding isn't on this job.");
    if (finding.version !== input.findingVersion) throw new AppError("conflict", "Someone changed this finding since you opened it. Check the new version, then send.");
    const previous = await latestRequestOfFinding({ shopId: job.shopId, findingId }, tx, true);
    if (previous?.status === "answered") throw new AppError("conflict", "The owner has already answered this finding. Draft a new finding for more work.");

    const status = jobRow.status;
    const refusal = status === "waiting_approval" ? null : statusMoveError(status, "waiting_approval");
    if (refusal) throw new AppError("invalid", `This can't be sent while the job is "${JOB_STATUS_LABEL[status]}": ${refusal}`);

    const settings = await getMoneySettings({ shopId: job.shopId }, tx);
    const choices = await listEvidenceChoices({ shopId: job.shopId, jobId: job.id }, tx);
    const publicId = newRequestPublicId();
    const snapshot = buildSnapshot({
      request: publicId,
      job: job.publicId,
      version: (previous?.version ?? 0) + 1,
      currency: jobRow.currency,
      finding: { title: finding.title, found: finding.found, whyItMatters: finding.whyItMatters, safety: finding.safety },
      evidence: finding.evidence.map((e) => evidenceLabels(choices, e)),
      lines: finding.lines.map(({ id: _id, ...line }) => line),
      pricing: { tax: settings.tax, supplies: settings.supplies },
    });
    if (previous?.status === "sent" && snapshotContent(previous.snapshot) === snapshotContent(snapshot)) {
      throw new AppError("conflict", `Nothing has changed since version ${previous.version} was sent; the owner already has it.`);
    }
    const { canonical, hash } = sealSnapshot(snapshot);
    const { token, tokenHash } = newMailToken();
    const to = jobRow.customerEmail;
    const id = await insertRequest(tx, { shopId: job.shopId, jobId: job.id, publicId, findingId, version: snapshot.version, snapshot, canonical, hash, tokenHash, sentTo: to, userId: actor.userId });
    // Which finding line each snapshot line is, so the answer reaches the lines' parts (issue 19).
    await recordRequestLines(tx, { shopId: job.shopId, requestId: id, lineIds: finding.lines.map((l) => l.id) });
    if (previous?.status === "sent") {
      await markReplaced(tx, { shopId: job.shopId, id: previous.id, by: id });
      await cancelReminder(tx, { shopId: job.shopId, requestPublicId: previous.publicId });
    }
    if (status !== "waiting_approval") {
      const moved = await applyJobEvent(tx, { shopId: job.shopId, jobId: job.id, userId: actor.userId, event: { kind: "request_sent" } });
      if (!moved) throw new AppError("conflict", "Someone moved this job at the same moment. Check its status, then send again.");
    }
    await insertEntry(tx, {
      shopId: job.shopId,
      jobId: job.id,
      kind: "approval",
      authorId: actor.userId,
      visibility: "shared",
      // No prices: followers read this entry too. Prices live in the approval tables.
      body: { event: "sent", request: publicId, title: snapshot.finding.title, version: snapshot.version, lines: snapshot.lines.length, safety: snapshot.finding.safety, replaces: previous?.status === "sent" ? previous.publicId : null },
    });
    // The owner's choice of e-mail, text or both (a text only with their consent: lib/server/texts.ts).
    const channels = await noticeChannels(tx, { shopId: job.shopId, customerId: job.customerId });
    if (channels.text) {
      const path = answerPath(job.publicId, publicId);
      const text = { shopId: job.shopId, jobId: job.id, customerId: job.customerId, email: to, machine: describeMachine(job.machine), answerPath: path, requestPublicId: publicId };
      await queueApprovalText(tx, text);
      // Its one reminder, as the e-mail has; dropped with the e-mail's when the request is settled.
      await queueApprovalReminderText(tx, { ...text, delayHours: settings.reminderDelayHours });
    }
    if (to && channels.email) {
      await queueRequestMail(tx, {
        shop: { id: job.shopId, name: jobRow.shopName },
        to,
        ownerName: jobRow.customerName,
        machine: describeMachine(job.machine),
        jobNumber: formatJobNumber(job.number),
        jobPublicId: job.publicId,
        snapshot,
        token,
        reminderDelayHours: settings.reminderDelayHours,
      });
    }
    // Followers hear at once that the owner has a decision to make: no title, no prices.
    await notifyNow(tx, { shopId: job.shopId, jobId: job.id, kind: "approval_request", followersOnly: true, dedupeKey: `approval:${publicId}` });
    return { publicId, hash, mailed: !!to && channels.email, texted: channels.text, job };
  });
}

const SETTLED: Record<Exclude<RefusalReason, "changed">, string> = {
  answered: "This request has already been answered.",
  withdrawn: "The shop withdrew this request, so it can't be answered. The shop will be in touch if the work is still needed.",
  replaced: "The shop has sent a revised version of this request; this one can no longer be answered. Please check the current version.",
};

/** The newest version of the request's finding, for "see the current version". */
async function currentVersion(k: Tx, shopId: number, findingId: number): Promise<string | null> {
  const latest = await latestRequestOfFinding({ shopId, findingId }, k);
  return latest && latest.status !== "withdrawn" ? latest.publicId : null;
}

export async function withdrawRequest(actor: Actor, { request, job }: Resolved<"request">, input: { reason: string | null }) {
  await transaction(async (tx) => {
    await lockJobRow(tx, { shopId: job.shopId, jobId: job.id });
    const r = await lockRequest(tx, { shopId: job.shopId, id: request.id });
    if (!r || r.status !== "sent") {
      const reason = (r?.status ?? "withdrawn") as Exclude<RefusalReason, "changed">;
      throw new ApprovalRefusal("conflict", SETTLED[reason], { reason, current: await currentVersion(tx, job.shopId, request.findingId) });
    }
    await markWithdrawn(tx, { shopId: job.shopId, id: r.id, userId: actor.userId });
    await cancelReminder(tx, { shopId: job.shopId, requestPublicId: r.publicId });
    await insertEntry(tx, {
      shopId: job.shopId,
      jobId: job.id,
      kind: "approval",
      authorId: actor.userId,
      visibility: "shared",
      body: { event: "withdrawn", request: r.publicId, title: r.snapshot.finding.title, version: r.version, reason: input.reason },
    });
    // The last open request withdrawn: nobody waits on the owner any more.
    await applyJobEvent(tx, { shopId: job.shopId, jobId: job.id, userId: actor.userId, event: { kind: "request_withdrawn" } });
  });
  return { job };
}

type Decide = {
  method: "online" | "phone" | "in_person";
  shownHash: string;
  lines: { no: number; answer: string }[];
  personName: string;
  signatureName: string | null;
  phoneCalled: string | null;
  note: string | null;
  wantsPartsBack: boolean;
  decidedAt: Date;
  ip: string | null;
  userAgent: string | null;
  recordedByUserId: number | null;
};

function isDuplicateKey(error: unknown): boolean {
  return (error as { code?: string } | null)?.code === "ER_DUP_ENTRY";
}

async function storedDecision(shopId: number, requestId: number): Promise<DecisionRow | undefined> {
  return (await listDecisions({ shopId, requestIds: [requestId] })).get(requestId);
}

/** Records the one decision of a request, or refuses with what to show instead. */
async function decide(actor: Actor, request: { id: number; findingId: number }, job: { shopId: number; id: number }, d: Decide): Promise<DecisionRow> {
  const already = (decision: DecisionRow) => new ApprovalRefusal("conflict", `${SETTLED.answered} Here is the answer that was recorded.`, { reason: "answered", current: null, decision });
  try {
    await transaction(async (tx) => {
      await lockJobRow(tx, { shopId: job.shopId, jobId: job.id });
      const r = await lockRequest(tx, { shopId: job.shopId, id: request.id });
      if (!r) throw new AppError("not_found", "No such approval request.");
      const existing = (await listDecisions({ shopId: job.shopId, requestIds: [r.id] }, tx)).get(r.id);
      if (existing) throw already(existing);
      if (r.status === "withdrawn" || r.status === "replaced") {
        throw new ApprovalRefusal("conflict", SETTLED[r.status], { reason: r.status, current: await currentVersion(tx, job.shopId, r.findingId) });
      }
      const changed = (message: string) => new ApprovalRefusal("conflict", message, { reason: "changed", current: r.publicId });
      if (!sealIntact(r)) throw changed("This request no longer matches what the shop sent, so it can't be answered. Ask the shop to send it again.");
      if (d.shownHash !== r.hash) throw changed("The request has changed since you opened it. Here is the current version: please check it and answer again.");
      const snapshot: RequestSnapshot = asSnapshot(r.snapshot);
      const answers = checkAnswers(snapshot, d.lines);
      const t = decisionTotals(snapshot, answers);
      await insertDecision(tx, {
        shopId: job.shopId,
        jobId: job.id,
        requestId: r.id,
        method: d.method,
        personName: d.personName,
        signatureName: d.signatureName,
        phoneCalled: d.phoneCalled,
        note: d.note,
        wantsPartsBack: d.wantsPartsBack,
        decidedAt: d.decidedAt,
        ip: d.ip,
        userAgent: d.userAgent,
        recordedByUserId: d.recordedByUserId,
        shownHash: d.shownHash,
        estimatePreTaxMinor: t.estimate.preTaxTotalMinor,
        estimateTotalMinor: t.estimate.totalMinor,
        authorisedPreTaxMinor: t.authorised.preTaxTotalMinor,
        authorisedTaxMinor: t.authorised.taxMinor,
        authorisedTotalMinor: t.authorised.totalMinor,
        lines: snapshot.lines.map((l) => ({ no: l.no, answer: answers[l.no]!, kind: l.kind, description: l.description, partNumber: l.partNumber, netMinor: l.netMinor, qtyThousandths: l.qtyThousandths, hoursTenths: l.hoursTenths, taxable: l.taxable })),
      });
      await cancelReminder(tx, { shopId: job.shopId, requestPublicId: r.publicId });
      await insertEntry(tx, {
        shopId: job.shopId,
        jobId: job.id,
        kind: "approval",
        authorId: actor.userId,
        visibility: "shared",
        body: { event: "answered", request: r.publicId, title: snapshot.finding.title, version: r.version, approved: t.approvedCount, declined: t.declinedCount, method: d.method, by: d.personName },
      });
      // The desk hears what was approved and declined; the last answer moves the job off the owner.
      const line = (no: number) => snapshot.lines.find((l) => l.no === no)!.description;
      const approved = snapshot.lines.filter((l) => answers[l.no] === "approved").map((l) => line(l.no));
      const declined = snapshot.lines.filter((l) => answers[l.no] === "declined").map((l) => line(l.no));
      await recordInboxEvent(tx, {
        shopId: job.shopId,
        jobId: job.id,
        kind: "owner_answered",
        actorUserId: actor.userId,
        summary: `${d.personName} answered “${snapshot.finding.title}”${d.method === "online" ? "" : d.method === "phone" ? " (by phone)" : " (in person)"}`,
        detail: [approved.length ? `Approved: ${approved.join(", ")}.` : "", declined.length ? `Declined: ${declined.join(", ")}.` : ""].filter(Boolean).join(" "),
        amountMinor: t.authorised.totalMinor,
        currency: snapshot.currency,
        extra: { request: r.publicId, title: snapshot.finding.title, method: d.method, by: d.personName, approved, declined },
      });
      // Approved lines' parts may now wait the job, declined ones never: before the move reads them.
      await answerLineParts(tx, { shopId: job.shopId, jobId: job.id, requestId: r.id, answers });
      await applyJobEvent(tx, { shopId: job.shopId, jobId: job.id, userId: actor.userId, event: { kind: "request_answered" } });
    });
  } catch (error) {
    // Two answers that both got past the status check: the unique key stops the second one.
    if (isDuplicateKey(error)) {
      const stored = await storedDecision(job.shopId, request.id);
      if (stored) throw already(stored);
    }
    throw error;
  }
  return (await storedDecision(job.shopId, request.id))!;
}

/** The machine's owner answers online, line by line, signing with their typed name. */
export async function answerRequest(actor: Actor, { request, job }: Resolved<"request">, input: AnswerInput, meta: { ip: string | null; userAgent: string | null }) {
  const decision = await decide(actor, request, job, {
    method: "online",
    shownHash: input.shownHash,
    lines: input.lines,
    personName: input.signature,
    signatureName: input.signature,
    phoneCalled: null,
    note: null,
    wantsPartsBack: input.wantsPartsBack,
    decidedAt: new Date(),
    ip: meta.ip,
    userAgent: meta.userAgent,
    recordedByUserId: actor.userId,
  });
  return { decision, job };
}

/** The desk notes an answer given by phone or in person, with what consent rules ask for (REFERENCES §6). */
export async function recordDecision(actor: Actor, { request, job }: Resolved<"request">, input: RecordDecisionInput) {
  const now = Date.now();
  if (input.decidedAt.getTime() > now + 5 * 60_000) throw new AppError("invalid", "The answer can't be in the future.", { decidedAt: ["Enter when the owner answered, not a time to come."] });
  if (input.decidedAt.getTime() < new Date(request.sentAt).getTime() - 60_000) {
    throw new AppError("invalid", "That is before the request was sent.", { decidedAt: ["The owner can only answer a request after it was sent."] });
  }
  const decision = await decide(actor, request, job, {
    method: input.method,
    shownHash: input.shownHash,
    lines: input.lines,
    personName: input.personName,
    signatureName: null,
    phoneCalled: input.method === "phone" ? input.phoneCalled : null,
    note: input.note,
    wantsPartsBack: input.wantsPartsBack,
    decidedAt: input.decidedAt,
    ip: null,
    userAgent: null,
    recordedByUserId: actor.userId,
  });
  return { decision, job };
}
