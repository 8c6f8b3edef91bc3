// Money for approval requests and invoices. Pure (no I/O), safe in the browser and on the server.
// Amounts are integer minor units (cents, yen, fils) held in `number` and checked with
// Number.isSafeInteger; products and tax are worked in BigInt so nothing passes through a float.
// Percents (tax, discounts, supplies, tolerance) are decimal strings ("8.25", "8.875", "10.0000" as
// MariaDB returns DECIMAL columns) read exactly, so 8.25 % is 825/10000 and never 0.08249999….
import { iso4217Digits } from "@/lib/currency-minor-units";
import { AppError } from "@/lib/errors";
import { exampleIn, numberStyleFor, parseNumberInput } from "@/lib/number-input";

/** Thrown for any bad amount, rate or line; an `invalid` AppError, so handlers answer 422 with the message. */
export class MoneyError extends AppError {
  constructor(message: string) {
    super("invalid", message);
    this.name = "MoneyError";
  }
}

/** A percent as a decimal string, 0–100, up to 6 decimals: "8.25" means 8.25 %. */
export type Percent = string;
export type Discount = { kind: "amount"; amountMinor: number } | { kind: "percent"; percent: Percent };

/**
 * credit: the line gives its amount back (a returned core, issue 19): it counts negative, with its
 * tax, takes no discount and stays out of the discount and shop-supplies bases. undiscounted: a
 * charge kept out of those bases too (a core charge: held, then given back whole as its credit).
 */
type LineCommon = { taxable: boolean; discount?: Discount | null; credit?: boolean; undiscounted?: boolean };
/** Quantity in thousandths so fluids and chain sold by length fit: 1000 = 1 unit, 1500 = 1.5 L. */
export type PartLine = LineCommon & { kind: "part"; qtyThousandths: number; unitPriceMinor: number };
/** Hours in integer tenths (15 = 1.5 h), the way labour time is booked; rate per hour. */
export type LabourLine = LineCommon & { kind: "labour"; hoursTenths: number; rateMinor: number };
export type FeeLine = LineCommon & { kind: "fee"; amountMinor: number };
export type Line = PartLine | LabourLine | FeeLine;

export type TaxMethod = "per_line" | "per_invoice";
/**
 * ratePercent is the shop's rate; kindRates, when present, gives labour, fees or the supplies fee
 * a rate of their own (a part always takes ratePercent). Absent means every kind takes ratePercent,
 * so settings and snapshots sealed before kinds had rates of their own read and hash as they did.
 */
export type TaxSetting = { ratePercent: Percent; method: TaxMethod; kindRates?: TaxKindRates };
export type TaxKindRates = Partial<Record<"labour" | "fee" | "supplies", Percent>>;
/** capMinor: the largest fee, null for no cap. */
export type SuppliesSetting = { percent: Percent; base: "labour" | "parts_and_labour"; capMinor: number | null; taxable: boolean };
export type TotalsSettings = { tax: TaxSetting; supplies?: SuppliesSetting | null; subtotalDiscount?: Discount | null };

export type LineBreakdown = {
  grossMinor: number;
  lineDiscountMinor: number;
  /** This line's share of the subtotal discount. */
  subtotalDiscountShareMinor: number;
  netMinor: number;
  taxable: boolean;
  /** Tax on this line when the method is per_line; null for per_invoice (tax exists only on the whole). */
  taxMinor: number | null;
};
export type Totals = {
  lines: LineBreakdown[];
  /** Sum of the lines before any discount. */
  subtotalMinor: number;
  lineDiscountsMinor: number;
  subtotalDiscountMinor: number;
  /** lineDiscountsMinor + subtotalDiscountMinor. */
  discountsMinor: number;
  suppliesMinor: number;
  /** Net taxable lines, plus the supplies fee when it is taxable. */
  taxableBaseMinor: number;
  /** per_line: the line taxes plus the supplies fee's own tax when taxable; per_invoice: tax on the base. */
  taxMinor: number;
  /** The tax by rate, lowest rate first (one entry when every kind shares the shop's rate). */
  taxByRate: { ratePercent: Percent; baseMinor: number; taxMinor: number }[];
  /** subtotal − discounts + supplies: what estimate/authorisation comparisons use. */
  preTaxTotalMinor: number;
  totalMinor: number;
};

