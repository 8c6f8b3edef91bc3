import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import { insertEntry } from "@/db/queries/entries";
import { lockJob, partBody, partsReceived, settleJob } from "@/db/queries/bench-parts";
import { clearedPartsQuery } from "@/db/queries/workflow";
import { transaction } from "@/db/transaction";
import { AppError } from "@/lib/errors";
import { PART_STATUS_LABEL, type PartStatus } from "@/lib/bench";
import type { JobStatus } from "@/lib/job-status";
import { recordInboxEvent } from "@/lib/server/inbox";
import { formatInvoiceNumber } from "@/lib/invoices";

// Supplier orders holding parts of one shop (issue 19), moving a received part to another job,
// and cores. Every change to a part writes its history row and a shop-only timeline entry on its
// job, and settles the job's waiting-on-parts state in the same transaction. Jobs are locked in id
// order so two orders touching the same jobs queue instead of deadlocking.

type ShopUser = { shopId: number; userId: number };
export type PartKey = { id: number; job_id: number; status: PartStatus; description: string; part_number: string | null; qty_thousandths: number; expected_on: string | null };
export type JobMoves = { jobId: number; movedTo: JobStatus }[];

export const snap = (r: PartKey, expectedOn = r.expected_on) => ({ description: String(r.description), partNumber: r.part_number ?? null, qtyThousandths: Number(r.qty_thousandths), expectedOn: expectedOn ?? null });

export async function lockJobs(tx: Knex.Transaction, shopId: number, jobIds: number[]) {
  for (const jobId of [...new Set(jobIds)].sort((a, b) => a - b)) await lockJob(tx, { shopId, jobId });
}

/** One part moved from `from` to `to` with its history, entry and (when it came in) the desk's inbox line. */
async function movePart(tx: Knex.Transaction, p: ShopUser & { part: PartKey; to: PartStatus; note: string; expectedOn?: string | null; set?: Record<string, unknown> }) {
  const expectedOn = p.expectedOn !== undefined ? p.expectedOn : p.part.expected_on;
  await tx("job_parts")
    .where({ id: p.part.id, shop_id: p.shopId })
    .update({ status: p.to, expected_on: expectedOn, updated_at: tx.fn.now(3), ...p.set });
  await tx("job_part_events").insert({ shop_id: p.shopId, part_id: p.part.id, from_status: p.part.status, to_status: p.to, changed_by_user_id: p.userId, note: p.note });
  const key = { shopId: p.shopId, jobId: Number(p.part.job_id) };
  await insertEntry(tx, { ...key, kind: "part", authorId: p.userId, body: partBody(snap(p.part, expectedOn), "status", p.part.status, p.to) });
  if (p.to === "received") await recordInboxEvent(tx, partsReceived({ ...key, userId: p.userId }, snap(p.part), p.part.id));
}

export async function settleAll(tx: Knex.Transaction, p: ShopUser, changed: { jobId: number; partId: number; to: PartStatus }[]): Promise<JobMoves> {
  const moves: JobMoves = [];
  for (const c of changed) {
    const movedTo = await settleJob(tx, { shopId: p.shopId, jobId: c.jobId, userId: p.userId, partId: c.partId, partTo: c.to });
    if (movedTo) moves.push({ jobId: c.jobId, movedTo });
  }
  return moves;
}

