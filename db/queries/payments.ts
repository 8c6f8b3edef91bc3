import "server-only";
import crypto from "node:crypto";
import type { Knex } from "knex";
import type { PaymentKind, PaymentMethod } from "@/lib/invoices";
import { db } from "@/db/client";
import type { DepositRequestsTable, JobsTable, MachinesTable, PaymentCheckoutsTable, PaymentsTable } from "@/db/tables";

// Payments, refunds, parts deposits, online checkouts and the webhook events already applied. The
// provider's ids are unique keys, so whichever of the webhook and the API answer arrives second
// finds its payment or refund already recorded.

type JobKey = { shopId: number; jobId: number };
const num = (v: unknown) => (v == null ? null : Number(v));
const iso = (v: unknown) => (v == null ? null : (v as Date).toISOString());
const isDuplicateKey = (error: unknown) => (error as { code?: string } | null)?.code === "ER_DUP_ENTRY";

export type PaymentRow = {
  id: number;
  kind: PaymentKind;
  method: PaymentMethod;
  amountMinor: number;
  currency: string;
  reference: string | null;
  invoiceId: number | null;
  depositId: number | null;
  providerPaymentId: string | null;
  providerRefundId: string | null;
  refundOfPaymentId: number | null;
  recordedBy: string | null;
  receivedAt: string;
};

export async function listJobPayments({ shopId, jobId }: JobKey, k: Knex = db()): Promise<PaymentRow[]> {
  const rows: (PaymentsTable & { recorded_by_name: string | null })[] = await k("payments as p")
    .leftJoin("users as u", "u.id", "p.recorded_by_user_id")
    .where({ "p.shop_id": shopId, "p.job_id": jobId })
    .orderBy(["p.received_at", "p.id"])
    .select("p.*", "u.name as recorded_by_name");
  return rows.map((r) => ({
    id: Number(r.id),
    kind: r.kind,
    method: r.method,
    amountMinor: Number(r.amount_minor),
    currency: String(r.currency),
    reference: r.reference ?? null,
    invoiceId: num(r.invoice_id),
    depositId: num(r.deposit_id),
    providerPaymentId: r.provider_payment_id ?? null,
    providerRefundId: r.provider_refund_id ?? null,
    refundOfPaymentId: num(r.refund_of_payment_id),
    recordedBy: r.recorded_by_name ?? null,
    receivedAt: iso(r.received_at)!,
  }));
}

export type NewPayment = JobKey & {
  kind: PaymentKind;
  method: PaymentMethod;
  amountMinor: number;
  currency: string;
  reference?: string | null;
  invoiceId?: number | null;
  depositId?: number | null;
  providerPaymentId?: string | null;
  providerRefundId?: string | null;
  providerSessionId?: string | null;
  refundOfPaymentId?: number | null;
  userId?: number | null;
};

/** The new row's id, or null when the provider's id is already recorded (a repeat report). */
export async function insertPayment(k: Knex, p: NewPayment): Promise<number | null> {
  try {
    const [id] = await k("payments").insert({
      shop_id: p.shopId,
      job_id: p.jobId,
      kind: p.kind,
      method: p.method,
      amount_minor: p.amountMinor,
      currency: p.currency,
      reference: p.reference ?? null,
      invoice_id: p.invoiceId ?? null,
      deposit_id: p.depositId ?? null,
      provider_payment_id: p.providerPaymentId ?? null,
      provider_refund_id: p.providerRefundId ?? null,
      provider_session_id: p.providerSessionId ?? null,
      refund_of_payment_id: p.refundOfPaymentId ?? null,
      recorded_by_user_id: p.userId ?? null,
    });
    return Number(id);
  } catch (error) {
    // A duplicate key fails only this statement; the caller's transaction goes on.
    if ((p.providerPaymentId || p.providerRefundId) && isDuplicateKey(error)) return null;
    throw error;
  }
}

export async function getPaymentByProviderId(k: Knex, providerPaymentId: string): Promise<{ id: number; shopId: number; jobId: number; invoiceId: number | null; amountMinor: number; currency: string } | null> {
  const r = await k("payments").where({ provider_payment_id: providerPaymentId }).first("id", "shop_id", "job_id", "invoice_id", "amount_minor", "currency");
  return r ? { id: Number(r.id), shopId: Number(r.shop_id), jobId: Number(r.job_id), invoiceId: num(r.invoice_id), amountMinor: Number(r.amount_minor), currency: String(r.currency) } : null;
}

