import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import type { JobPartsTable } from "@/db/tables";
import { AppError } from "@/lib/errors";
import type { LineAnswer } from "@/lib/approvals";
import { type MarkupRule, NO_MARKUP, asMarkupRule } from "@/lib/parts-pricing";
import type { PartStatus } from "@/lib/bench";

// Issue 19: the job's parts as the priced finding lines see them (migration 30). A part line of a
// finding creates or picks one job part (job_parts.finding_line_id); sending a request records
// which finding line each snapshot line came from (approval_requests.line_ids), so the owner's
// answer to a line reaches its part; the invoice asks which part an approved line is.

type JobKey = { shopId: number; jobId: number };
const json = (v: unknown): unknown => (typeof v === "string" ? JSON.parse(v) : (v ?? null));

export async function getMarkupRule({ shopId }: { shopId: number }, k: Knex = db()): Promise<MarkupRule> {
  const row = await k("shop_parts_markup").where({ shop_id: shopId }).first("rule");
  return row ? asMarkupRule(row.rule) : NO_MARKUP;
}

export async function saveMarkupRule({ shopId, rule }: { shopId: number; rule: MarkupRule }, k: Knex = db()): Promise<void> {
  const row = { rule: JSON.stringify(rule), updated_at: k.fn.now() };
  await k("shop_parts_markup").insert({ shop_id: shopId, ...row }).onConflict("shop_id").merge(row);
}

/** What a finding line's part holds that the line itself doesn't: its cost and the price's reason. */
export type LinePartPrice = { partId: number; costMinor: number | null; sellMinor: number | null; priceReason: string | null };

/** The parts of a finding's lines, by finding line id. */
export async function partsOfFindingLines({ shopId, lineIds }: { shopId: number; lineIds: number[] }, k: Knex = db()): Promise<Map<number, LinePartPrice>> {
  if (!lineIds.length) return new Map();
  const rows: Pick<JobPartsTable, "id" | "finding_line_id" | "cost_minor" | "sell_minor" | "price_reason">[] = await k("job_parts")
    .where("shop_id", shopId)
    .whereIn("finding_line_id", lineIds)
    .select("id", "finding_line_id", "cost_minor", "sell_minor", "price_reason");
  return new Map(rows.map((r) => [Number(r.finding_line_id), { partId: Number(r.id), costMinor: r.cost_minor == null ? null : Number(r.cost_minor), sellMinor: r.sell_minor == null ? null : Number(r.sell_minor), priceReason: r.price_reason ?? null }]));
}

/** The stored unit costs of some parts of a job (a line picking a part keeps the part's cost). */
export async function partCosts({ shopId, jobId, ids }: JobKey & { ids: number[] }, k: Knex = db()): Promise<Map<number, number | null>> {
  if (!ids.length) return new Map();
  const rows = await k("job_parts").where({ shop_id: shopId, job_id: jobId }).whereIn("id", ids).select("id", "cost_minor");
  return new Map(rows.map((r) => [Number(r.id), r.cost_minor == null ? null : Number(r.cost_minor)]));
}

export type PickablePart = { id: number; description: string; partNumber: string | null };

/** Parts of a job that no line stands for yet (added on the bench): what a part line may pick. */
export async function listPickableParts({ shopId, jobId }: JobKey, k: Knex = db()): Promise<PickablePart[]> {
  const rows = await k("job_parts").where({ shop_id: shopId, job_id: jobId }).whereNull("finding_line_id").whereNull("owner_answer").orderBy("id").select("id", "description", "part_number");
  return rows.map((r) => ({ id: Number(r.id), description: String(r.description), partNumber: r.part_number ?? null }));
}

/**
 * A saved part line of a finding, as its part should read. `pickPartId`: link this existing job part
 * (a saved line linked to another one re-points to it); `newPart`: a saved line stands for a new part.
 */
export type LinePart = {
  lineId: number;
  description: string;
  partNumber: string | null;
  qtyThousandths: number;
  costMinor: number | null;
  sellMinor: number | null;
  priceReason: string | null;
  pickPartId: number | null;
  newPart: boolean;
  /** The line's place in the finding's lines (0-based), to name the form field of a refusal. */
  position: number;
};

