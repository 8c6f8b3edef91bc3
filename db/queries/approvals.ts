import "server-only";
import crypto from "node:crypto";
import type { Knex } from "knex";
import type { DecisionMethod, LineAnswer, LineKind, RequestSnapshot, RequestStatus } from "@/lib/approvals";
import { db } from "@/db/client";
import type { ApprovalDecisionsTable, ApprovalRequestsTable, PhotosTable } from "@/db/tables";

// Approval requests (frozen snapshots) and their one decision each. Writes take the caller's
// transaction so a request, its timeline entry, the status move and its e-mail commit together.

type JobKey = { shopId: number; jobId: number };
const num = (v: unknown) => (v == null ? null : Number(v));
const iso = (v: unknown) => (v == null ? null : (v as Date).toISOString());
const json = (v: unknown): unknown => (typeof v === "string" ? JSON.parse(v) : (v ?? null));

export function newRequestPublicId(): string {
  return crypto.randomBytes(12).toString("base64url");
}

export type RequestRow = {
  id: number;
  publicId: string;
  shopId: number;
  jobId: number;
  jobPublicId: string;
  customerUserId: number | null;
  findingId: number;
  version: number;
  status: RequestStatus;
  replacedBy: string | null;
  snapshot: RequestSnapshot;
  canonical: string;
  hash: string;
  currency: string;
  estimatePreTaxMinor: number;
  estimateTotalMinor: number;
  sentTo: string | null;
  sentBy: string | null;
  sentAt: string;
  openedAt: string | null;
  answeredAt: string | null;
  withdrawnAt: string | null;
};

const REQUEST_COLUMNS = ["r.*", "u.name as sent_by_name", "n.public_id as replaced_by_public_id", "j.public_id as job_public_id", "c.user_id as customer_user_id"];

function requests(k: Knex) {
  return k("approval_requests as r")
    .join("jobs as j", "j.id", "r.job_id")
    .join("customers as c", "c.id", "j.customer_id")
    .leftJoin("users as u", "u.id", "r.sent_by_user_id")
    .leftJoin("approval_requests as n", "n.id", "r.replaced_by_id");
}

/** A row of REQUEST_COLUMNS. */
type RequestJoin = ApprovalRequestsTable & { sent_by_name: string | null; replaced_by_public_id: string | null; job_public_id: string; customer_user_id: number | null };

function toRequest(r: RequestJoin): RequestRow {
  return {
    id: Number(r.id),
    publicId: String(r.public_id),
    shopId: Number(r.shop_id),
    jobId: Number(r.job_id),
    jobPublicId: String(r.job_public_id),
    customerUserId: num(r.customer_user_id),
    findingId: Number(r.finding_id),
    version: Number(r.version),
    status: r.status,
    replacedBy: r.replaced_by_public_id ?? null,
    snapshot: json(r.snapshot) as RequestSnapshot,
    canonical: String(r.canonical),
    hash: String(r.hash),
    currency: String(r.currency),
    estimatePreTaxMinor: Number(r.estimate_pre_tax_minor),
    estimateTotalMinor: Number(r.estimate_total_minor),
    sentTo: r.sent_to ?? null,
    sentBy: r.sent_by_name ?? null,
    sentAt: iso(r.sent_at)!,
    openedAt: iso(r.opened_at),
    answeredAt: iso(r.answered_at),
    withdrawnAt: iso(r.withdrawn_at),
  };
}

export async function getRequestByPublicId({ publicId }: { publicId: string }, k: Knex = db()): Promise<RequestRow | null> {
  const row: RequestJoin | undefined = await requests(k).where("r.public_id", publicId).first(REQUEST_COLUMNS);
  return row ? toRequest(row) : null;
}

/** The request row locked for this transaction: answers, withdrawals and revisions queue on it. */
export async function lockRequest(tx: Knex.Transaction, { shopId, id }: { shopId: number; id: number }): Promise<RequestRow | null> {
  await tx("approval_requests").where({ shop_id: shopId, id }).forUpdate().first("id");
  const row: RequestJoin | undefined = await requests(tx).where({ "r.shop_id": shopId, "r.id": id }).first(REQUEST_COLUMNS);
  return row ? toRequest(row) : null;
}

