import "server-only";
import type { Knex } from "knex";
import { insertEntry } from "@/db/queries/entries";
import { partBody } from "@/db/queries/bench-parts";
import { type JobMoves, type PartKey, lockJobs, settleAll, snap } from "@/db/queries/part-orders";
import { withdrawLine } from "@/db/queries/parts-pricing";
import { transaction } from "@/db/transaction";
import { AppError } from "@/lib/errors";
import { OUTSTANDING_PART_STATUSES, PART_STATUS_LABEL } from "@/lib/bench";

// A part that arrived for one job goes to another job of the same shop (issue 19): the other job
// needs it sooner. What the first job does then:
// - "needs": it still needs one: a new "Needed" part for the same work is added to it;
// - "swap": the other job's awaited part like this one (same part number, or same description)
//   comes to the first job instead (its order now arrives for the first job), and the moved part
//   takes its place on the other job, for the same work;
// - "done": nothing more is awaited (the first job no longer needs it). A priced line the part was
//   for is withdrawn on the first job (who, when, why): its owner isn't billed for a part that
//   isn't in their machine, though their answer stays on record.
// Both jobs keep a history row and a timeline entry, and both settle their waiting-on-parts state.

export type AfterMove = "needs" | "swap" | "done";
type Row = PartKey & {
  supplier: string | null;
  finding_id: number | null;
  no_ok_needed: number | boolean;
  // Migration 30: the priced finding line the part is for, the owner's answer to it and its price.
  finding_line_id: number | null;
  owner_answer: "pending" | "approved" | "declined" | null;
  sell_minor: number | null;
  price_reason: string | null;
};

/** What work a part is for: it goes with the need, not with the physical part, when parts swap jobs. */
const workOf = (r: Row) => ({
  finding_id: r.finding_id,
  no_ok_needed: Boolean(r.no_ok_needed),
  finding_line_id: r.finding_line_id,
  owner_answer: r.owner_answer,
  sell_minor: r.sell_minor,
  price_reason: r.price_reason,
});

async function awaitedLike(tx: Knex.Transaction, p: { shopId: number; jobId: number }, part: Row): Promise<Row> {
  const q = tx("job_parts").where({ shop_id: p.shopId, job_id: p.jobId }).whereIn("status", OUTSTANDING_PART_STATUSES);
  if (part.part_number) q.where("part_number", part.part_number);
  else q.whereRaw("lower(description) = lower(?)", [part.description]);
  const like: Row | undefined = await q.orderBy("id").forUpdate().first();
  if (!like) throw new AppError("invalid", `That job has no awaited part like “${part.description}” to swap with.`, { thisJob: ["Choose another way: that job awaits no such part."] });
  return like;
}