// ---- checks and exact arithmetic -------------------------------------------------------------

/** Checks a stored integer (minor units, tenths, thousandths); `what` names the unit for the message. */
function assertInt(value: unknown, what: string, allowNegative = false): number {
  if (typeof value !== "number" || !Number.isSafeInteger(value)) throw new MoneyError(`${what} must be a whole number, got ${String(value)}.`);
  if (!allowNegative && value < 0) throw new MoneyError(`${what} can't be negative (got ${value}).`);
  return value;
}

function toSafe(value: bigint, what: string): number {
  const n = Number(value);
  if (!Number.isSafeInteger(n)) throw new MoneyError(`${what} is too large to handle exactly.`);
  return n;
}

/** num/den rounded half-up (num, den ≥ 0): the exact value is rounded once, never in steps. */
function divHalfUp(num: bigint, den: bigint): bigint {
  return (2n * num + den) / (2n * den);
}

/** A percent read exactly, as a fraction of the whole: "8.25" → 825n / 10000n. */
export type PercentFraction = { num: bigint; den: bigint };

/** Reads a Percent exactly, or throws MoneyError (use it to validate settings forms). */
export function parsePercent(text: Percent, what = "Percent"): PercentFraction {
  const m = typeof text === "string" ? /^(\d{1,3})(?:\.(\d{1,6}))?$/.exec(text.trim()) : null;
  if (!m) throw new MoneyError(`${what} must be a number of percent like "8.25" (got ${JSON.stringify(text)}).`);
  const decimals = m[2] ?? "";
  const num = BigInt(m[1]! + decimals);
  const den = 100n * 10n ** BigInt(decimals.length);
  if (num > den) throw new MoneyError(`${what} can't be more than 100 % (got ${text}).`);
  return { num, den };
}

function percentOf(amountMinor: number, pct: PercentFraction, mode: "half_up" | "floor"): bigint {
  const num = BigInt(amountMinor) * pct.num;
  return mode === "floor" ? num / pct.den : divHalfUp(num, pct.den);
}

// ---- currencies: parsing and formatting ------------------------------------------------------

/** ISO 4217 minor-unit digits (lib/currency-minor-units.ts, checked against `currency-codes`; Intl disagrees for some codes). */
export function currencyDigits(currency: string): number {
  const digits = typeof currency === "string" && /^[A-Za-z]{3}$/.test(currency) ? iso4217Digits(currency) : undefined;
  if (digits === undefined) throw new MoneyError(`Unknown currency code ${JSON.stringify(currency)}: use an ISO 4217 code like "USD".`);
  return digits;
}

/** Canonical "1234.5" (from readTyped) with `scale` allowed decimals → integer in units of 10^-scale. */
function parseScaled(text: string, scale: number, what: string, example: string, allowNegative: boolean): bigint {
  const m = typeof text === "string" ? /^(-)?(\d{1,3}(?:,\d{3})+|\d*)(?:\.(\d+))?$/.exec(text.trim()) : null;
  if (!m || (m[2] === "" && m[3] === undefined)) {
    throw new MoneyError(`${JSON.stringify(text)} is not a valid ${what}. Use digits with an optional decimal point, e.g. ${example}.`);
  }
  // Zeros past the scale change nothing ("1.2500" L is 1250 thousandths): a CAD field may show one more.
  const typedFraction = m[3] ?? "";
  const fraction = typedFraction.length > scale && /^0+$/.test(typedFraction.slice(scale)) ? typedFraction.slice(0, scale) : typedFraction;
  if (fraction.length > scale) {
    throw new MoneyError(scale === 0 ? `A ${what} here has no decimal places (got ${text.trim()}).`
      : `A ${what} has at most ${scale} decimal place${scale === 1 ? "" : "s"} (got ${text.trim()}).`);
  }
  const value = BigInt((m[2] ?? "").replaceAll(",", "") + fraction.padEnd(scale, "0") || "0");
  if (m[1] && value !== 0n && !allowNegative) throw new MoneyError(`A ${what} can't be negative (got ${text.trim()}).`);
  return m[1] ? -value : value;
}

