import "server-only";
import crypto from "node:crypto";
import type { Knex } from "knex";
import type { InvoiceLine, InvoiceStatus } from "@/lib/invoices";
import type { Discount, SuppliesSetting, TaxSetting, ToleranceSetting } from "@/lib/money";
import { db } from "@/db/client";
import type { CustomersTable, InvoicesTable, JobsTable, MachinesTable, ShopsTable } from "@/db/tables";

// Invoices and their lines. Writes take the caller's transaction: an invoice, its timeline entry
// and its e-mail commit together. Lock order for money changes: the shop row (only when a number
// is handed out), then the job row, then the invoice.

type JobKey = { shopId: number; jobId: number };
const num = (v: unknown) => (v == null ? null : Number(v));
const iso = (v: unknown) => (v == null ? null : (v as Date).toISOString());
const json = (v: unknown): unknown => (typeof v === "string" ? JSON.parse(v) : (v ?? null));

export function newInvoicePublicId(): string {
  return crypto.randomBytes(12).toString("base64url");
}

/** What the totals were worked out with, kept on the invoice so it reads the same later. */
export type InvoiceTotalsSnapshot = {
  format: 1;
  pricing: { tax: TaxSetting; supplies: SuppliesSetting | null };
  tolerance: ToleranceSetting;
  authorisedPreTaxMinor: number;
  toleranceMinor: number;
  ceilingMinor: number;
  flaggedCount: number;
  preTaxTotalMinor: number;
  taxableBaseMinor: number;
  lines: { no: number; grossMinor: number; netMinor: number; taxMinor: number | null; flagged: boolean }[];
};

export type InvoiceRow = {
  id: number;
  publicId: string;
  shopId: number;
  jobId: number;
  number: number;
  status: InvoiceStatus;
  currency: string;
  snapshot: InvoiceTotalsSnapshot;
  subtotalMinor: number;
  discountMinor: number;
  suppliesMinor: number;
  taxMinor: number;
  totalMinor: number;
  paidMinor: number;
  balanceMinor: number;
  discount: Discount | null;
  returnedPartsNote: string | null;
  note: string | null;
  version: number;
  createdAt: string;
  createdBy: string | null;
  issuedAt: string | null;
  issuedBy: string | null;
  paidAt: string | null;
  voidedAt: string | null;
};
export type InvoiceLineRow = InvoiceLine & { id: number; position: number };

// DECIMAL comes back as exact text, never through a float.
const columns = (k: Knex) => ["i.*", "cu.name as created_by_name", "iu.name as issued_by_name", k.raw("CAST(i.discount_percent AS CHAR) AS discount_percent_text")];

function invoices(k: Knex) {
  return k("invoices as i").leftJoin("users as cu", "cu.id", "i.created_by_user_id").leftJoin("users as iu", "iu.id", "i.issued_by_user_id");
}

type InvoiceJoin = InvoicesTable & { created_by_name: string | null; issued_by_name: string | null; discount_percent_text: string | null };

function toInvoice(r: InvoiceJoin): InvoiceRow {
  const discount: Discount | null =
    r.discount_kind === "amount" ? { kind: "amount", amountMinor: Number(r.discount_amount_minor) } : r.discount_kind === "percent" ? { kind: "percent", percent: String(r.discount_percent_text) } : null;
  return {
    id: Number(r.id),
    publicId: String(r.public_id),
    shopId: Number(r.shop_id),
    jobId: Number(r.job_id),
    number: Number(r.number),
    status: r.status,
    currency: String(r.currency),
    snapshot: json(r.totals) as InvoiceTotalsSnapshot,
    subtotalMinor: Number(r.subtotal_minor),
    discountMinor: Number(r.discount_minor),
    suppliesMinor: Number(r.supplies_minor),
    taxMinor: Number(r.tax_minor),
    totalMinor: Number(r.total_minor),
    paidMinor: Number(r.paid_minor),
    balanceMinor: Number(r.balance_minor),
    discount,
    returnedPartsNote: r.returned_parts_note ?? null,
    note: r.note ?? null,
    version: Number(r.version),
    createdAt: iso(r.created_at)!,
    createdBy: r.created_by_name ?? null,
    issuedAt: iso(r.issued_at),
    issuedBy: r.issued_by_name ?? null,
    paidAt: iso(r.paid_at),
    voidedAt: iso(r.voided_at),
  };
}

