import "server-only";
import { getMoneySettings } from "@/db/queries/findings";
import {
  type InvoiceRow,
  type InvoiceTotalsSnapshot,
  allocateInvoiceNumber,
  deleteInvoiceLine,
  getInvoiceByPublicId,
  getLiveInvoice,
  insertInvoice,
  insertInvoiceLines,
  listInvoiceLines,
  lockInvoice,
  lockJob,
  newInvoicePublicId,
  updateInvoice,
} from "@/db/queries/invoices";
import { insertEntry } from "@/db/queries/entries";
import { listJobPayments } from "@/db/queries/payments";
import { getShopCurrency } from "@/db/queries/shops";
import { type DraftLine, toMoneyLine } from "@/lib/approvals";
import { AppError } from "@/lib/errors";
import { type InvoiceEntryBody, balanceOf, formatInvoiceNumber, priceInvoice, statusAfter } from "@/lib/invoices";
import { type Discount, parseMoney, parsePercent } from "@/lib/money";
import type { Actor } from "@/lib/permissions";
import type { AddLineInput, DraftDetailsInput } from "@/lib/schemas/invoices";
import type { JobAccess, Resolved } from "@/lib/server/access";
import { authorisedWork, lineKey } from "@/lib/server/authorised-work";
import { type Tx, transaction } from "@/db/transaction";
import { readLines } from "@/lib/server/findings";
import { queueInvoiceMail, queueInvoiceText } from "@/lib/server/invoice-mail";
import { noticeChannels } from "@/lib/server/texts";
import { coreLinesOf } from "@/lib/server/core-lines";

// Invoices made from authorised work: create (numbered under the shop row's lock), edit the draft,
// issue, cancel. Every change runs in one transaction with the job row and then the invoice locked,
// and re-prices the invoice and its balance from the stored lines and the job's payments.
// Who may do each is declared by the handler or action ("jobMoney" / "invoice" in lib/server/access.ts).

/**
 * Re-prices the invoice from its lines and the job's payments, and stores the result. Call it
 * inside the transaction that changed something, with the job row locked.
 */
export async function recompute(tx: Tx, invoice: InvoiceRow) {
  const lines = await listInvoiceLines({ shopId: invoice.shopId, invoiceId: invoice.id }, tx);
  const work = await authorisedWork({ shopId: invoice.shopId, jobId: invoice.jobId }, tx);
  const { pricing, tolerance } = invoice.snapshot;
  const priced = priceInvoice({ lines, settings: pricing, discount: invoice.discount, authorisedPreTaxMinor: work.authorisedPreTaxMinor, tolerance });
  const t = priced.totals;
  const balance = balanceOf(t.totalMinor, await listJobPayments({ shopId: invoice.shopId, jobId: invoice.jobId }, tx));
  const status = statusAfter(invoice.status, t.totalMinor, balance.balanceMinor);
  const snapshot: InvoiceTotalsSnapshot = {
    format: 1,
    pricing,
    tolerance,
    authorisedPreTaxMinor: priced.authorisedPreTaxMinor,
    toleranceMinor: priced.toleranceMinor,
    ceilingMinor: priced.ceilingMinor,
    flaggedCount: priced.flaggedCount,
    preTaxTotalMinor: t.preTaxTotalMinor,
    taxableBaseMinor: t.taxableBaseMinor,
    lines: priced.lines.map((l) => ({ no: l.no, grossMinor: l.grossMinor, netMinor: l.netMinor, taxMinor: l.taxMinor, flagged: l.flagged })),
  };
  await updateInvoice(tx, {
    shopId: invoice.shopId,
    id: invoice.id,
    change: {
      status,
      snapshot,
      amounts: { subtotalMinor: t.subtotalMinor, discountMinor: t.discountsMinor, suppliesMinor: t.suppliesMinor, taxMinor: t.taxMinor, totalMinor: t.totalMinor, paidMinor: balance.paidMinor, balanceMinor: balance.balanceMinor },
      ...(status !== invoice.status ? { paidAt: status === "paid" ? new Date() : null } : {}),
    },
  });
  return { priced, balance, status, becamePaid: status === "paid" && invoice.status !== "paid" };
}

