// Invoices: which lines may be charged, the totals, and the balance after deposits, part payments
// and refunds. Pure (no I/O): the staff page, the owner's page, the PDF and the server all use it.
// Money comes from lib/money.ts; the consent rule (what was authorised plus the shop's tolerance)
// is the one approvals use (REFERENCES §6).
import { type DraftLine, toMoneyLine } from "@/lib/approvals";
import { type Discount, MoneyError, type ToleranceSetting, type Totals, type TotalsSettings, approvalCeiling, currencyDigits, lineTotal, toleranceFor, totals } from "@/lib/money";

export const INVOICE_STATUSES = ["draft", "issued", "paid", "void"] as const;
export type InvoiceStatus = (typeof INVOICE_STATUSES)[number];
export const INVOICE_STATUS_LABEL: Record<InvoiceStatus, string> = {
  draft: "Draft (the owner can't see it yet)",
  issued: "Sent, balance due",
  paid: "Paid in full",
  void: "Cancelled",
};

export const PAYMENT_METHODS = ["online", "cash", "card_terminal", "cheque"] as const;
export type PaymentMethod = (typeof PAYMENT_METHODS)[number];
/** What the desk records by hand; online payments arrive from the payments service only. */
export const COUNTER_METHODS = ["cash", "card_terminal", "cheque"] as const satisfies readonly PaymentMethod[];
export const PAYMENT_METHOD_LABEL: Record<PaymentMethod, string> = { online: "Paid online", cash: "Cash", card_terminal: "Card at the counter", cheque: "Cheque" };
export const PAYMENT_KINDS = ["payment", "deposit", "refund"] as const;
export type PaymentKind = (typeof PAYMENT_KINDS)[number];
export const PAYMENT_KIND_LABEL: Record<PaymentKind, string> = { payment: "Payment", deposit: "Parts deposit", refund: "Refund" };

export const INVOICE_PUBLIC_ID_PATTERN = /^[A-Za-z0-9_-]{16}$/;

/** Minor units as the text a money field takes back ("84.22", "1234"): a form's default value. */
export function amountText(minor: number, currency: string): string {
  const digits = currencyDigits(currency);
  const abs = String(Math.abs(minor)).padStart(digits + 1, "0");
  const body = digits ? `${abs.slice(0, -digits)}.${abs.slice(-digits)}` : abs;
  return minor < 0 ? `-${body}` : body;
}

/** INV-0007: our own numbering, per shop. */
export function formatInvoiceNumber(n: number): string {
  return `INV-${String(n).padStart(4, "0")}`;
}

/**
 * A line on an invoice: copied from an approved request line, added by the desk, or a fitted part's
 * core charge and, once the old core went back, its credit (issue 19; `partId` names the part).
 */
export type InvoiceLine = DraftLine & { source: "authorised" | "added" | "core_charge" | "core_credit"; requestPublicId: string | null; requestLineNo: number | null; partId?: number | null };

/** A credit line gives its amount back: priced negative, with its tax (lib/money.ts `credit`). */
export const isCreditLine = (line: Pick<InvoiceLine, "source">) => line.source === "core_credit";

export type PricedLine = InvoiceLine & {
  no: number;
  grossMinor: number;
  /** After discounts; 0 for a flagged line (it is not charged). */
  netMinor: number;
  taxMinor: number | null;
  /** An added line that would take the charge past what was authorised plus the tolerance. */
  flagged: boolean;
};

export type PricedInvoice = {
  lines: PricedLine[];
  /** Totals of the lines that may be charged (flagged lines left out). */
  totals: Totals;
  authorisedPreTaxMinor: number;
  toleranceMinor: number;
  /** The most that may be charged before tax without a new approval. */
  ceilingMinor: number;
  flaggedCount: number;
};

export type PriceInput = {
  lines: readonly InvoiceLine[];
  settings: Pick<TotalsSettings, "tax" | "supplies">;
  discount: Discount | null;
  /** Everything the owner authorised before tax: `totalAuthorisedPreTax` of the job's records. */
  authorisedPreTaxMinor: number;
  tolerance: ToleranceSetting;
};

/**
 * What the owner authorised on a job, before tax: the "authorised up to" amount signed at drop-off
 * (the written estimate; it already includes the diagnosis charge) plus the authorised pre-tax
 * total of every answered approval request (the consents to added work). The invoice is compared
 * with this sum plus the shop's tolerance (REFERENCES §6: no charge above the written estimate,
 * as increased by later consents, without further consent; tax left out of the comparison).
 */
export function totalAuthorisedPreTax(dropoffUpToMinor: number | null, requestsPreTaxMinor: readonly number[]): number {
  const all = [dropoffUpToMinor ?? 0, ...requestsPreTaxMinor];
  if (!all.every((n) => Number.isSafeInteger(n) && n >= 0)) throw new MoneyError("Authorised amounts must be whole, non-negative minor units.");
  const sum = all.reduce((a, b) => a + b, 0);
  if (!Number.isSafeInteger(sum)) throw new MoneyError("The authorised total is too large.");
  return sum;
}

/**
 * Prices an invoice. Authorised lines are always chargeable. Added lines are taken in order while
 * the pre-tax charge stays within the ceiling (authorised + tolerance; or the authorised lines' own
 * price when recomputing them as one invoice comes to a cent more); the rest are flagged: they
 * need a new approval first. Both comparisons are before tax, as the consent rules compare.
 */