/** Hands out the shop's next invoice number. Call it first in the transaction: it locks the shop row. */
export async function allocateInvoiceNumber(tx: Knex.Transaction, shopId: number): Promise<number> {
  const shop = await tx("shops").where({ id: shopId }).forUpdate().first("next_invoice_number");
  if (!shop) throw new Error(`shop ${shopId} not found`);
  const number = Number(shop.next_invoice_number);
  await tx("shops").where({ id: shopId }).update({ next_invoice_number: number + 1 });
  return number;
}

/** The job row locked: payments, refunds and invoice changes of one job queue on it. */
export async function lockJob(tx: Knex.Transaction, { shopId, jobId }: JobKey): Promise<{ status: string; customerEmail: string | null; customerName: string } | null> {
  const row: (Pick<JobsTable, "status"> & Pick<CustomersTable, "email" | "name">) | undefined = await tx("jobs as j")
    .join("customers as c", "c.id", "j.customer_id")
    .where({ "j.id": jobId, "j.shop_id": shopId })
    .forUpdate()
    .first("j.status", "c.email", "c.name");
  return row ? { status: String(row.status), customerEmail: row.email ?? null, customerName: String(row.name) } : null;
}

export type InvoiceHeader = {
  shop: { name: string; email: string | null; phone: string | null; timezone: string; currency: string };
  job: { shopId: number; publicId: string; number: number; customerName: string };
  machine: { year: number | null; make: string; model: string; serial: string | null };
};

/** What an invoice is headed with: the shop's details, the job and its customer, the machine. */
export async function getInvoiceHeader({ jobId }: { jobId: number }): Promise<InvoiceHeader | null> {
  type Row = Pick<JobsTable, "id" | "shop_id" | "public_id" | "number"> &
    Pick<ShopsTable, "timezone" | "currency"> &
    Pick<MachinesTable, "year" | "make" | "model" | "serial"> & { shop_name: string; shop_email: string | null; shop_phone: string | null; customer_name: string };
  const j: Row | undefined = await db()("jobs as j")
    .join("shops as s", "s.id", "j.shop_id")
    .join("customers as c", "c.id", "j.customer_id")
    .join("machines as m", "m.id", "j.machine_id")
    .where("j.id", jobId)
    .first("j.id", "j.shop_id", "j.public_id", "j.number", "s.name as shop_name", "s.email as shop_email", "s.phone as shop_phone", "s.timezone", "s.currency", "c.name as customer_name", "m.year", "m.make", "m.model", "m.serial");
  if (!j) return null;
  return {
    shop: { name: String(j.shop_name), email: j.shop_email ?? null, phone: j.shop_phone ?? null, timezone: String(j.timezone), currency: String(j.currency) },
    job: { shopId: Number(j.shop_id), publicId: String(j.public_id), number: Number(j.number), customerName: String(j.customer_name) },
    machine: { year: j.year == null ? null : Number(j.year), make: String(j.make), model: String(j.model), serial: j.serial ?? null },
  };
}

/** Locks the invoice row (after the job row: see the lock order above). */
export async function lockInvoice(tx: Knex.Transaction, { id }: { id: number }): Promise<void> {
  await tx("invoices").where({ id }).forUpdate().first("id");
}

export async function getInvoiceByPublicId({ publicId }: { publicId: string }, k: Knex = db()): Promise<InvoiceRow | null> {
  const row: InvoiceJoin | undefined = await invoices(k).where("i.public_id", publicId).first(columns(k));
  return row ? toInvoice(row) : null;
}

/** The job's invoice that isn't void (there is at most one), locked when a transaction is given. */
export async function getLiveInvoice({ shopId, jobId }: JobKey, k: Knex = db(), lock = false): Promise<InvoiceRow | null> {
  if (lock) await k("invoices").where({ shop_id: shopId, live_job_id: jobId }).forUpdate().first("id");
  const row: InvoiceJoin | undefined = await invoices(k).where({ "i.shop_id": shopId, "i.live_job_id": jobId }).first(columns(k));
  return row ? toInvoice(row) : null;
}

export async function listJobInvoices({ shopId, jobId }: JobKey, k: Knex = db()): Promise<InvoiceRow[]> {
  const rows: InvoiceJoin[] = await invoices(k).where({ "i.shop_id": shopId, "i.job_id": jobId }).orderBy("i.id").select(columns(k));
  return rows.map(toInvoice);
}