/**
 * What someone typed → canonical text ("1234.5"), read by the one number reader in the style of the
 * shop's currency (lib/number-input.ts), so money reads "1,200" exactly as torque does. A text with
 * two readings, or written in another convention, is refused with the reader's message.
 */
function readTyped(text: string, currency: string, what: string): string {
  const style = numberStyleFor(currency);
  const read = parseNumberInput(typeof text === "string" ? text : "", style, { allowNegative: true, what: "The amount" });
  if (read.ok) return read.canonical;
  if (read.readings.length) throw new MoneyError(`${JSON.stringify(text)} is not a valid ${what}: ${read.message}`);
  throw new MoneyError(`${JSON.stringify(text)} is not a valid ${what}. Use digits with an optional decimal mark, e.g. ${exampleIn(style)}.`);
}

/** User input ("12.50", "1,234.5", "-3" if allowed; "12,50" in a comma shop) → minor units of `currency`. */
export function parseMoney(text: string, currency: string, options: { allowNegative?: boolean } = {}): number {
  const digits = currencyDigits(currency);
  const example = digits === 0 ? "1,234" : `1,234.${"5".padEnd(digits, "0")}`;
  const what = `${currency.toUpperCase()} amount`;
  return toSafe(parseScaled(readTyped(text, currency, what), digits, what, example, options.allowNegative ?? false), "The amount");
}

/** "1.5" hours → 15 tenths; "1.25" is refused. Read in the style of the shop's `currency`. */
export function parseHours(text: string, currency = "USD"): number {
  return toSafe(parseScaled(readTyped(text, currency, "number of hours"), 1, "number of hours", "1.5", false), "The hours");
}

/** "2" → 2000, "1.25" → 1250 thousandths. Read in the style of the shop's `currency`. */
export function parseQuantity(text: string, currency = "USD"): number {
  return toSafe(parseScaled(readTyped(text, currency, "quantity"), 3, "quantity", "1.5", false), "The quantity");
}

/** Canonical text ("1234.50") as a field in the shop's style shows it ("1234,50"): no grouping, exact. */
export function inputText(canonical: string, currency: string): string {
  const style = numberStyleFor(currency);
  const text = style.decimal === "," ? canonical.replace(".", ",") : canonical;
  // Where a lone mark before three digits has two readings (CAD), one more zero keeps it one.
  return !style.firm && /^-?[1-9]\d{0,2}[.,]\d{3}$/.test(text) ? `${text}0` : text;
}

/** Integer in units of 10^-scale → plain decimal string ("-1234.50"), exact for any safe integer. */
function scaledToString(value: number, scale: number): string {
  const abs = (value < 0 ? -BigInt(value) : BigInt(value)).toString().padStart(scale + 1, "0");
  const body = scale === 0 ? abs : `${abs.slice(0, -scale)}.${abs.slice(-scale)}`;
  return value < 0 ? `-${body}` : body;
}

/** 15 → "1.5"; 20 → "2". */
export function formatHours(hoursTenths: number): string {
  return scaledToString(assertInt(hoursTenths, "Hours (tenths)"), 1).replace(/\.0$/, "");
}