/**
 * The desk turns the job's authorised work into a draft invoice. The shop row is locked first (for
 * the number), then the job row: the same order everywhere, so two desks can't deadlock (a lost
 * lock conflict is retried by `transaction`); a rolled-back attempt gives its number back, so
 * numbers have no gaps.
 */
export async function createInvoice(actor: Actor, { job }: JobAccess) {
  return transaction(async (tx) => {
    const number = await allocateInvoiceNumber(tx, job.shopId);
    await lockJob(tx, { shopId: job.shopId, jobId: job.id });
    const live = await getLiveInvoice({ shopId: job.shopId, jobId: job.id }, tx);
    if (live) throw new AppError("conflict", `This job already has invoice ${formatInvoiceNumber(live.number)}. Open it, or cancel it to start again.`);
    const work = await authorisedWork({ shopId: job.shopId, jobId: job.id }, tx);
    // A signed drop-off authorisation with a free diagnosis brings no line, but work up to its amount may be invoiced.
    if (!work.lines.length && !work.dropoff?.signature) throw new AppError("invalid", "Nothing has been authorised on this job yet: an invoice is made from lines the owner approved.");
    const settings = await getMoneySettings({ shopId: job.shopId }, tx);
    const currency = await getShopCurrency({ shopId: job.shopId }, tx);
    const publicId = newInvoicePublicId();
    const blank: InvoiceTotalsSnapshot = {
      format: 1,
      pricing: { tax: settings.tax, supplies: settings.supplies },
      tolerance: settings.tolerance,
      authorisedPreTaxMinor: 0,
      toleranceMinor: 0,
      ceilingMinor: 0,
      flaggedCount: 0,
      preTaxTotalMinor: 0,
      taxableBaseMinor: 0,
      lines: [],
    };
    const returnedPartsNote = work.wantsPartsBack ? "You asked for the replaced parts back: they are packed with your machine." : null;
    const id = await insertInvoice(tx, { shopId: job.shopId, jobId: job.id, publicId, number, currency, snapshot: blank, returnedPartsNote, userId: actor.userId });
    // Fitted parts' core charges, and their credits once the cores went back (issue 19).
    const cores = await coreLinesOf({ shopId: job.shopId, jobId: job.id }, settings.taxable.part, tx);
    await insertInvoiceLines(tx, { shopId: job.shopId, invoiceId: id, lines: [...work.lines, ...cores], from: 1 });
    await recompute(tx, (await getInvoiceByPublicId({ publicId }, tx))!);
    return { publicId, number, job };
  });
}

/** Locks the job row, then reads the invoice fresh; refuses a stale version or the wrong status. */
async function lockedInvoice(tx: Tx, invoice: InvoiceRow, version: number | null, allowed: InvoiceRow["status"][]): Promise<InvoiceRow> {
  await lockJob(tx, { shopId: invoice.shopId, jobId: invoice.jobId });
  await lockInvoice(tx, { id: invoice.id });
  const fresh = (await getInvoiceByPublicId({ publicId: invoice.publicId }, tx))!;
  if (version !== null && fresh.version !== version) throw new AppError("conflict", "Someone changed this invoice since you opened it. Check it again, then repeat your change.");
  if (!allowed.includes(fresh.status)) {
    throw new AppError("conflict", fresh.status === "draft" ? "This invoice hasn't been issued yet." : `Invoice ${formatInvoiceNumber(fresh.number)} has been issued and can't be changed; cancel it to start again.`);
  }
  return fresh;
}

async function draftChange({ invoice, job }: Resolved<"invoice">, version: number, change: (tx: Tx, invoice: InvoiceRow) => Promise<InvoiceRow | void>) {
  await transaction(async (tx) => {
    const fresh = await lockedInvoice(tx, invoice, version, ["draft"]);
    // recompute stores the new totals and bumps the version.
    await recompute(tx, (await change(tx, fresh)) ?? fresh);
  });
  return { job };
}