/** Puts parts that are still "needed" on one supplier order; they become "On order". */
export async function createPartOrder(
  p: ShopUser & { jobId: number | null; supplier: string; reference: string | null; orderedOn: string; expectedOn: string | null; partIds: number[] },
): Promise<{ id: number; jobMoves: JobMoves }> {
  if (!p.partIds.length) throw new AppError("invalid", "Choose at least one part for the order.", { parts: ["Choose at least one part."] });
  const scope = p.jobId === null ? { shop_id: p.shopId } : { shop_id: p.shopId, job_id: p.jobId };
  return transaction(async (tx) => {
    const peek: { job_id: number }[] = await tx("job_parts").where(scope).whereIn("id", p.partIds).select("job_id");
    await lockJobs(tx, p.shopId, peek.map((r) => Number(r.job_id)));
    const parts: PartKey[] = await tx("job_parts").where(scope).whereIn("id", p.partIds).forUpdate().select();
    if (parts.length !== new Set(p.partIds).size) {
      const where = p.jobId === null ? "this shop" : "this job";
      throw new AppError("invalid", `One of those parts isn't on ${where}.`, { parts: [`Choose parts of ${where}.`] });
    }
    // Migration 30: a part whose priced line the owner declined never goes on an order.
    const declined = (parts as (PartKey & { owner_answer?: string | null })[]).find((r) => r.owner_answer === "declined");
    if (declined) throw new AppError("conflict", `The owner declined "${declined.description}", so it isn't ordered.`);
    const late = parts.find((r) => r.status !== "needed");
    if (late) throw new AppError("conflict", `"${late.description}" is already "${PART_STATUS_LABEL[late.status]}". Only needed parts go on an order.`);
    const [id] = await tx("part_orders").insert({ shop_id: p.shopId, supplier: p.supplier, reference: p.reference, ordered_on: p.orderedOn, expected_on: p.expectedOn, created_by_user_id: p.userId });
    const note = p.reference ? `Ordered from ${p.supplier}, ref. ${p.reference}` : `Ordered from ${p.supplier}`;
    for (const part of parts) {
      await movePart(tx, { ...p, part, to: "ordered", note, expectedOn: p.expectedOn, set: { order_id: Number(id), supplier: p.supplier } });
    }
    return { id: Number(id), jobMoves: await settleAll(tx, p, parts.map((r) => ({ jobId: Number(r.job_id), partId: Number(r.id), to: "ordered" as const }))) };
  });
}

/**
 * The order came in: its parts still "On order" become "Arrived" (back-ordered ones stay, they
 * didn't come). The order counts as received once none of its parts is awaited any more.
 */
export async function receivePartOrder(p: ShopUser & { orderId: number }): Promise<{ received: number; stillAwaited: number; jobMoves: JobMoves }> {
  return transaction(async (tx) => {
    const order = await tx("part_orders").where({ id: p.orderId, shop_id: p.shopId }).first("id");
    if (!order) throw new AppError("not_found", "No such order.");
    const peek: { job_id: number }[] = await tx("job_parts").where({ shop_id: p.shopId, order_id: p.orderId }).select("job_id");
    await lockJobs(tx, p.shopId, peek.map((r) => Number(r.job_id)));
    await tx("part_orders").where({ id: p.orderId }).forUpdate().first("id");
    const parts: PartKey[] = await tx("job_parts").where({ shop_id: p.shopId, order_id: p.orderId }).forUpdate().select();
    const coming = parts.filter((r) => r.status === "ordered");
    const stillAwaited = parts.filter((r) => r.status === "back_ordered").length;
    if (!coming.length) throw new AppError("conflict", stillAwaited ? "The parts left on this order are back-ordered: receive each when it comes." : "Nothing on this order is still awaited.");
    for (const part of coming) await movePart(tx, { ...p, part, to: "received", note: "Received with its order" });
    if (!stillAwaited) await tx("part_orders").where({ id: p.orderId }).update({ received_at: tx.fn.now(3) });
    const jobMoves = await settleAll(tx, p, coming.map((r) => ({ jobId: Number(r.job_id), partId: Number(r.id), to: "received" as const })));
    return { received: coming.length, stillAwaited, jobMoves };
  });
}