export async function insertInvoice(
  tx: Knex.Transaction,
  i: JobKey & { publicId: string; number: number; currency: string; snapshot: InvoiceTotalsSnapshot; returnedPartsNote: string | null; userId: number },
): Promise<number> {
  const [id] = await tx("invoices").insert({
    public_id: i.publicId,
    shop_id: i.shopId,
    job_id: i.jobId,
    live_job_id: i.jobId,
    number: i.number,
    currency: i.currency,
    totals: JSON.stringify(i.snapshot),
    returned_parts_note: i.returnedPartsNote,
    created_by_user_id: i.userId,
  });
  return Number(id);
}

export async function listInvoiceLines({ shopId, invoiceId }: { shopId: number; invoiceId: number }, k: Knex = db()): Promise<InvoiceLineRow[]> {
  const rows = await k("invoice_lines").where({ shop_id: shopId, invoice_id: invoiceId }).orderBy(["position", "id"]);
  return rows.map((r) => ({
    id: Number(r.id),
    position: Number(r.position),
    source: r.source,
    requestPublicId: r.request_public_id ?? null,
    requestLineNo: num(r.request_line_no),
    kind: r.kind,
    description: String(r.description),
    partNumber: r.part_number ?? null,
    qtyThousandths: num(r.qty_thousandths),
    unitPriceMinor: num(r.unit_price_minor),
    hoursTenths: num(r.hours_tenths),
    rateMinor: num(r.rate_minor),
    amountMinor: num(r.amount_minor),
    taxable: Boolean(r.taxable),
    partId: num(r.part_id),
  }));
}

export async function insertInvoiceLines(tx: Knex.Transaction, { shopId, invoiceId, lines, from }: { shopId: number; invoiceId: number; lines: InvoiceLine[]; from: number }): Promise<void> {
  if (!lines.length) return;
  await tx("invoice_lines").insert(
    lines.map((l, i) => ({
      shop_id: shopId,
      invoice_id: invoiceId,
      position: from + i,
      source: l.source,
      request_public_id: l.requestPublicId,
      request_line_no: l.requestLineNo,
      kind: l.kind,
      description: l.description,
      part_number: l.partNumber,
      qty_thousandths: l.qtyThousandths,
      unit_price_minor: l.unitPriceMinor,
      hours_tenths: l.hoursTenths,
      rate_minor: l.rateMinor,
      amount_minor: l.amountMinor,
      taxable: l.taxable,
      part_id: l.partId ?? null,
    })),
  );
}

export async function deleteInvoiceLine(tx: Knex.Transaction, { shopId, invoiceId, lineId }: { shopId: number; invoiceId: number; lineId: number }): Promise<boolean> {
  return (await tx("invoice_lines").where({ shop_id: shopId, invoice_id: invoiceId, id: lineId }).delete()) > 0;
}

export type InvoiceUpdate = Partial<{
  status: InvoiceStatus;
  snapshot: InvoiceTotalsSnapshot;
  amounts: { subtotalMinor: number; discountMinor: number; suppliesMinor: number; taxMinor: number; totalMinor: number; paidMinor: number; balanceMinor: number };
  discount: Discount | null;
  returnedPartsNote: string | null;
  note: string | null;
  issuedBy: number;
  paidAt: Date | null;
  voided: true;
}>;

/** Applies a change and bumps the version. */
export async function updateInvoice(tx: Knex.Transaction, { shopId, id, change }: { shopId: number; id: number; change: InvoiceUpdate }): Promise<void> {
  const row: Record<string, unknown> = { version: tx.raw("version + 1") };
  if (change.status) row.status = change.status;
  if (change.snapshot) row.totals = JSON.stringify(change.snapshot);
  const a = change.amounts;
  if (a) Object.assign(row, { subtotal_minor: a.subtotalMinor, discount_minor: a.discountMinor, supplies_minor: a.suppliesMinor, tax_minor: a.taxMinor, total_minor: a.totalMinor, paid_minor: a.paidMinor, balance_minor: a.balanceMinor });
  if (change.discount !== undefined) {
    const d = change.discount;
    Object.assign(row, { discount_kind: d?.kind ?? null, discount_amount_minor: d?.kind === "amount" ? d.amountMinor : null, discount_percent: d?.kind === "percent" ? d.percent : null });
  }
  if (change.returnedPartsNote !== undefined) row.returned_parts_note = change.returnedPartsNote;
  if (change.note !== undefined) row.note = change.note;
  if (change.issuedBy) Object.assign(row, { issued_by_user_id: change.issuedBy, issued_at: tx.fn.now(3) });
  if (change.paidAt !== undefined) row.paid_at = change.paidAt;
  if (change.voided) Object.assign(row, { status: "void", live_job_id: null, voided_at: tx.fn.now(3) });
  await tx("invoices").where({ shop_id: shopId, id }).update(row);
}
