import "server-only";
import { type InvoiceRow, getInvoiceHeader, listInvoiceLines, listJobInvoices } from "@/db/queries/invoices";
import { type DepositRow, type PaymentRow, listJobDeposits, listJobPayments } from "@/db/queries/payments";
import { type Balance, type PricedLine, balanceOf, formatInvoiceNumber } from "@/lib/invoices";
import { describeMachine } from "@/lib/machine";
import { taxLabel } from "@/lib/money";
import { ownerReference, receiptNumbers } from "@/lib/receipts";
import { formatJobNumber } from "@/lib/schemas/jobs";
import { type AuthorisationEntry, type AuthorisedWork, lineKey } from "@/lib/server/authorised-work";
import { authorisedWorkOf } from "@/lib/server/request-cache";
import { depositParts } from "@/db/queries/part-orders";
import { coreLinesOf } from "@/lib/server/core-lines";

// One read of everything an invoice page, the PDF and the JSON route show: the shop's details, the
// job and machine, the live invoice with its priced lines, payments and deposits, and the
// authorisation record. A fixed number of queries whatever the number of lines or payments.

export type ViewLine = PricedLine & { id: number };
/**
 * receipt: the shop's own number for it (lib/receipts.ts), what owners and receipts show; forPart:
 * the special-order part a paid deposit was asked for (issue 19), shown against the invoice.
 */
export type ViewPayment = PaymentRow & { refundableMinor: number; receipt: string; forPart: string | null };

export type InvoiceView = {
  shop: { name: string; email: string | null; phone: string | null; timezone: string };
  job: { id: number; shopId: number; publicId: string; number: number; label: string; machine: string; serial: string | null; customerName: string };
  invoice: (Omit<InvoiceRow, "snapshot"> & { label: string; taxLabel: string; lines: ViewLine[]; flaggedCount: number; ceilingMinor: number; authorisedPreTaxMinor: number; toleranceMinor: number }) | null;
  voided: { label: string; voidedAt: string | null; note: string | null }[];
  payments: ViewPayment[];
  deposits: DepositRow[];
  /** Money on the job with no invoice yet (deposits), or the live invoice's balance. */
  balance: Balance;
  record: AuthorisationEntry[];
  openRequests: { publicId: string; title: string }[];
  /** Authorised lines not on the draft yet (answers that came after it was made). */
  missingAuthorised: number;
  /** Approved parts not fitted yet, so not billed (issue 19); the desk's view only. */
  partsNotFitted: AuthorisedWork["partsNotFitted"];
  /** Approved lines withdrawn because their part left the job (issue 19): never billed; the desk's view only. */
  linesWithdrawn: AuthorisedWork["linesWithdrawn"];
  currency: string;
};

/** What the owner reads of a withdrawn line: not the other job it went to, nor who took it off. */
export const OWNER_WITHDRAWN_REASON = "Its part wasn't fitted to this machine after all, so it isn't billed.";

const forOwner = (record: AuthorisationEntry[]): AuthorisationEntry[] =>
  record.map((e) => (e.withdrawn.length ? { ...e, withdrawn: e.withdrawn.map((w) => ({ ...w, reason: OWNER_WITHDRAWN_REASON, by: null })) } : e));

export async function invoiceView(jobId: number, audience: "shop" | "owner"): Promise<InvoiceView> {
  const h = (await getInvoiceHeader({ jobId }))!;
  const key = { shopId: h.job.shopId, jobId };
  const [invoices, payments, deposits, work, cores, forParts] = await Promise.all([
    listJobInvoices(key),
    listJobPayments(key),
    listJobDeposits(key),
    authorisedWorkOf(key.shopId, key.jobId),
    // Only their keys count here (missing lines), so the taxable default doesn't matter.
    coreLinesOf(key, false),
    depositParts(key),
  ]);
  // The owner sees an invoice once it is issued; a draft is the desk's working copy.
  const live = invoices.find((i) => i.status !== "void" && (audience === "shop" || i.status !== "draft")) ?? null;
  const rows = live ? await listInvoiceLines({ shopId: key.shopId, invoiceId: live.id }) : [];
  const refunded = new Map<number, number>();
  for (const p of payments) if (p.refundOfPaymentId) refunded.set(p.refundOfPaymentId, (refunded.get(p.refundOfPaymentId) ?? 0) + p.amountMinor);

  let invoice: InvoiceView["invoice"] = null;
  if (live) {
    const { snapshot, ...rest } = live;
    const priced = snapshot.lines;
    invoice = {
      ...rest,
      label: formatInvoiceNumber(live.number),
      lines: rows.map((l, i) => ({ ...l, no: i + 1, grossMinor: priced[i]?.grossMinor ?? 0, netMinor: priced[i]?.netMinor ?? 0, taxMinor: priced[i]?.taxMinor ?? null, flagged: priced[i]?.flagged ?? false })),
      taxLabel: taxLabel(snapshot.pricing.tax),
      flaggedCount: snapshot.flaggedCount,
      ceilingMinor: snapshot.ceilingMinor,
      authorisedPreTaxMinor: snapshot.authorisedPreTaxMinor,
      toleranceMinor: snapshot.toleranceMinor,
    };
  }
  const onInvoice = new Set(rows.map(lineKey));
  const receipts = receiptNumbers(h.job.number, payments);
  return {
    shop: { name: h.shop.name, email: h.shop.email, phone: h.shop.phone, timezone: h.shop.timezone },
    job: {
      id: jobId,
      shopId: key.shopId,
      publicId: h.job.publicId,
      number: h.job.number,
      label: formatJobNumber(h.job.number),
      machine: describeMachine(h.machine),
      serial: h.machine.serial,
      customerName: h.job.customerName,
    },
    invoice,
    voided: invoices.filter((i) => i.status === "void" && (audience === "shop" || i.issuedAt)).map((i) => ({ label: formatInvoiceNumber(i.number), voidedAt: i.voidedAt, note: i.note })),
    payments: payments.map((p) => ({
      ...p,
      refundableMinor: p.kind === "refund" ? 0 : p.amountMinor - (refunded.get(p.id) ?? 0),
      receipt: receipts.get(p.id)!,
      forPart: p.kind === "deposit" && p.depositId !== null ? (forParts.get(p.depositId) ?? null) : null,
      // Owners (page, PDF, JSON) never get the payments service's raw ids; staff keep them to reconcile.
      ...(audience === "owner" ? { reference: ownerReference(p), providerPaymentId: null, providerRefundId: null } : {}),
    })),
    deposits,
    balance: balanceOf(invoice?.totalMinor ?? 0, payments),
    record: audience === "owner" ? forOwner(work.record) : work.record,
    openRequests: work.openRequests,
    missingAuthorised: live?.status === "draft" ? [...work.lines, ...cores].filter((l) => !onInvoice.has(lineKey(l))).length : 0,
    partsNotFitted: audience === "shop" ? work.partsNotFitted : [],
    linesWithdrawn: audience === "shop" ? work.linesWithdrawn : [],
    currency: live?.currency ?? h.shop.currency,
  };
}