/**
 * A part a line lets go of: dropped while it is still only a proposal that was never ordered,
 * otherwise unlinked (it then holds nothing and shows as for no named work).
 */
async function releaseParts(tx: Knex.Transaction, parts: Knex.QueryBuilder) {
  await parts.clone().where("status", "needed").delete();
  await parts.clone().update({ finding_line_id: null, finding_id: null, owner_answer: null, no_ok_needed: false, updated_at: tx.fn.now(3) });
}

const ANSWERED = "The owner has answered for this line's part, so the line can't stand for another part now. Draft a new finding for more work.";

/**
 * Brings the finding's parts in line with its part lines, in the finding's save transaction (job
 * row order: the caller holds the finding's lock; parts are only ever touched under it here). A
 * part whose line went away (removed, or no longer a part) is dropped while it is still only
 * needed, and otherwise unlinked: it then holds nothing and shows as for no named work.
 */
export async function syncLineParts(tx: Knex.Transaction, p: JobKey & { findingId: number; userId: number; lines: LinePart[] }): Promise<void> {
  const keep = p.lines.map((l) => l.lineId);
  await releaseParts(
    tx,
    tx("job_parts")
      .where({ shop_id: p.shopId, job_id: p.jobId, finding_id: p.findingId, owner_answer: "pending" })
      .where((w) => w.whereNull("finding_line_id").orWhereNotIn("finding_line_id", keep.length ? keep : [0])),
  );
  for (const line of p.lines) {
    const fields = { description: line.description, part_number: line.partNumber, qty_thousandths: line.qtyThousandths, cost_minor: line.costMinor, sell_minor: line.sellMinor, price_reason: line.priceReason, updated_at: tx.fn.now(3) };
    const linked: { id: number; owner_answer: JobPartsTable["owner_answer"] } | undefined = await tx("job_parts").where({ shop_id: p.shopId, finding_line_id: line.lineId }).forUpdate().first("id", "owner_answer");
    const repoint = linked && (line.newPart || (line.pickPartId !== null && line.pickPartId !== Number(linked.id)));
    if (linked && !repoint) {
      await tx("job_parts").where({ id: linked.id }).update(fields);
      continue;
    }
    if (linked) {
      // Before the owner answers, a line may stand for another of the job's parts, or a new one.
      if (linked.owner_answer !== "pending") throw new AppError("conflict", ANSWERED, { [`lines.${line.position}.partId`]: [ANSWERED] });
      await releaseParts(tx, tx("job_parts").where({ id: linked.id }));
    }
    if (line.pickPartId !== null) {
      const n = await tx("job_parts")
        .where({ id: line.pickPartId, shop_id: p.shopId, job_id: p.jobId })
        .whereNull("finding_line_id")
        .where((w) => w.whereNull("owner_answer").orWhereNot("owner_answer", "declined"))
        .update({ ...fields, finding_line_id: line.lineId, finding_id: p.findingId, owner_answer: "pending", no_ok_needed: false });
      if (n !== 1) throw new AppError("invalid", "That part is already on another line, or isn't on this job.", { [`lines.${line.position}.partId`]: ["Pick a part of this job that no other line uses, or leave it to make a new one."] });
      continue;
    }
    const status: PartStatus = "needed";
    const [id] = await tx("job_parts").insert({ shop_id: p.shopId, job_id: p.jobId, ...fields, status, finding_line_id: line.lineId, finding_id: p.findingId, owner_answer: "pending", no_ok_needed: false, created_by_user_id: p.userId });
    await tx("job_part_events").insert({ shop_id: p.shopId, part_id: id, from_status: null, to_status: status, changed_by_user_id: p.userId });
  }
}

/** Which finding line each line of a request's snapshot came from (in snapshot order). */
export async function recordRequestLines(tx: Knex.Transaction, { shopId, requestId, lineIds }: { shopId: number; requestId: number; lineIds: number[] }): Promise<void> {
  await tx("approval_requests").where({ shop_id: shopId, id: requestId }).update({ line_ids: JSON.stringify(lineIds) });
}