/** A part on order is back-ordered by the supplier: it stays awaited, with the new date. */
export async function backOrderPart(p: ShopUser & { jobId: number; partId: number; expectedOn: string | null }): Promise<void> {
  await transaction(async (tx) => {
    await lockJob(tx, { shopId: p.shopId, jobId: p.jobId });
    const part: PartKey | undefined = await tx("job_parts").where({ id: p.partId, shop_id: p.shopId, job_id: p.jobId }).forUpdate().first();
    if (!part) throw new AppError("not_found", "That part isn't on this job.");
    if (part.status !== "ordered" && part.status !== "back_ordered") {
      throw new AppError("conflict", `Only a part on order can be back-ordered; this one is "${PART_STATUS_LABEL[part.status]}".`);
    }
    // A second back-order (a new date again) keeps its own history row, with the date.
    await movePart(tx, { ...p, part, to: "back_ordered", note: p.expectedOn ? `Back-ordered, now expected ${p.expectedOn}` : "Back-ordered, no date yet", expectedOn: p.expectedOn });
  });
}

/** Sets (or clears, with null) the core charge on a part; not once the core went back. */
export async function setCoreCharge(p: ShopUser & { jobId: number; partId: number; chargeMinor: number | null }): Promise<void> {
  const n = await db()("job_parts").where({ id: p.partId, shop_id: p.shopId, job_id: p.jobId }).whereNull("core_returned_at").update({ core_charge_minor: p.chargeMinor, updated_at: db().fn.now(3) });
  if (!n) throw new AppError("conflict", "That part isn't on this job, or its core has already gone back.");
}

/** The old part went back to the supplier: its core charge is refunded (a credit on the invoice). */
export async function returnCore(p: ShopUser & { jobId: number; partId: number }): Promise<void> {
  await transaction(async (tx) => {
    const part = await tx("job_parts").where({ id: p.partId, shop_id: p.shopId, job_id: p.jobId }).forUpdate().first("status", "description", "core_charge_minor", "core_returned_at");
    if (!part) throw new AppError("not_found", "That part isn't on this job.");
    if (part.core_charge_minor == null) throw new AppError("invalid", "This part has no core charge.");
    if (part.core_returned_at) throw new AppError("conflict", "The core has already gone back.");
    await tx("job_parts").where({ id: p.partId }).update({ core_returned_at: tx.fn.now(3) });
    // History only: the part's own status doesn't change when its core goes back.
    await tx("job_part_events").insert({ shop_id: p.shopId, part_id: p.partId, from_status: part.status, to_status: part.status, changed_by_user_id: p.userId, note: "Core returned" });
    // An invoice issued (or paid) with the charge and no credit can't take the credit line any more:
    // the owner is owed the charge back, and the desk is told so (cancel and reissue, or refund).
    const billed = await invoiceOwingCoreCredit(tx, { shopId: p.shopId, jobId: p.jobId, partId: p.partId });
    if (billed) {
      await recordInboxEvent(tx, {
        shopId: p.shopId,
        jobId: p.jobId,
        kind: "core_credit_owed",
        actorUserId: p.userId,
        summary: `Core of ${part.description} returned after invoice ${billed.number} was ${billed.status === "paid" ? "paid" : "issued"}: the owner is owed the core charge`,
        detail: billed.status === "paid" ? "Refund the core charge to the owner." : "Cancel the invoice and make it again to add the core credit, or refund the charge once it is paid.",
        amountMinor: billed.amountMinor,
        currency: billed.currency,
        extra: { part: p.partId, invoice: billed.publicId },
      });
    }
  });
}

/** The job's live invoice, issued or paid, that billed this part's core charge without its credit. */
async function invoiceOwingCoreCredit(tx: Knex.Transaction, p: { shopId: number; jobId: number; partId: number }) {
  const row = await tx("invoices as i")
    .join("invoice_lines as l", (j) => j.on("l.invoice_id", "i.id").andOn("l.shop_id", "i.shop_id"))
    .where({ "i.shop_id": p.shopId, "i.job_id": p.jobId, "l.source": "core_charge", "l.part_id": p.partId })
    .whereIn("i.status", ["issued", "paid"])
    .whereNotExists((q) => q.from("invoice_lines as c").whereRaw("c.invoice_id = i.id").where({ "c.source": "core_credit", "c.part_id": p.partId }))
    .first("i.public_id", "i.number", "i.status", "i.currency", "l.amount_minor");
  return row ? { publicId: String(row.public_id), number: formatInvoiceNumber(Number(row.number)), status: String(row.status), currency: String(row.currency), amountMinor: Number(row.amount_minor) } : null;
}

