import "server-only";
import type { Knex } from "knex";
import { insertEntry } from "@/db/queries/entries";
import { applyJobEvent, clearedPartsQuery } from "@/db/queries/workflow";
import { AppError } from "@/lib/errors";
import { PART_STATUS_LABEL, type PartBody, type PartStatus, isOutstanding } from "@/lib/bench";
import type { JobStatus } from "@/lib/job-status";
import { formatQuantity } from "@/lib/money";
import { db } from "@/db/client";
import type { JobPartEventsTable, JobPartsTable } from "@/db/tables";
import { transaction } from "@/db/transaction";
import { type InboxEvent, recordInboxEvent } from "@/lib/server/inbox";

// Parts on a job and the waiting-on-parts rule. A part change, its history row, its (shop-only)
// timeline entry and any job move it causes commit together: the job row is locked first, so two
// people receiving the last two parts at once still give one move back to the bench.

type JobKey = { shopId: number; jobId: number };

export type PartRow = {
  id: number;
  partNumber: string | null;
  description: string;
  supplier: string | null;
  qtyThousandths: number;
  costMinor: number | null;
  status: PartStatus;
  expectedOn: string | null;
  findingId: number | null;
  noOkNeeded: boolean;
  /** Issue 19: from a priced finding line — the owner's answer to it (null: not from a line), the unit sell price and why it differs from the markup rule. */
  ownerAnswer: "pending" | "approved" | "declined" | null;
  sellMinor: number | null;
  priceReason: string | null;
  history: { from: PartStatus | null; to: PartStatus; by: string | null; at: string }[];
};

export type NewPart = {
  partNumber: string | null;
  description: string;
  supplier: string | null;
  qtyThousandths: number;
  costMinor: number | null;
  status: PartStatus;
  expectedOn: string | null;
  findingId: number | null;
  noOkNeeded: boolean;
};

/**
 * Applies the waiting-on-parts rule after a part went to `partTo` (lib/job-workflow.ts): a part
 * still to come waits the job only when it is for cleared work (the owner approved its finding,
 * or staff marked it as needing no OK), so the owner never hears "waiting for parts" about work
 * they haven't been asked about.
 */
export async function settleJob(tx: Knex.Transaction, p: JobKey & { userId: number; partId: number; partTo: PartStatus }): Promise<JobStatus | null> {
  if (isOutstanding(p.partTo)) {
    const cleared = await clearedPartsQuery(tx, p).where("p.id", p.partId).first("p.id");
    if (!cleared) return null;
  }
  const move = await applyJobEvent(tx, { shopId: p.shopId, jobId: p.jobId, userId: p.userId, event: { kind: isOutstanding(p.partTo) ? "part_needed" : "part_received" } });
  return move?.to ?? null;
}

export async function lockJob(tx: Knex.Transaction, { shopId, jobId }: JobKey): Promise<JobStatus> {
  const job = await tx("jobs").where({ id: jobId, shop_id: shopId }).forUpdate().first("status");
  if (!job) throw new AppError("not_found", "No such job.");
  return job.status;
}

export function partBody(part: Pick<NewPart, "description" | "partNumber" | "qtyThousandths" | "expectedOn">, event: PartBody["event"], from: PartStatus | null, to: PartStatus): PartBody {
  // Cost and supplier stay out on purpose: an entry may be shared with the owner.
  return { event, description: part.description, partNumber: part.partNumber, qty: formatQuantity(part.qtyThousandths), from, to, expectedOn: part.expectedOn };
}

/** The desk inbox's line for a part that came in (no cost: technicians read it too). */
export function partsReceived(p: JobKey & { userId: number }, part: Pick<NewPart, "description" | "partNumber" | "qtyThousandths">, partId: number): InboxEvent {
  const number = part.partNumber ? ` (${part.partNumber})` : "";
  return { shopId: p.shopId, jobId: p.jobId, kind: "parts_received", actorUserId: p.userId, summary: `${formatQuantity(part.qtyThousandths)} × ${part.description}${number} received`, extra: { part: partId } };
}