/**
 * The owner's answers reach the lines' parts: approved makes a part count as needed (it may wait
 * the job), declined leaves it out for good. Call before the job's workflow event, in the same
 * transaction, so the move reads the parts as answered.
 */
export async function answerLineParts(tx: Knex.Transaction, p: JobKey & { requestId: number; answers: Record<number, LineAnswer> }): Promise<number> {
  const row = await tx("approval_requests").where({ shop_id: p.shopId, id: p.requestId }).first("line_ids");
  const ids = json(row?.line_ids) as number[] | null;
  if (!ids) return 0;
  let changed = 0;
  for (const [no, answer] of Object.entries(p.answers)) {
    const lineId = ids[Number(no) - 1];
    if (lineId == null) continue;
    changed += await tx("job_parts")
      .where({ shop_id: p.shopId, job_id: p.jobId, finding_line_id: lineId, owner_answer: "pending" })
      .update({ owner_answer: answer, updated_at: tx.fn.now(3) });
  }
  return changed;
}

export type RequestLinePart = { partId: number; description: string; status: PartStatus; ownerAnswer: JobPartsTable["owner_answer"] };
/** A line taken off after the owner's answer because its part left the job: who, when and why. */
export type LineWithdrawal = { reason: string; at: string; by: string | null };
export type RequestLineStates = { parts: Map<string, RequestLinePart>; withdrawn: Map<string, LineWithdrawal> };

/**
 * The part behind each request line of a job, and the lines withdrawn since, both keyed as
 * lib/server/authorised-work.ts lineKey ("publicId#no").
 */
export async function partsOfRequestLines({ shopId, jobId }: JobKey, k: Knex = db()): Promise<RequestLineStates> {
  const [requests, parts, withdrawn] = await Promise.all([
    k("approval_requests").where({ shop_id: shopId, job_id: jobId }).whereNotNull("line_ids").select("public_id", "line_ids"),
    k("job_parts").where({ shop_id: shopId, job_id: jobId }).whereNotNull("finding_line_id").select("id", "finding_line_id", "description", "status", "owner_answer"),
    k("finding_lines as l")
      .join("findings as f", "f.id", "l.finding_id")
      .leftJoin("users as u", "u.id", "l.withdrawn_by_user_id")
      .where({ "f.shop_id": shopId, "f.job_id": jobId })
      .whereNotNull("l.withdrawn_at")
      .select("l.id", "l.withdrawn_at", "l.withdrawn_reason", "u.name as by_name"),
  ]);
  const byLine = new Map(parts.map((r) => [Number(r.finding_line_id), { partId: Number(r.id), description: String(r.description), status: r.status as PartStatus, ownerAnswer: r.owner_answer ?? null }]));
  const gone = new Map<number, LineWithdrawal>(
    withdrawn.map((r) => [Number(r.id), { reason: String(r.withdrawn_reason ?? ""), at: new Date(r.withdrawn_at).toISOString(), by: r.by_name == null ? null : String(r.by_name) }]),
  );
  const out: RequestLineStates = { parts: new Map(), withdrawn: new Map() };
  for (const r of requests) {
    ((json(r.line_ids) as number[] | null) ?? []).forEach((lineId, i) => {
      const key = `${String(r.public_id)}#${i + 1}`;
      const w = gone.get(Number(lineId));
      if (w) out.withdrawn.set(key, w);
      const part = byLine.get(Number(lineId));
      if (part) out.parts.set(key, part);
    });
  }
  return out;
}

/**
 * Withdraws a priced line whose part left the job for good (lib/server/part-orders.ts movePart,
 * "this job no longer needs it"): the owner's answer stays on record, the line is no longer billed
 * nor counted in what was authorised. In the caller's transaction, under the job's lock.
 */
export async function withdrawLine(tx: Knex.Transaction, p: { shopId: number; lineId: number; userId: number; reason: string }): Promise<void> {
  await tx("finding_lines").where({ id: p.lineId, shop_id: p.shopId }).whereNull("withdrawn_at").update({ withdrawn_at: tx.fn.now(3), withdrawn_by_user_id: p.userId, withdrawn_reason: p.reason.slice(0, 300) });
}
