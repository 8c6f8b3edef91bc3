import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import { moveJobStatus } from "@/db/queries/journal";
import { recordEvent } from "@/db/queries/shop-events";
import { transaction } from "@/db/transaction";
import { OUTSTANDING_PART_STATUSES } from "@/lib/bench";
import { AppError } from "@/lib/errors";
import type { JobStatus } from "@/lib/job-status";
import { CAUSE_LABEL, type JobFacts, type Move, type WorkflowEvent, collectionRefusal, moveFor } from "@/lib/job-workflow";

// The database side of the job workflow (lib/job-workflow.ts): read a job's facts, and apply an
// event inside the writer's transaction, so the record and the move it causes commit together.

type JobKey = { shopId: number; jobId: number };

/**
 * Parts that wait the job: outstanding, and for cleared work — from a priced line the owner
 * approved; or, for a part not from a line, marked as needing no OK or for a finding the owner
 * approved (any approved line of any of its requests). Proposed and declined parts never wait it.
 */
export function clearedPartsQuery(k: Knex, { shopId, jobId }: JobKey) {
  return k("job_parts as p")
    .where({ "p.shop_id": shopId, "p.job_id": jobId })
    .whereIn("p.status", OUTSTANDING_PART_STATUSES)
    // A part from a priced line (owner_answer set, migration 30) waits the job only once the owner
    // approved that very line; any other part by the older rule below.
    .where((top) =>
      top.where("p.owner_answer", "approved").orWhere((older) =>
        older.whereNull("p.owner_answer").where((w) =>
          w.where("p.no_ok_needed", true).orWhereExists((e) =>
            e
              .select(k.raw("1"))
              .from("approval_requests as r")
              .join("approval_decisions as d", "d.request_id", "r.id")
              .join("approval_decision_lines as l", "l.decision_id", "d.id")
              .whereRaw("r.shop_id = p.shop_id and r.finding_id = p.finding_id")
              .where("l.answer", "approved"),
          ),
        ),
      ),
    );
}

/**
 * Locks the job row first, as every writer on a job does (see insertEntry on lock order): two
 * answers to two requests of one job then queue instead of deadlocking.
 */
export async function lockJobRow(tx: Knex.Transaction, { shopId, jobId }: JobKey): Promise<JobStatus> {
  const row = await tx("jobs").where({ id: jobId, shop_id: shopId }).forUpdate().first("status");
  if (!row) throw new AppError("not_found", "No such job.");
  return row.status as JobStatus;
}

/** A job's facts as the workflow reads them, in the caller's transaction. */
export async function readJobFacts(k: Knex, key: JobKey): Promise<JobFacts> {
  const open = await k("approval_requests").where({ shop_id: key.shopId, job_id: key.jobId, status: "sent" }).count({ n: "*" }).first();
  const parts = await clearedPartsQuery(k, key).count({ n: "*" }).first();
  const invoice = await k("invoices")
    .where({ shop_id: key.shopId, job_id: key.jobId })
    .whereNot("status", "void")
    .orderBy("id", "desc")
    .first("status", "balance_minor");
  return {
    openRequests: Number(open?.n ?? 0),
    outstandingParts: Number(parts?.n ?? 0),
    invoice: !invoice ? "none" : invoice.status === "draft" ? "draft" : invoice.status === "paid" || Number(invoice.balance_minor) <= 0 ? "paid" : "issued",
    balanceMinor: invoice && invoice.status !== "draft" ? Math.max(0, Number(invoice.balance_minor)) : 0,
  };
}

/**
 * Applies one workflow event to a job in the writer's transaction: locks the job row, reads the
 * facts as they now stand, and moves the job if the rules say so, with a status-history row that
 * names the event and the person who caused it. Collection refuses (AppError) past the gate.
 */