/** A job's requests, oldest first (a finding's versions in order). */
export async function listRequests({ shopId, jobId }: JobKey, k: Knex = db()): Promise<RequestRow[]> {
  const rows: RequestJoin[] = await requests(k).where({ "r.shop_id": shopId, "r.job_id": jobId }).orderBy("r.id").select(REQUEST_COLUMNS);
  return rows.map(toRequest);
}

/** The newest request of a finding (open, answered or withdrawn), locked when a transaction is given. */
export async function latestRequestOfFinding({ shopId, findingId }: { shopId: number; findingId: number }, k: Knex = db(), lock = false) {
  const q = k("approval_requests").where({ shop_id: shopId, finding_id: findingId }).orderBy("version", "desc").first("id", "public_id", "version", "status", "snapshot");
  const row = await (lock ? q.forUpdate() : q);
  return row ? { id: Number(row.id), publicId: String(row.public_id), version: Number(row.version), status: row.status, snapshot: json(row.snapshot) as RequestSnapshot } : null;
}

export async function insertRequest(
  tx: Knex.Transaction,
  r: JobKey & { publicId: string; findingId: number; version: number; snapshot: RequestSnapshot; canonical: string; hash: string; tokenHash: string; sentTo: string | null; userId: number },
): Promise<number> {
  const [id] = await tx("approval_requests").insert({
    public_id: r.publicId,
    shop_id: r.shopId,
    job_id: r.jobId,
    finding_id: r.findingId,
    version: r.version,
    snapshot: JSON.stringify(r.snapshot),
    canonical: r.canonical,
    hash: r.hash,
    token_hash: r.tokenHash,
    currency: r.snapshot.currency,
    estimate_pre_tax_minor: r.snapshot.totals.preTaxTotalMinor,
    estimate_tax_minor: r.snapshot.totals.taxMinor,
    estimate_total_minor: r.snapshot.totals.totalMinor,
    sent_to: r.sentTo,
    sent_by_user_id: r.userId,
  });
  return Number(id);
}

export async function markReplaced(tx: Knex.Transaction, { shopId, id, by }: { shopId: number; id: number; by: number }) {
  await tx("approval_requests").where({ shop_id: shopId, id, status: "sent" }).update({ status: "replaced", replaced_by_id: by });
}

export async function markWithdrawn(tx: Knex.Transaction, { shopId, id, userId }: { shopId: number; id: number; userId: number }) {
  await tx("approval_requests").where({ shop_id: shopId, id, status: "sent" }).update({ status: "withdrawn", withdrawn_at: tx.fn.now(3), withdrawn_by_user_id: userId });
}

/** The first time the owner opens the request; later visits keep the first time. */
export async function markOpened({ shopId, id }: { shopId: number; id: number }): Promise<void> {
  await db()("approval_requests").where({ shop_id: shopId, id }).whereNull("opened_at").update({ opened_at: db().fn.now(3) });
}

/** The photo behind an evidence thumbnail, if it is evidence of this request (and the e-mail token's request). */
export async function getEvidencePhoto({ requestId, photoPublicId }: { requestId: number; photoPublicId: string }) {
  const row: (Pick<ApprovalRequestsTable, "snapshot"> & Pick<PhotosTable, "thumb_key" | "display_key">) | undefined = await db()("approval_requests as r")
    .join("photos as p", function () {
      this.on("p.shop_id", "r.shop_id").andOn("p.job_id", "r.job_id");
    })
    .where({ "r.id": requestId, "p.public_id": photoPublicId })
    .first("r.snapshot", "p.thumb_key", "p.display_key");
  if (!row) return null;
  const snapshot = json(row.snapshot) as RequestSnapshot;
  if (!snapshot.evidence.some((e) => e.kind === "photo" && e.ref === photoPublicId)) return null;
  return { thumbKey: String(row.thumb_key), displayKey: String(row.display_key) };
}