/** 1500 → "1.5"; 2000 → "2". */
export function formatQuantity(qtyThousandths: number): string {
  return scaledToString(assertInt(qtyThousandths, "Quantity (thousandths)"), 3).replace(/\.?0+$/, "");
}

/** Minor units → localised currency text, always with the ISO number of decimals ("$1,234.50", "KWD 1.234"). */
export function formatMoney(minor: number, currency: string, locale = "en-US"): string {
  const digits = currencyDigits(currency);
  assertInt(minor, "Amount (minor units)", true);
  const options = { style: "currency", currency: currency.toUpperCase(), minimumFractionDigits: digits, maximumFractionDigits: digits } as const;
  // A decimal string is formatted exactly (Intl.NumberFormat v3); a float could misplace the last digit.
  return new Intl.NumberFormat(locale, options).format(scaledToString(minor, digits) as `${number}`);
}

// ---- lines, discounts, supplies, tax ---------------------------------------------------------

/**
 * A line's amount before discounts: qty × price and hours × rate, each rounded half-up to the minor
 * unit once from the exact product (common trade practice, no published source).
 */
export function lineTotal(line: Line): number {
  switch (line?.kind) {
    case "part": {
      const qty = assertInt(line.qtyThousandths, "Part quantity (thousandths)");
      const price = assertInt(line.unitPriceMinor, "Part unit price (minor units)");
      return toSafe(divHalfUp(BigInt(qty) * BigInt(price), 1000n), "The part line");
    }
    case "labour": {
      const tenths = assertInt(line.hoursTenths, "Labour hours (tenths)");
      const rate = assertInt(line.rateMinor, "Labour rate (minor units)");
      return toSafe(divHalfUp(BigInt(tenths) * BigInt(rate), 10n), "The labour line");
    }
    case "fee":
      return assertInt(line.amountMinor, "Fee amount (minor units)");
    default:
      throw new MoneyError(`Unknown line kind ${JSON.stringify((line as { kind?: unknown } | null)?.kind)}: use part, labour or fee.`);
  }
}

/** The discount on `amountMinor`, never more than the amount itself (so nothing goes below zero). */
export function discountAmount(amountMinor: number, discount: Discount | null | undefined): number {
  assertInt(amountMinor, "Discounted amount (minor units)");
  if (!discount) return 0;
  if (discount.kind === "amount") return Math.min(assertInt(discount.amountMinor, "Discount amount (minor units)"), amountMinor);
  if (discount.kind === "percent") return toSafe(percentOf(amountMinor, parsePercent(discount.percent, "Discount percent"), "half_up"), "The discount");
  throw new MoneyError(`Unknown discount kind ${JSON.stringify((discount as { kind?: unknown }).kind)}: use amount or percent.`);
}

/**
 * A unit cost marked up by `percent` (which may pass 100: "150" is cost × 2.5): the exact
 * cost × (100 + percent) / 100 rounded half-up to the minor unit once, as lineTotal rounds (common
 * trade practice, no published source). Up to 4 decimals of percent.
 */
export function markUp(costMinor: number, percent: Percent): number {
  const cost = assertInt(costMinor, "Part cost (minor units)");
  const m = typeof percent === "string" ? /^(\d{1,4})(?:\.(\d{1,4}))?$/.exec(percent.trim()) : null;
  if (!m) throw new MoneyError(`A markup must be a number of percent like "35" or "62.5" (got ${JSON.stringify(percent)}).`);
  const decimals = m[2] ?? "";
  const den = 100n * 10n ** BigInt(decimals.length);
  return toSafe(divHalfUp(BigInt(cost) * (den + BigInt(m[1]! + decimals)), den), "The marked-up price");
}