/** Brings in authorised lines not yet on the draft (answers that came after it was made), and core charges and credits. */
export async function syncAuthorised(found: Resolved<"invoice">, version: number) {
  return draftChange(found, version, async (tx, invoice) => {
    const lines = await listInvoiceLines({ shopId: invoice.shopId, invoiceId: invoice.id }, tx);
    const have = new Set(lines.map(lineKey));
    const key = { shopId: invoice.shopId, jobId: invoice.jobId };
    const work = await authorisedWork(key, tx);
    const cores = await coreLinesOf(key, (await getMoneySettings({ shopId: invoice.shopId }, tx)).taxable.part, tx);
    const missing = [...work.lines, ...cores].filter((l) => !have.has(lineKey(l)));
    if (!missing.length) throw new AppError("conflict", "Every authorised line is already on the invoice.");
    await insertInvoiceLines(tx, { shopId: invoice.shopId, invoiceId: invoice.id, lines: missing, from: (lines.at(-1)?.position ?? 0) + 1 });
  });
}

export async function addLine(found: Resolved<"invoice">, input: AddLineInput) {
  return draftChange(found, input.version, async (tx, invoice) => {
    const settings = await getMoneySettings({ shopId: invoice.shopId }, tx);
    let draft;
    try {
      // An empty rate means "the shop's rate" (the form's hint): readLines fills in the default
      // when the rate is left out, and "" would read as "no rate".
      const rate = input.rate === "" ? undefined : input.rate;
      [draft] = readLines([{ ...input, rate, partNumber: input.partNumber }], [], { currency: invoice.currency, mayPrice: true, settings });
      const price = missingPrice(draft!, settings.labourRateMinor != null);
      if (price) throw new AppError("invalid", price.message, { [price.field]: [price.message] });
      toMoneyLine(draft!, 0);
    } catch (error) {
      // readLines names fields as "lines.0.qty"; this form has one line.
      if (error instanceof AppError && error.fields) {
        throw new AppError(error.code, error.message, Object.fromEntries(Object.entries(error.fields).map(([k, v]) => [k.replace(/^lines\.0\.?/, "") || "_", v])));
      }
      throw error;
    }
    const lines = await listInvoiceLines({ shopId: invoice.shopId, invoiceId: invoice.id }, tx);
    const { id: _id, ...line } = draft!;
    await insertInvoiceLines(tx, { shopId: invoice.shopId, invoiceId: invoice.id, lines: [{ ...line, source: "added", requestPublicId: null, requestLineNo: null }], from: (lines.at(-1)?.position ?? 0) + 1 });
  });
}

/** The price a new invoice line still lacks, named by the add-line form's field for it. */
function missingPrice(line: DraftLine, shopHasRate: boolean): { field: string; message: string } | null {
  if (line.kind === "part" && line.unitPriceMinor == null) return { field: "unitPrice", message: "Enter the unit price." };
  if (line.kind === "fee" && line.amountMinor == null) return { field: "amount", message: "Enter the amount." };
  if (line.kind === "labour" && line.rateMinor == null) {
    return { field: "rate", message: shopHasRate ? "Enter the rate per hour." : "The shop has no default labour rate yet: enter the rate here, or ask the shop owner to set one in Settings." };
  }
  return null;
}

export async function removeLine(found: Resolved<"invoice">, input: { version: number; line: number }) {
  return draftChange(found, input.version, async (tx, invoice) => {
    const key = { shopId: invoice.shopId, invoiceId: invoice.id };
    const line = (await listInvoiceLines(key, tx)).find((l) => l.id === input.line);
    if (!line || !(await deleteInvoiceLine(tx, { ...key, lineId: input.line }))) throw new AppError("not_found", "That line isn't on this invoice any more.");
    // A core's credit never stays without its charge: it would give back what wasn't charged.
    const credit = line.source === "core_charge" ? (await listInvoiceLines(key, tx)).find((l) => l.source === "core_credit" && l.partId === line.partId) : undefined;
    if (credit) await deleteInvoiceLine(tx, { ...key, lineId: credit.id });
  });
}