export async function getRequestIdByTokenHash({ tokenHash }: { tokenHash: string }) {
  const row = await db()("approval_requests").where({ token_hash: tokenHash }).first("id", "public_id", "sent_at", "status");
  return row ? { id: Number(row.id), publicId: String(row.public_id), sentAt: row.sent_at, status: row.status } : null;
}

// ---- decisions -------------------------------------------------------------------------------------

export type DecisionLineRow = { no: number; answer: LineAnswer; kind: LineKind; description: string; partNumber: string | null; netMinor: number };
export type DecisionRow = {
  id: number;
  requestId: number;
  method: DecisionMethod;
  personName: string;
  signatureName: string | null;
  phoneCalled: string | null;
  note: string | null;
  wantsPartsBack: boolean;
  decidedAt: string;
  recordedAt: string;
  recordedBy: string | null;
  ip: string | null;
  userAgent: string | null;
  shownHash: string;
  estimatePreTaxMinor: number;
  estimateTotalMinor: number;
  authorisedPreTaxMinor: number;
  authorisedTaxMinor: number;
  authorisedTotalMinor: number;
  lines: DecisionLineRow[];
};

export type DecisionWrite = Omit<DecisionRow, "id" | "recordedAt" | "recordedBy" | "decidedAt" | "lines"> & {
  decidedAt: Date;
  recordedByUserId: number | null;
  lines: (DecisionLineRow & { qtyThousandths: number | null; hoursTenths: number | null; taxable: boolean })[];
};

/** Inserts the decision and its lines; a second decision for the request fails on the unique key. */
export async function insertDecision(tx: Knex.Transaction, d: JobKey & DecisionWrite): Promise<number> {
  const [id] = await tx("approval_decisions").insert({
    shop_id: d.shopId,
    job_id: d.jobId,
    request_id: d.requestId,
    method: d.method,
    person_name: d.personName,
    signature_name: d.signatureName,
    phone_called: d.phoneCalled,
    note: d.note,
    wants_parts_back: d.wantsPartsBack,
    decided_at: d.decidedAt,
    recorded_by_user_id: d.recordedByUserId,
    ip: d.ip?.slice(0, 45) ?? null,
    user_agent: d.userAgent?.slice(0, 500) ?? null,
    shown_hash: d.shownHash,
    estimate_pre_tax_minor: d.estimatePreTaxMinor,
    estimate_total_minor: d.estimateTotalMinor,
    authorised_pre_tax_minor: d.authorisedPreTaxMinor,
    authorised_tax_minor: d.authorisedTaxMinor,
    authorised_total_minor: d.authorisedTotalMinor,
  });
  await tx("approval_decision_lines").insert(
    d.lines.map((l) => ({
      shop_id: d.shopId,
      job_id: d.jobId,
      decision_id: id,
      line_no: l.no,
      answer: l.answer,
      kind: l.kind,
      description: l.description,
      part_number: l.partNumber,
      qty_thousandths: l.qtyThousandths,
      hours_tenths: l.hoursTenths,
      net_minor: l.netMinor,
      taxable: l.taxable,
    })),
  );
  await tx("approval_requests").where({ id: d.requestId }).update({ status: "answered", answered_at: tx.fn.now(3) });
  return Number(id);
}