/** Splits `total` across `weights` in proportion, remainders to the largest fractions (ties: earlier first). */
function allocate(total: number, weights: number[]): number[] {
  const sum = weights.reduce((a, b) => a + BigInt(b), 0n);
  if (total === 0 || sum === 0n) return weights.map(() => 0);
  const exact = weights.map((w) => ({ floor: (BigInt(total) * BigInt(w)) / sum, rem: (BigInt(total) * BigInt(w)) % sum }));
  let left = BigInt(total) - exact.reduce((a, e) => a + e.floor, 0n);
  const order = exact.map((_, i) => i).sort((a, b) => (exact[b]!.rem > exact[a]!.rem ? 1 : exact[b]!.rem < exact[a]!.rem ? -1 : a - b));
  const shares = exact.map((e) => e.floor);
  for (const i of order) {
    if (left === 0n) break;
    shares[i]! += 1n;
    left -= 1n;
  }
  return shares.map((s) => Number(s));
}

/**
 * Invoice or estimate totals; `lines[i]` of the result is the breakdown of `lines[i]`. Order: line
 * discounts → subtotal discount (shared across lines in proportion to their net, so per-line tax
 * sees it) → shop-supplies fee, half-up and capped, on the discounted labour (or parts + labour) →
 * tax. The first three are common trade practice, no published source. Tax per SSUTA §324 / RCW 82.08.054: the exact tax, rounded half-up to
 * the minor unit once — per taxable line (supplies counting as one line) or once on the taxable base.
 */