// ---- parts deposits ------------------------------------------------------------------------------

export type DepositRow = {
  id: number;
  publicId: string;
  shopId: number;
  jobId: number;
  requestPublicId: string | null;
  amountMinor: number;
  currency: string;
  note: string | null;
  status: "open" | "paid" | "cancelled";
  requestedBy: string | null;
  requestedAt: string;
  paidAt: string | null;
};

type DepositJoin = DepositRequestsTable & { requested_by_name: string | null };

function toDeposit(r: DepositJoin): DepositRow {
  return {
    id: Number(r.id),
    publicId: String(r.public_id),
    shopId: Number(r.shop_id),
    jobId: Number(r.job_id),
    requestPublicId: r.request_public_id ?? null,
    amountMinor: Number(r.amount_minor),
    currency: String(r.currency),
    note: r.note ?? null,
    status: r.status,
    requestedBy: r.requested_by_name ?? null,
    requestedAt: iso(r.requested_at)!,
    paidAt: iso(r.paid_at),
  };
}

const deposits = (k: Knex) => k("deposit_requests as d").leftJoin("users as u", "u.id", "d.requested_by_user_id");

export async function insertDeposit(tx: Knex, d: JobKey & { amountMinor: number; currency: string; note: string | null; requestPublicId: string | null; userId: number }): Promise<DepositRow> {
  const publicId = crypto.randomBytes(12).toString("base64url");
  await tx("deposit_requests").insert({
    public_id: publicId,
    shop_id: d.shopId,
    job_id: d.jobId,
    request_public_id: d.requestPublicId,
    amount_minor: d.amountMinor,
    currency: d.currency,
    note: d.note,
    requested_by_user_id: d.userId,
  });
  return (await getDepositByPublicId({ publicId }, tx))!;
}

export async function getDepositByPublicId({ publicId }: { publicId: string }, k: Knex = db(), lock = false): Promise<DepositRow | null> {
  const q = deposits(k).where("d.public_id", publicId).first("d.*", "u.name as requested_by_name");
  const row: DepositJoin | undefined = await (lock ? q.forUpdate() : q);
  return row ? toDeposit(row) : null;
}

export async function listJobDeposits({ shopId, jobId }: JobKey, k: Knex = db()): Promise<DepositRow[]> {
  const rows: DepositJoin[] = await deposits(k).where({ "d.shop_id": shopId, "d.job_id": jobId }).orderBy("d.id").select("d.*", "u.name as requested_by_name");
  return rows.map(toDeposit);
}

export async function setDepositStatus(k: Knex, { shopId, id, status }: { shopId: number; id: number; status: "paid" | "cancelled" }): Promise<void> {
  await k("deposit_requests").where({ shop_id: shopId, id, status: "open" }).update({ status, ...(status === "paid" ? { paid_at: k.fn.now(3) } : {}) });
}

// ---- online checkouts ----------------------------------------------------------------------------

export type CheckoutRow = JobKey & {
  id: number;
  invoiceId: number | null;
  depositId: number | null;
  sessionId: string;
  url: string | null;
  amountMinor: number;
  currency: string;
  status: "open" | "complete" | "expired";
  createdAt: string;
};

function toCheckout(r: PaymentCheckoutsTable): CheckoutRow {
  return {
    id: Number(r.id),
    shopId: Number(r.shop_id),
    jobId: Number(r.job_id),
    invoiceId: num(r.invoice_id),
    depositId: num(r.deposit_id),
    sessionId: String(r.provider_session_id),
    url: r.url ?? null,
    amountMinor: Number(r.amount_minor),
    currency: String(r.currency),
    status: r.status,
    createdAt: iso(r.created_at)!,
  };
}

export async function insertCheckout(c: JobKey & { invoiceId: number | null; depositId: number | null; sessionId: string; url: string | null; amountMinor: number; currency: string; userId: number }, k: Knex = db()): Promise<void> {
  await k("payment_checkouts").insert({
    shop_id: c.shopId,
    job_id: c.jobId,
    invoice_id: c.invoiceId,
    deposit_id: c.depositId,
    provider_session_id: c.sessionId,
    url: c.url,
    amount_minor: c.amountMinor,
    currency: c.currency,
    created_by_user_id: c.userId,
  });
}