export function priceInvoice(input: PriceInput): PricedInvoice {
  const settings: TotalsSettings = { ...input.settings, subtotalDiscount: input.discount };
  // A core charge and its credit stay out of the discount and supplies: the charge comes back whole.
  const money = (l: InvoiceLine, i: number) => (isCreditLine(l) ? { ...toMoneyLine(l, i), credit: true } : l.source === "core_charge" ? { ...toMoneyLine(l, i), undiscounted: true } : toMoneyLine(l, i));
  const price = (lines: readonly InvoiceLine[]) => totals(lines.map(money), settings);
  const authorised = input.lines.filter((l) => l.source === "authorised");
  // A credit only lowers the charge, so it is always taken, and first: a core charge whose core went
  // back nets to nothing and is never flagged. Any other line (added, core charge) is a charge the
  // owner didn't approve on a request, so it is held to the ceiling like an added line.
  const credits = input.lines.filter(isCreditLine);
  const toleranceMinor = toleranceFor(input.authorisedPreTaxMinor, input.tolerance);
  const ceilingMinor = approvalCeiling(input.authorisedPreTaxMinor, input.tolerance);
  const limit = Math.max(ceilingMinor, price(authorised).preTaxTotalMinor);

  const charged: InvoiceLine[] = [...authorised, ...credits];
  const flagged = new Set<InvoiceLine>();
  for (const line of input.lines) {
    if (line.source === "authorised" || isCreditLine(line)) continue;
    money(line, input.lines.indexOf(line));
    if (price([...charged, line]).preTaxTotalMinor <= limit) charged.push(line);
    else flagged.add(line);
  }
  // Price the charged lines in the invoice's own order so line numbers and shares read naturally.
  const ordered = input.lines.filter((l) => !flagged.has(l));
  const t = price(ordered);
  let k = 0;
  const lines = input.lines.map((line, i): PricedLine => {
    if (flagged.has(line)) return { ...line, no: i + 1, grossMinor: lineTotal(money(line, i)), netMinor: 0, taxMinor: null, flagged: true };
    const b = t.lines[k++]!;
    return { ...line, no: i + 1, grossMinor: b.grossMinor, netMinor: b.netMinor, taxMinor: b.taxMinor, flagged: false };
  });
  return { lines, totals: t, authorisedPreTaxMinor: input.authorisedPreTaxMinor, toleranceMinor, ceilingMinor, flaggedCount: flagged.size };
}

export type MoneyMovement = { kind: PaymentKind; amountMinor: number };

export type Balance = {
  /** Payments and deposits received, less refunds. */
  paidMinor: number;
  depositsMinor: number;
  refundsMinor: number;
  /** total − paid: negative when more was paid than is owed (the difference is owed back). */
  balanceMinor: number;
  state: "nothing_paid" | "part_paid" | "paid" | "overpaid";
};

/** What is left to pay on `totalMinor` after every payment, deposit and refund on the job. */
export function balanceOf(totalMinor: number, movements: readonly MoneyMovement[]): Balance {
  let received = 0;
  let depositsMinor = 0;
  let refundsMinor = 0;
  for (const m of movements) {
    if (!Number.isSafeInteger(m.amountMinor) || m.amountMinor <= 0) throw new MoneyError(`A payment amount must be a positive whole number of minor units (got ${m.amountMinor}).`);
    if (m.kind === "refund") refundsMinor += m.amountMinor;
    else {
      received += m.amountMinor;
      if (m.kind === "deposit") depositsMinor += m.amountMinor;
    }
  }
  const paidMinor = received - refundsMinor;
  const balanceMinor = totalMinor - paidMinor;
  const state = paidMinor <= 0 ? "nothing_paid" : balanceMinor > 0 ? "part_paid" : balanceMinor === 0 ? "paid" : "overpaid";
  return { paidMinor, depositsMinor, refundsMinor, balanceMinor, state };
}

/** The status an issued invoice takes from its balance (drafts and void invoices keep theirs). */
export function statusAfter(status: InvoiceStatus, totalMinor: number, balanceMinor: number): InvoiceStatus {
  if (status !== "issued" && status !== "paid") return status;
  return totalMinor > 0 && balanceMinor <= 0 ? "paid" : "issued";
}

// ---- timeline entries (kinds "invoice" and "payment"): no amounts, followers never read them anyway ----

export type InvoiceEntryBody = { event: "issued" | "void"; invoice: string; number: string };
export type PaymentEntryBody = {
  event: "paid_in_full" | "part_paid" | "deposit_paid" | "deposit_requested" | "refunded";
  invoice: string | null;
  number: string | null;
  method: PaymentMethod | null;
};

export function isInvoiceEntryBody(body: unknown): body is InvoiceEntryBody {
  const b = body as InvoiceEntryBody | null;
  return !!b && typeof b === "object" && (b.event === "issued" || b.event === "void") && typeof b.number === "string";
}

export function isPaymentEntryBody(body: unknown): body is PaymentEntryBody {
  const b = body as PaymentEntryBody | null;
  return !!b && typeof b === "object" && ["paid_in_full", "part_paid", "deposit_paid", "deposit_requested", "refunded"].includes(b.event);
}

export const LINE_SOURCE_LABEL: Record<InvoiceLine["source"], string> = {
  authorised: "Authorised",
  added: "Added on the invoice",
  core_charge: "Core charge, refunded when the old part goes back",
  core_credit: "Core returned: charge refunded",
};

/**
 * An approved line taken off after the owner's answer because its part left the job (issue 19,
 * migration 38): never billed. `reason` is the desk's words (it may name the other job).
 */
export type WithdrawnLine = { no: number; description: string; netMinor: number; reason: string; at: string; by: string | null };

/** What, why, who and when, as the record and the draft print it; `when` already formatted. */
export const withdrawnText = (w: Pick<WithdrawnLine, "description" | "reason" | "by">, when: string) => `${w.description}: ${w.reason} (${w.by ? `${w.by}, ` : ""}${when})`;