export function totals(lines: readonly Line[], settings: TotalsSettings): Totals {
  if (!Array.isArray(lines)) throw new MoneyError("Lines must be a list.");
  parsePercent(settings?.tax?.ratePercent, "Tax rate");
  const method = settings.tax.method;
  if (method !== "per_line" && method !== "per_invoice") throw new MoneyError(`Tax method must be per_line or per_invoice (got ${JSON.stringify(method)}).`);

  const bad = lines.find((line) => typeof line?.taxable !== "boolean");
  if (bad) throw new MoneyError(`Each line needs taxable: true or false (got ${JSON.stringify(bad?.taxable)}).`);
  if (lines.some((line) => line.credit && line.discount)) throw new MoneyError("A credit line takes no discount.");
  const gross = lines.map((line) => (line.credit ? -lineTotal(line) : lineTotal(line)));
  const lineDiscounts = lines.map((line, i) => (line.credit ? 0 : discountAmount(gross[i]!, line.discount)));
  const afterLine = gross.map((g, i) => g - lineDiscounts[i]!);
  // The subtotal discount is taken on, and shared across, the charged lines only (credits give back
  // what they say, and an undiscounted charge is given back whole).
  const outside = (line: Line) => line.credit || line.undiscounted;
  const charged = afterLine.map((a, i) => (outside(lines[i]!) ? 0 : a));
  const afterLineSum = charged.reduce((a, b) => a + b, 0);
  const subtotalDiscount = discountAmount(toSafe(BigInt(afterLineSum), "The subtotal"), settings.subtotalDiscount);
  const shares = allocate(subtotalDiscount, charged);
  const net = afterLine.map((a, i) => a - shares[i]!);

  let suppliesMinor = 0;
  const supplies = settings.supplies;
  if (supplies) {
    if (supplies.base !== "labour" && supplies.base !== "parts_and_labour") throw new MoneyError("Shop-supplies base must be labour or parts_and_labour.");
    const base = lines.reduce((sum, line, i) => (!outside(line) && (line.kind === "labour" || (line.kind === "part" && supplies.base === "parts_and_labour")) ? sum + net[i]! : sum), 0);
    suppliesMinor = toSafe(percentOf(base, parsePercent(supplies.percent, "Shop-supplies percent"), "half_up"), "The supplies fee");
    if (supplies.capMinor != null) suppliesMinor = Math.min(suppliesMinor, assertInt(supplies.capMinor, "Shop-supplies cap (minor units)"));
  }

  // Each taxable amount with the rate of its kind; per_invoice rounds once per rate on that rate's base.
  // Rates keyed by their trimmed text, so "8.250000" (as the database gives it) and "8.25" group as one.
  const trim = (text: Percent) => (typeof text === "string" && text.includes(".") ? text.replace(/0+$/, "").replace(/\.$/, "") : text);
  const rateText = (kind: "part" | "labour" | "fee" | "supplies"): Percent => trim((kind === "part" ? undefined : settings.tax.kindRates?.[kind]) ?? settings.tax.ratePercent);
  const taxableItems: { amount: number; rate: Percent }[] = lines.flatMap((line, i) => (line.taxable ? [{ amount: net[i]!, rate: rateText(line.kind) }] : []));
  if (supplies?.taxable && suppliesMinor > 0) taxableItems.push({ amount: suppliesMinor, rate: rateText("supplies") });
  const parsed = new Map<Percent, PercentFraction>();
  const fraction = (text: Percent) => parsed.get(text) ?? parsed.set(text, parsePercent(text, "Tax rate")).get(text)!;
  // Every configured rate is checked, used or not: a bad setting is refused, never silently skipped.
  for (const kind of ["part", "labour", "fee", "supplies"] as const) fraction(rateText(kind));
  // A credit's tax is the tax of the same charge, given back: rounded on the amount, then negated.
  const taxOn = (amount: number, text: Percent): number => {
    if (amount < 0) return -taxOn(-amount, text);
    const r = fraction(text);
    return toSafe(divHalfUp(BigInt(amount) * r.num, r.den), "The tax");
  };
  const byRate = new Map<Percent, { baseMinor: number; taxMinor: number }>();
  for (const item of taxableItems) {
    const group = byRate.get(item.rate) ?? { baseMinor: 0, taxMinor: 0 };
    group.baseMinor = toSafe(BigInt(group.baseMinor) + BigInt(item.amount), "The taxable base");
    if (method === "per_line") group.taxMinor += taxOn(item.amount, item.rate);
    byRate.set(item.rate, group);
  }
  if (method === "per_invoice") for (const [text, group] of byRate) group.taxMinor = taxOn(group.baseMinor, text);
  const taxByRate = [...byRate]
    .map(([ratePercent, g]) => ({ ratePercent, ...g }))
    .sort((a, b) => Number(fraction(a.ratePercent).num * fraction(b.ratePercent).den - fraction(b.ratePercent).num * fraction(a.ratePercent).den));
  const taxableBaseMinor = toSafe(BigInt(taxableItems.reduce((a, b) => a + b.amount, 0)), "The taxable base");
  const taxMinor = taxByRate.reduce((sum, g) => sum + g.taxMinor, 0);

  const subtotalMinor = gross.reduce((a, b) => a + b, 0);
  const lineDiscountsMinor = lineDiscounts.reduce((a, b) => a + b, 0);
  const discountsMinor = lineDiscountsMinor + subtotalDiscount;
  const preTaxTotalMinor = subtotalMinor - discountsMinor + suppliesMinor;
  return {
    lines: lines.map((line, i) => ({
      grossMinor: gross[i]!,
      lineDiscountMinor: lineDiscounts[i]!,
      subtotalDiscountShareMinor: shares[i]!,
      netMinor: net[i]!,
      taxable: line.taxable,
      taxMinor: method === "per_line" ? (line.taxable ? taxOn(net[i]!, rateText(line.kind)) : 0) : null,
    })),
    subtotalMinor: toSafe(BigInt(subtotalMinor), "The subtotal"),
    lineDiscountsMinor,
    subtotalDiscountMinor: subtotalDiscount,
    discountsMinor,
    suppliesMinor,
    taxableBaseMinor,
    taxMinor,
    taxByRate,
    preTaxTotalMinor: toSafe(BigInt(preTaxTotalMinor), "The pre-tax total"),
    totalMinor: toSafe(BigInt(preTaxTotalMinor + taxMinor), "The total"),
  };
}