export async function applyJobEvent(tx: Knex.Transaction, p: JobKey & { userId: number | null; event: WorkflowEvent; note?: string | null }): Promise<Move | null> {
  const status = await lockJobRow(tx, p);
  const facts = await readJobFacts(tx, p);
  if (p.event.kind === "collected") {
    const refusal = collectionRefusal(status, facts, p.event.override);
    if (refusal) throw new AppError("conflict", refusal, { override: [refusal] });
  }
  const move = moveFor(status, p.event, facts);
  if (!move) return null;
  const override = p.event.kind === "collected" && p.event.override?.trim() ? `Handed back before payment: ${p.event.override.trim()}` : null;
  const note = [override, p.note].filter(Boolean).join(" · ") || (p.event.kind === "manual" ? null : CAUSE_LABEL[move.cause]);
  const moved = await moveJobStatus({
    tx,
    shopId: p.shopId,
    jobId: p.jobId,
    from: status,
    to: move.to,
    userId: p.userId,
    note,
    cause: move.cause,
    // The owner hears at once that the parts are in, only when that is what moved the job.
    alert: move.cause === "part_received" && move.to === "in_progress" ? "parts_in" : undefined,
  });
  if (!moved) return null;
  await recordEvent(tx, { shopId: p.shopId, jobId: p.jobId, kind: "status_moved", actorUserId: p.userId, ownerVisible: true, payload: { from: status, to: move.to, cause: move.cause } });
  return move;
}

/** The facts of one job read on the pool, for pages (the owner's "where it stands"). */
export function jobFacts(key: JobKey): Promise<JobFacts> {
  return readJobFacts(db(), key);
}

export type FindingClearance = { id: number; title: string; state: "not_sent" | "waiting" | "approved" | "declined" };

/** A job's findings and where each stands with the owner: what a part can be "for". */
export async function listFindingClearance({ shopId, jobId }: JobKey, k: Knex = db()): Promise<FindingClearance[]> {
  const rows: { id: number; title: string; open: number | string | null; approved: number | string | null; answered: number | string | null }[] = await k("findings as f")
    .leftJoin("approval_requests as r", function () {
      this.on("r.finding_id", "=", "f.id").andOn("r.shop_id", "=", "f.shop_id");
    })
    .leftJoin("approval_decisions as d", "d.request_id", "r.id")
    .leftJoin("approval_decision_lines as l", function () {
      this.on("l.decision_id", "=", "d.id").andOnVal("l.answer", "=", "approved");
    })
    .where({ "f.shop_id": shopId, "f.job_id": jobId })
    .groupBy("f.id", "f.title")
    .orderBy("f.id")
    .select("f.id", "f.title", k.raw("SUM(r.status = 'sent') AS open"), k.raw("COUNT(l.id) AS approved"), k.raw("SUM(r.status = 'answered') AS answered"));
  return rows.map((r) => ({
    id: Number(r.id),
    title: String(r.title),
    state: Number(r.approved) > 0 ? "approved" : Number(r.open) > 0 ? "waiting" : Number(r.answered) > 0 ? "declined" : "not_sent",
  }));
}

/**
 * After a reassembly tick: when every step logged coming apart is ticked back together, the job
 * is ready (if nothing else is awaited). Its own transaction, read after the tick committed.
 */
export async function settleReassembly(p: JobKey & { userId: number }): Promise<Move | null> {
  return transaction(async (tx) => {
    await lockJobRow(tx, p);
    const row = await tx("teardown_steps").where({ shop_id: p.shopId, job_id: p.jobId }).whereNull("deleted_at").count({ total: "*" }).sum({ done: tx.raw("checked_at IS NOT NULL") }).first();
    const total = Number(row?.total ?? 0);
    if (total === 0 || Number(row?.done ?? 0) < total) return null;
    return applyJobEvent(tx, { shopId: p.shopId, jobId: p.jobId, userId: p.userId, event: { kind: "reassembly_finished" } });
  });
}

/** When the job was last moved to collected, or null. */
export async function collectedAt({ shopId, jobId }: JobKey, k: Knex = db()): Promise<Date | null> {
  const row = await k("job_status_changes").where({ shop_id: shopId, job_id: jobId, to_status: "picked_up" }).orderBy("id", "desc").first("changed_at");
  return row ? new Date(row.changed_at) : null;
}