/** Decisions of these requests (by request id), each with its lines: two queries. */
export async function listDecisions({ shopId, requestIds }: { shopId: number; requestIds: number[] }, k: Knex = db()): Promise<Map<number, DecisionRow>> {
  const out = new Map<number, DecisionRow>();
  if (!requestIds.length) return out;
  const rows: (ApprovalDecisionsTable & { recorded_by_name: string | null })[] = await k("approval_decisions as d")
    .leftJoin("users as u", "u.id", "d.recorded_by_user_id")
    .where("d.shop_id", shopId)
    .whereIn("d.request_id", requestIds)
    .select("d.*", "u.name as recorded_by_name");
  if (!rows.length) return out;
  const lines = await k("approval_decision_lines")
    .where("shop_id", shopId)
    .whereIn(
      "decision_id",
      rows.map((r) => Number(r.id)),
    )
    .orderBy(["decision_id", "line_no"]);
  for (const r of rows) {
    const id = Number(r.id);
    out.set(Number(r.request_id), {
      id,
      requestId: Number(r.request_id),
      method: r.method,
      personName: String(r.person_name),
      signatureName: r.signature_name ?? null,
      phoneCalled: r.phone_called ?? null,
      note: r.note ?? null,
      wantsPartsBack: Boolean(r.wants_parts_back),
      decidedAt: iso(r.decided_at)!,
      recordedAt: iso(r.recorded_at)!,
      recordedBy: r.recorded_by_name ?? null,
      ip: r.ip ?? null,
      userAgent: r.user_agent ?? null,
      shownHash: String(r.shown_hash),
      estimatePreTaxMinor: Number(r.estimate_pre_tax_minor),
      estimateTotalMinor: Number(r.estimate_total_minor),
      authorisedPreTaxMinor: Number(r.authorised_pre_tax_minor),
      authorisedTaxMinor: Number(r.authorised_tax_minor),
      authorisedTotalMinor: Number(r.authorised_total_minor),
      lines: lines
        .filter((l) => Number(l.decision_id) === id)
        .map((l) => ({ no: Number(l.line_no), answer: l.answer, kind: l.kind, description: String(l.description), partNumber: l.part_number ?? null, netMinor: Number(l.net_minor) })),
    });
  }
  return out;
}

export type AuthorisedLine = { requestPublicId: string; lineNo: number; kind: LineKind; description: string; partNumber: string | null; qtyThousandths: number | null; hoursTenths: number | null; netMinor: number; method: DecisionMethod; decidedAt: string };

/** The job's authorised work: every approved line of every answered request (view job_authorised_work). */
export async function listAuthorisedWork({ shopId, jobId }: JobKey, k: Knex = db()): Promise<AuthorisedLine[]> {
  const rows = await k("job_authorised_work").where({ shop_id: shopId, job_id: jobId }).orderBy(["decided_at", "request_id", "line_no"]);
  return rows.map((r) => ({
    requestPublicId: String(r.request_public_id),
    lineNo: Number(r.line_no),
    kind: r.kind,
    description: String(r.description),
    partNumber: r.part_number ?? null,
    qtyThousandths: num(r.qty_thousandths),
    hoursTenths: num(r.hours_tenths),
    netMinor: Number(r.net_minor),
    method: r.method,
    decidedAt: iso(r.decided_at)!,
  }));
}

/** Open requests of a job, newest first, for the owner's "decision you owe" banner. */
export async function listOpenRequests({ shopId, jobId }: JobKey): Promise<{ publicId: string; title: string; sentAt: string; totalMinor: number; currency: string }[]> {
  const rows = await db()("approval_requests").where({ shop_id: shopId, job_id: jobId, status: "sent" }).orderBy("id", "desc").select("public_id", "snapshot", "sent_at", "estimate_total_minor", "currency");
  return rows.map((r) => ({
    publicId: String(r.public_id),
    title: (json(r.snapshot) as RequestSnapshot).finding.title,
    sentAt: iso(r.sent_at)!,
    totalMinor: Number(r.estimate_total_minor),
    currency: String(r.currency),
  }));
}

/**
 * Drops a queued mail that hasn't gone yet (a reminder for a request that was answered, withdrawn
 * or replaced). A mail a worker is sending at this very moment can't be recalled; it still goes.
 * Scope as enqueueMail keys it: the shop's id (db/queries/outbox.ts).
 */
export async function cancelQueuedMail(k: Knex, { shopId, dedupeKey }: { shopId: number; dedupeKey: string }): Promise<boolean> {
  const n = await k("outbox").where({ dedupe_scope: shopId, dedupe_key: dedupeKey }).whereIn("state", ["queued", "retrying"]).delete();
  return n > 0;
}