/** How a tax row names its rates: "Tax (8.25 %)", or each kind's rate when they differ. */
export function taxLabel(tax: TaxSetting): string {
  const trim = (text: Percent) => (text.includes(".") ? text.replace(/0+$/, "").replace(/\.$/, "") : text);
  const base = trim(tax.ratePercent);
  const own = (["labour", "fee", "supplies"] as const).filter((k) => tax.kindRates?.[k] != null && trim(tax.kindRates[k]!) !== base);
  if (!own.length) return `Tax (${base} %)`;
  const names = { labour: "labour", fee: "fees", supplies: "supplies" } as const;
  return `Tax (parts ${base} %, ${own.map((k) => `${names[k]} ${trim(tax.kindRates![k]!)} %`).join(", ")})`;
}

// ---- estimate, authorisation, tolerance ------------------------------------------------------

export type ApprovalStatus = "approved" | "declined" | "pending";
export type StatusLine = Line & { status: ApprovalStatus };

/** Totals of the approved lines only: pending and declined lines authorise nothing. */
export function authorisedTotal(lines: readonly StatusLine[], settings: TotalsSettings): Totals {
  const bad = lines.find((line) => !["approved", "declined", "pending"].includes(line?.status));
  if (bad) throw new MoneyError(`Line status must be approved, declined or pending (got ${JSON.stringify(bad.status)}).`);
  return totals(lines.filter((line) => line.status === "approved"), settings);
}

/**
 * How far a charge may exceed the estimate without new consent. "strict" (the default) allows no
 * increase. "greater_of" is max(fixed, percent × estimate), then capped when capMinor is set
 * (Florida §559.909: greater of $10 or 10 %, capped at $50; Maryland §14-1002(b): 10 %, no fixed, no cap).
 */
export type ToleranceSetting = { kind: "strict" } | { kind: "greater_of"; fixedMinor: number; percent: Percent; capMinor?: number | null };
export const STRICT_TOLERANCE: ToleranceSetting = { kind: "strict" };

/**
 * The allowed increase in minor units for a pre-tax estimate. The percent part is rounded down: an
 * increase of whole cents exceeds the exact limit exactly when it exceeds the floor, so nothing is lost.
 */
export function toleranceFor(estimatePreTaxMinor: number, setting: ToleranceSetting = STRICT_TOLERANCE): number {
  assertInt(estimatePreTaxMinor, "Estimate (minor units)");
  if (setting?.kind === "strict") return 0;
  if (setting?.kind !== "greater_of") throw new MoneyError('Tolerance kind must be "strict" or "greater_of".');
  const pct = toSafe(percentOf(estimatePreTaxMinor, parsePercent(setting.percent, "Tolerance percent"), "floor"), "The tolerance");
  const allowed = Math.max(assertInt(setting.fixedMinor, "Tolerance fixed amount (minor units)"), pct);
  return setting.capMinor == null ? allowed : Math.min(allowed, assertInt(setting.capMinor, "Tolerance cap (minor units)"));
}

/** The most that may be charged (pre-tax) without new consent. */
export function approvalCeiling(estimatePreTaxMinor: number, setting: ToleranceSetting = STRICT_TOLERANCE): number {
  return toSafe(BigInt(estimatePreTaxMinor) + BigInt(toleranceFor(estimatePreTaxMinor, setting)), "The ceiling");
}

/**
 * Whether `proposedPreTaxMinor` needs the owner's approval against `estimatePreTaxMinor`. Both are
 * PRE-TAX totals (Totals.preTaxTotalMinor): the consent rules compare charges without sales tax.
 */
export function needsApproval(estimatePreTaxMinor: number, proposedPreTaxMinor: number, setting: ToleranceSetting = STRICT_TOLERANCE): boolean {
  assertInt(proposedPreTaxMinor, "Proposed total (minor units)");
  return proposedPreTaxMinor > approvalCeiling(estimatePreTaxMinor, setting);
}