export async function movePartToJob(
  p: { shopId: number; userId: number; partId: number; fromJobId: number; toJobId: number; forWork: { findingId: number | null; noOkNeeded: boolean }; thisJob: AfterMove; fromNumber: string; toNumber: string },
): Promise<{ newPartId: number | null; swappedPartId: number | null; jobMoves: JobMoves }> {
  if (p.fromJobId === p.toJobId) throw new AppError("invalid", "Choose another job.", { toJob: ["Choose another job of the shop."] });
  return transaction(async (tx) => {
    await lockJobs(tx, p.shopId, [p.fromJobId, p.toJobId]);
    const part: Row | undefined = await tx("job_parts").where({ id: p.partId, shop_id: p.shopId, job_id: p.fromJobId }).forUpdate().first();
    if (!part) throw new AppError("not_found", "That part isn't on this job.");
    if (part.status !== "received") throw new AppError("conflict", `Only a part that has arrived can go to another job; this one is "${PART_STATUS_LABEL[part.status]}".`);
    const swapped = p.thisJob === "swap" ? await awaitedLike(tx, { shopId: p.shopId, jobId: p.toJobId }, part) : null;
    // On the other job the part is for the work the swapped part was for, or the work named (then
    // it is tied to no priced line there: its line, if any, stays with the first job's need).
    if (!swapped && p.forWork.findingId !== null) {
      const finding = await tx("findings").where({ id: p.forWork.findingId, shop_id: p.shopId, job_id: p.toJobId }).first("id");
      if (!finding) throw new AppError("invalid", "That finding isn't on the other job.", { forWork: ["Choose a finding of the job the part goes to."] });
    }
    const named = { finding_id: p.forWork.findingId, no_ok_needed: p.forWork.noOkNeeded, finding_line_id: null, owner_answer: null, sell_minor: null, price_reason: null };
    // finding_line_id is unique: the moved part lets go of its line before another part takes it.
    await tx("job_parts").where({ id: p.partId }).update({ finding_line_id: null });
    if (swapped) await tx("job_parts").where({ id: swapped.id }).update({ finding_line_id: null });
    await tx("job_parts").where({ id: p.partId }).update({ job_id: p.toJobId, ...(swapped ? workOf(swapped) : named), updated_at: tx.fn.now(3) });
    await tx("job_part_events").insert({ shop_id: p.shopId, part_id: p.partId, from_status: "received", to_status: "received", changed_by_user_id: p.userId, note: `Moved from job ${p.fromNumber} to job ${p.toNumber}` });
    const body = partBody(snap(part), "status", "received", "received");
    await insertEntry(tx, { shopId: p.shopId, jobId: p.fromJobId, kind: "part", authorId: p.userId, body: { ...body, movedTo: p.toNumber } });
    await insertEntry(tx, { shopId: p.shopId, jobId: p.toJobId, kind: "part", authorId: p.userId, body: { ...body, movedFrom: p.fromNumber } });

    let newPartId: number | null = null;
    if (swapped) {
      await tx("job_parts")
        .where({ id: swapped.id })
        .update({ job_id: p.fromJobId, ...workOf(part), updated_at: tx.fn.now(3) });
      const note = `Swapped: now for job ${p.fromNumber}, whose part went to job ${p.toNumber}`;
      await tx("job_part_events").insert({ shop_id: p.shopId, part_id: swapped.id, from_status: swapped.status, to_status: swapped.status, changed_by_user_id: p.userId, note });
      const swapBody = partBody(snap(swapped), "status", swapped.status, swapped.status);
      await insertEntry(tx, { shopId: p.shopId, jobId: p.toJobId, kind: "part", authorId: p.userId, body: { ...swapBody, movedTo: p.fromNumber } });
      await insertEntry(tx, { shopId: p.shopId, jobId: p.fromJobId, kind: "part", authorId: p.userId, body: { ...swapBody, movedFrom: p.toNumber } });
    } else if (p.thisJob === "needs") {
      const [id] = await tx("job_parts").insert({
        shop_id: p.shopId,
        job_id: p.fromJobId,
        part_number: part.part_number,
        description: part.description,
        supplier: part.supplier,
        qty_thousandths: part.qty_thousandths,
        status: "needed",
        ...workOf(part),
        created_by_user_id: p.userId,
      });
      newPartId = Number(id);
      await tx("job_part_events").insert({ shop_id: p.shopId, part_id: newPartId, from_status: null, to_status: "needed", changed_by_user_id: p.userId, note: `Replaces the part moved to job ${p.toNumber}` });
      await insertEntry(tx, { shopId: p.shopId, jobId: p.fromJobId, kind: "part", authorId: p.userId, body: partBody(snap(part, null), "added", null, "needed") });
    } else if (part.finding_line_id !== null) {
      await withdrawLine(tx, { shopId: p.shopId, lineId: Number(part.finding_line_id), userId: p.userId, reason: `Its part went to job ${p.toNumber}; this job no longer needs it.` });
    }
    const awaitedOnFirst = swapped ? Number(swapped.id) : newPartId;
    const jobMoves = await settleAll(tx, p, [
      ...(awaitedOnFirst ? [{ jobId: p.fromJobId, partId: awaitedOnFirst, to: swapped ? swapped.status : ("needed" as const) }] : []),
      { jobId: p.toJobId, partId: p.partId, to: "received" as const },
    ]);
    return { newPartId, swappedPartId: swapped ? Number(swapped.id) : null, jobMoves };
  });
}