export type CoreRow = { partId: number; description: string; partNumber: string | null; status: PartStatus; chargeMinor: number; returned: boolean };

/** A job's core charges, for the invoice: each charge, and a credit of the same amount once returned. */
export async function listCores({ shopId, jobId }: { shopId: number; jobId: number }, k: Knex = db()): Promise<CoreRow[]> {
  const rows = await k("job_parts").where({ shop_id: shopId, job_id: jobId }).whereNotNull("core_charge_minor").orderBy("id").select("id", "description", "part_number", "status", "core_charge_minor", "core_returned_at");
  return rows.map((r) => ({ partId: Number(r.id), description: String(r.description), partNumber: r.part_number ?? null, status: r.status, chargeMinor: Number(r.core_charge_minor), returned: r.core_returned_at != null }));
}

export type OwnerPartWait = { description: string; status: "ordered" | "back_ordered"; expectedOn: string | null };

/** What the owner may hear of parts on the way: only parts for cleared work (approved, or booked in as needing no OK). */
export async function ownerPartWaits(key: { shopId: number; jobId: number }, k: Knex = db()): Promise<OwnerPartWait[]> {
  const rows = await clearedPartsQuery(k, key).whereIn("p.status", ["ordered", "back_ordered"]).orderBy("p.id").select("p.description", "p.status", "p.expected_on");
  return rows.map((r) => ({ description: String(r.description), status: r.status, expectedOn: r.expected_on ?? null }));
}

/** Marks a part as special-order (a deposit is usually asked before ordering it). */
export async function setSpecialOrder(p: { shopId: number; jobId: number; partId: number; special: boolean }): Promise<void> {
  const n = await db()("job_parts").where({ id: p.partId, shop_id: p.shopId, job_id: p.jobId }).update({ special_order: p.special, updated_at: db().fn.now(3) });
  if (!n) throw new AppError("not_found", "That part isn't on this job.");
}

/** The part a deposit is asked for, locked in the deposit's transaction; refuses a part with an open or paid deposit. */
export async function lockPartForDeposit(tx: Knex.Transaction, p: { shopId: number; jobId: number; partId: number }) {
  const part = await tx("job_parts as p")
    .leftJoin("deposit_requests as d", "d.id", "p.deposit_id")
    .where({ "p.id": p.partId, "p.shop_id": p.shopId, "p.job_id": p.jobId })
    .forUpdate()
    .first("p.description", "p.status", "p.special_order", "d.status as deposit_status");
  if (!part) throw new AppError("not_found", "That part isn't on this job.");
  if (!part.special_order) throw new AppError("invalid", "Mark the part as special-order first: deposits here are for special-order parts.");
  if (part.status !== "needed") throw new AppError("conflict", "A deposit is asked before the part is ordered; this one is already past that.");
  if (part.deposit_status === "open" || part.deposit_status === "paid") throw new AppError("conflict", `A deposit for this part is already ${part.deposit_status === "paid" ? "paid" : "asked for"}.`);
  return { description: String(part.description) };
}

/** A part's quantity and unit sell price (migration 30), for a deposit asked at the sell price. */
export async function getPartPrice(p: { shopId: number; jobId: number; partId: number }): Promise<{ qtyThousandths: number; sellMinor: number | null } | null> {
  const r = await db()("job_parts").where({ id: p.partId, shop_id: p.shopId, job_id: p.jobId }).first("qty_thousandths", "sell_minor");
  return r ? { qtyThousandths: Number(r.qty_thousandths), sellMinor: r.sell_minor == null ? null : Number(r.sell_minor) } : null;
}

/** The special-order part each of a job's deposit requests was asked for, by deposit id. */
export async function depositParts({ shopId, jobId }: { shopId: number; jobId: number }, k: Knex = db()): Promise<Map<number, string>> {
  const rows = await k("job_parts").where({ shop_id: shopId, job_id: jobId }).whereNotNull("deposit_id").select("deposit_id", "description");
  return new Map(rows.map((r) => [Number(r.deposit_id), String(r.description)]));
}