export async function getCheckoutBySessionId({ sessionId }: { sessionId: string }, k: Knex = db(), lock = false): Promise<CheckoutRow | null> {
  const q = k("payment_checkouts").where({ provider_session_id: sessionId }).first();
  const row = await (lock ? q.forUpdate() : q);
  return row ? toCheckout(row) : null;
}

/**
 * The checkout an owner is back from: the owner's return address names what they paid (the
 * invoice's or the deposit's public id, never the payment service's session id), so this finds
 * that target's newest checkout on the job, a completed one first.
 */
export async function getReturnCheckout({ jobId, targetPublicId }: { jobId: number; targetPublicId: string }, k: Knex = db()): Promise<CheckoutRow | null> {
  const row: PaymentCheckoutsTable | undefined = await k("payment_checkouts as c")
    .leftJoin("invoices as i", (j) => j.on("i.id", "c.invoice_id").andOn("i.shop_id", "c.shop_id"))
    .leftJoin("deposit_requests as d", (j) => j.on("d.id", "c.deposit_id").andOn("d.shop_id", "c.shop_id"))
    .where("c.job_id", jobId)
    .where((q) => q.where((qi) => qi.where("i.public_id", targetPublicId).whereNull("c.deposit_id")).orWhere("d.public_id", targetPublicId))
    .orderByRaw("c.status = 'complete' DESC")
    .orderBy("c.id", "desc")
    .first("c.*");
  return row ? toCheckout(row) : null;
}

/** Open checkouts for the same thing (the invoice's balance, or one deposit), newest first. */
export async function listOpenCheckouts(t: JobKey & { invoiceId: number | null; depositId: number | null }, k: Knex = db()): Promise<CheckoutRow[]> {
  const q = k("payment_checkouts").where({ shop_id: t.shopId, job_id: t.jobId, status: "open" }).orderBy("id", "desc");
  if (t.depositId != null) q.where("deposit_id", t.depositId);
  else q.where("invoice_id", t.invoiceId).whereNull("deposit_id");
  return (await q).map(toCheckout);
}

/** The public id of the job a payment was taken on. */
export async function getPaymentJobPublicId({ paymentId }: { paymentId: number }): Promise<string | null> {
  const row: Pick<JobsTable, "public_id"> | undefined = await db()("payments as p").join("jobs as j", "j.id", "p.job_id").where("p.id", paymentId).first("j.public_id");
  return row ? String(row.public_id) : null;
}

export async function closeCheckout(k: Knex, { id, status }: { id: number; status: "complete" | "expired" }): Promise<void> {
  await k("payment_checkouts").where({ id, status: "open" }).update({ status, closed_at: k.fn.now(3) });
}

/** Records a webhook event's id; false when it was recorded before (a redelivery). */
export async function recordWebhookEvent(tx: Knex.Transaction, { eventId, type }: { eventId: string; type: string }): Promise<boolean> {
  const result = await tx.raw("INSERT IGNORE INTO payment_webhook_events (event_id, type) VALUES (?, ?)", [eventId, type.slice(0, 64)]);
  return Number((result as [{ affectedRows: number }])[0].affectedRows) > 0;
}

/** What receipts and timeline entries need about a job, by id (webhooks arrive with ids, not addresses). */
export async function getMoneyJob(k: Knex, jobId: number) {
  const r: (Pick<JobsTable, "id" | "shop_id" | "number" | "public_id"> & Pick<MachinesTable, "kind" | "year" | "make" | "model" | "serial">) | undefined = await k("jobs as j")
    .join("machines as m", "m.id", "j.machine_id")
    .where("j.id", jobId)
    .first("j.id", "j.shop_id", "j.number", "j.public_id", "m.kind", "m.year", "m.make", "m.model", "m.serial");
  if (!r) return null;
  return {
    id: Number(r.id),
    shopId: Number(r.shop_id),
    number: Number(r.number),
    publicId: String(r.public_id),
    machine: { kind: r.kind, year: num(r.year), make: String(r.make), model: String(r.model), serial: r.serial ?? null },
  };
}