export function readDiscount(input: Pick<DraftDetailsInput, "discountKind" | "discountValue">, currency: string): Discount | null {
  if (input.discountKind === "none" || input.discountValue === "") return null;
  try {
    if (input.discountKind === "amount") return { kind: "amount", amountMinor: parseMoney(input.discountValue, currency) };
    parsePercent(input.discountValue.replace(/\s*%$/, ""), "The discount");
    return { kind: "percent", percent: input.discountValue.replace(/\s*%$/, "") };
  } catch (error) {
    if (error instanceof AppError) throw new AppError("invalid", error.message, { discountValue: [error.message] });
    throw error;
  }
}

export async function updateDraft(found: Resolved<"invoice">, input: DraftDetailsInput) {
  return draftChange(found, input.version, async (tx, invoice) => {
    const discount = readDiscount(input, invoice.currency);
    await updateInvoice(tx, { shopId: invoice.shopId, id: invoice.id, change: { discount, returnedPartsNote: input.returnedPartsNote, note: input.note } });
    return { ...invoice, discount, returnedPartsNote: input.returnedPartsNote, note: input.note };
  });
}

/** Sends the invoice: no flagged lines, something to charge; a shared timeline entry and the owner's e-mail go with it. */
export async function issueInvoice(actor: Actor, { invoice, job }: Resolved<"invoice">, version: number) {
  await transaction(async (tx) => {
    const fresh = await lockedInvoice(tx, invoice, version, ["draft"]);
    const locked = (await lockJob(tx, { shopId: fresh.shopId, jobId: fresh.jobId }))!;
    const { priced } = await recompute(tx, fresh);
    if (priced.flaggedCount) {
      throw new AppError("conflict", `${priced.flaggedCount === 1 ? "One line goes" : `${priced.flaggedCount} lines go`} past what the owner authorised. Remove ${priced.flaggedCount === 1 ? "it" : "them"} or get a new approval first.`);
    }
    if (priced.totals.totalMinor <= 0) throw new AppError("invalid", "There is nothing to charge on this invoice.");
    await updateInvoice(tx, { shopId: fresh.shopId, id: fresh.id, change: { status: "issued", issuedBy: actor.userId } });
    // Deposits may already cover it all.
    const issued = (await getInvoiceByPublicId({ publicId: fresh.publicId }, tx))!;
    await recompute(tx, issued);
    const body: InvoiceEntryBody = { event: "issued", invoice: fresh.publicId, number: formatInvoiceNumber(fresh.number) };
    await insertEntry(tx, { shopId: fresh.shopId, jobId: fresh.jobId, kind: "invoice", authorId: actor.userId, visibility: "shared", body });
    // The owner's choice of e-mail, text or both (issue 21; a text only with their consent).
    const channels = await noticeChannels(tx, { shopId: fresh.shopId, customerId: job.customerId });
    if (channels.text) await queueInvoiceText(tx, { invoice: (await getInvoiceByPublicId({ publicId: fresh.publicId }, tx))!, job, email: locked.customerEmail });
    if (locked.customerEmail && channels.email) await queueInvoiceMail(tx, { invoice: (await getInvoiceByPublicId({ publicId: fresh.publicId }, tx))!, job, to: locked.customerEmail, ownerName: locked.customerName });
  });
  return { job };
}

/** Cancels an invoice; its number stays used, and payments stay on the job for the next invoice. */
export async function voidInvoice(actor: Actor, { invoice, job }: Resolved<"invoice">, input: { version: number; reason: string }) {
  await transaction(async (tx) => {
    const fresh = await lockedInvoice(tx, invoice, input.version, ["draft", "issued", "paid"]);
    await updateInvoice(tx, { shopId: fresh.shopId, id: fresh.id, change: { voided: true, note: `Cancelled: ${input.reason}`.slice(0, 1000) } });
    if (fresh.status !== "draft") {
      const body: InvoiceEntryBody = { event: "void", invoice: fresh.publicId, number: formatInvoiceNumber(fresh.number) };
      await insertEntry(tx, { shopId: fresh.shopId, jobId: fresh.jobId, kind: "invoice", authorId: actor.userId, visibility: "shared", body });
    }
  });
  return { job };
}