export async function linkPartDeposit(tx: Knex.Transaction, p: { shopId: number; partId: number; depositId: number }): Promise<void> {
  await tx("job_parts").where({ id: p.partId, shop_id: p.shopId }).update({ deposit_id: p.depositId });
}

export type OnOrderRow = {
  partId: number;
  description: string;
  partNumber: string | null;
  status: "ordered" | "back_ordered";
  supplier: string | null;
  reference: string | null;
  orderId: number | null;
  expectedOn: string | null;
  late: boolean;
  jobNumber: number;
  jobPublicId: string;
};

/**
 * Parts on order or back-ordered across the shop: late ones first (expected before `today`, the
 * shop's calendar day), then by expected date (undated last), then oldest first. One query per
 * page, whatever the page size: limit + 1 tells whether there is a next page.
 */
export async function listPartsOnOrder(p: { shopId: number; today: string; page: number; pageSize: number }, k: Knex = db()): Promise<{ rows: OnOrderRow[]; hasMore: boolean }> {
  const rows = await k("job_parts as p")
    .join("jobs as j", function () {
      this.on("j.id", "=", "p.job_id").andOn("j.shop_id", "=", "p.shop_id");
    })
    .leftJoin("part_orders as o", "o.id", "p.order_id")
    .where("p.shop_id", p.shopId)
    .whereIn("p.status", ["ordered", "back_ordered"])
    .select("p.id", "p.description", "p.part_number", "p.status", "p.supplier", "p.expected_on", "p.order_id", "o.reference", "j.number", "j.public_id")
    .select(k.raw("(p.expected_on is not null and p.expected_on < ?) as late", [p.today]))
    .orderByRaw("late desc, p.expected_on is null, p.expected_on asc, p.id asc")
    .limit(p.pageSize + 1)
    .offset((p.page - 1) * p.pageSize);
  return {
    hasMore: rows.length > p.pageSize,
    rows: rows.slice(0, p.pageSize).map((r) => ({
      partId: Number(r.id),
      description: String(r.description),
      partNumber: r.part_number ?? null,
      status: r.status,
      supplier: r.supplier ?? null,
      reference: r.reference ?? null,
      orderId: r.order_id == null ? null : Number(r.order_id),
      expectedOn: r.expected_on ?? null,
      late: Boolean(Number(r.late)),
      jobNumber: Number(r.number),
      jobPublicId: String(r.public_id),
    })),
  };
}

export type PartOrderFacts = { partId: number; reference: string | null; coreChargeMinor: number | null; coreReturned: boolean; specialOrder: boolean; depositStatus: "open" | "paid" | "cancelled" | null; lastNote: string | null };

/** The ordering side of a job's parts, for the bench page: one query. */
export async function listPartOrderFacts({ shopId, jobId }: { shopId: number; jobId: number }, k: Knex = db()): Promise<PartOrderFacts[]> {
  const rows = await k("job_parts as p")
    .leftJoin("part_orders as o", "o.id", "p.order_id")
    .leftJoin("deposit_requests as d", "d.id", "p.deposit_id")
    .where({ "p.shop_id": shopId, "p.job_id": jobId })
    .orderBy("p.id")
    .select("p.id", "o.reference", "p.core_charge_minor", "p.core_returned_at", "p.special_order", "d.status as deposit_status")
    .select(k.raw("(select ev.note from job_part_events ev where ev.part_id = p.id and ev.note is not null order by ev.id desc limit 1) as last_note"));
  return rows.map((r) => ({
    partId: Number(r.id),
    reference: r.reference ?? null,
    coreChargeMinor: r.core_charge_minor == null ? null : Number(r.core_charge_minor),
    coreReturned: r.core_returned_at != null,
    specialOrder: Boolean(r.special_order),
    depositStatus: r.deposit_status ?? null,
    lastNote: r.last_note ?? null,
  }));
}