export async function addPart(p: JobKey & { userId: number; part: NewPart }): Promise<{ id: number; jobMovedTo: JobStatus | null }> {
  return transaction(async (tx) => {
    await lockJob(tx, p);
    const part = p.part;
    if (part.findingId !== null) {
      const finding = await tx("findings").where({ id: part.findingId, shop_id: p.shopId, job_id: p.jobId }).first("id");
      if (!finding) throw new AppError("invalid", "That finding isn't on this job.", { forWork: ["Choose a finding of this job, or the work it was booked in for."] });
    }
    const [id] = await tx("job_parts").insert({
      shop_id: p.shopId,
      job_id: p.jobId,
      part_number: part.partNumber,
      description: part.description,
      supplier: part.supplier,
      qty_thousandths: part.qtyThousandths,
      cost_minor: part.costMinor,
      status: part.status,
      expected_on: part.expectedOn,
      finding_id: part.findingId,
      no_ok_needed: part.noOkNeeded,
      created_by_user_id: p.userId,
    });
    await tx("job_part_events").insert({ shop_id: p.shopId, part_id: id, from_status: null, to_status: part.status, changed_by_user_id: p.userId });
    await insertEntry(tx, { shopId: p.shopId, jobId: p.jobId, kind: "part", authorId: p.userId, body: partBody(part, "added", null, part.status) });
    if (part.status === "received") await recordInboxEvent(tx, partsReceived(p, part, Number(id)));
    const jobMovedTo = await settleJob(tx, { ...p, partId: Number(id), partTo: part.status });
    return { id: Number(id), jobMovedTo };
  });
}

/** Moves a part on if it is still in `from` (two people pressing at once give one change). */
export async function changePartStatus(
  p: JobKey & { userId: number; partId: number; from: PartStatus; to: PartStatus; expectedOn?: string | null },
): Promise<{ jobMovedTo: JobStatus | null }> {
  if (p.from === p.to && p.expectedOn === undefined) throw new AppError("invalid", `The part is already "${PART_STATUS_LABEL[p.to]}".`);
  return transaction(async (tx) => {
    await lockJob(tx, p);
    const part = await tx("job_parts").where({ id: p.partId, shop_id: p.shopId, job_id: p.jobId }).forUpdate().first();
    if (!part) throw new AppError("not_found", "That part isn't on this job.");
    if (part.owner_answer === "declined") throw new AppError("conflict", "The owner declined this part, so it stays off the job. Price it on a new finding if it is needed after all.");
    if (part.status !== p.from) {
      throw new AppError("conflict", `Someone has just marked this part "${PART_STATUS_LABEL[part.status]}". Check the list, then try again.`);
    }
    const update: Knex.DbRecord<JobPartsTable> = { status: p.to, updated_at: tx.fn.now(3), ...(p.expectedOn !== undefined ? { expected_on: p.expectedOn } : {}) };
    await tx("job_parts").where({ id: p.partId }).update(update);
    if (p.from === p.to) return { jobMovedTo: null };
    await tx("job_part_events").insert({ shop_id: p.shopId, part_id: p.partId, from_status: p.from, to_status: p.to, changed_by_user_id: p.userId });
    const snapshot = {
      description: String(part.description),
      partNumber: part.part_number == null ? null : String(part.part_number),
      qtyThousandths: Number(part.qty_thousandths),
      expectedOn: p.expectedOn !== undefined ? p.expectedOn : (part.expected_on ?? null),
    };
    await insertEntry(tx, { shopId: p.shopId, jobId: p.jobId, kind: "part", authorId: p.userId, body: partBody(snapshot, "status", p.from, p.to) });
    if (p.to === "received") await recordInboxEvent(tx, partsReceived(p, snapshot, p.partId));
    return { jobMovedTo: await settleJob(tx, { ...p, partId: p.partId, partTo: p.to }) };
  });
}

/** A job's parts with their status history, in two queries. */
export async function listParts({ shopId, jobId }: JobKey): Promise<PartRow[]> {
  const rows = await db()("job_parts").where({ shop_id: shopId, job_id: jobId }).orderBy("id", "asc");
  if (!rows.length) return [];
  const events: (Pick<JobPartEventsTable, "part_id" | "from_status" | "to_status" | "changed_at"> & { by_name: string | null })[] = await db()("job_part_events as ev")
    .leftJoin("users as u", "u.id", "ev.changed_by_user_id")
    .where("ev.shop_id", shopId)
    .whereIn(
      "ev.part_id",
      rows.map((r) => Number(r.id)),
    )
    .orderBy("ev.id", "asc")
    .select("ev.part_id", "ev.from_status", "ev.to_status", "ev.changed_at", "u.name as by_name");
  return rows.map((r) => ({
    id: Number(r.id),
    partNumber: r.part_number ?? null,
    description: String(r.description),
    supplier: r.supplier ?? null,
    qtyThousandths: Number(r.qty_thousandths),
    costMinor: r.cost_minor == null ? null : Number(r.cost_minor),
    status: r.status,
    expectedOn: r.expected_on ?? null,
    findingId: r.finding_id == null ? null : Number(r.finding_id),
    noOkNeeded: Boolean(r.no_ok_needed),
    ownerAnswer: r.owner_answer ?? null,
    sellMinor: r.sell_minor == null ? null : Number(r.sell_minor),
    priceReason: r.price_reason ?? null,
    history: events
      .filter((e) => Number(e.part_id) === Number(r.id))
      .map((e) => ({ from: e.from_status ?? null, to: e.to_status, by: e.by_name ?? null, at: e.changed_at.toISOString() })),
  }));
}
