// The finding form's state as typed text, and the conversions to and from what the API takes.
import type { DraftLine, EvidenceKind, LineKind, SafetyCategory, ShopMoneySettings, SnapshotTotals } from "@/lib/approvals";
import { currencyDigits, formatHours, formatQuantity, inputText, parseHours, parseMoney, parseQuantity, totals, type Line } from "@/lib/money";
import { type MarkupRule, NO_MARKUP, sellFromCost } from "@/lib/parts-pricing";

export type LineState = {
  key: string;
  id?: number;
  kind: LineKind;
  description: string;
  partNumber: string;
  qty: string;
  hours: string;
  unitPrice: string;
  rate: string;
  amount: string;
  taxable: boolean;
  /** A part line's unit cost (staff only) and why its price differs from the markup rule (issue 19). */
  cost: string;
  priceReason: string;
  /** A job part the line stands for, picked in the editor (sent once; the line keeps it). */
  partId?: number;
  /** A saved part line stands for a new job part instead of its own (before the owner answers). */
  newPart?: boolean;
};
export type EvidenceState = { kind: EvidenceKind; ref: string; momentMs: number | null };
export type FindingState = { title: string; found: string; whyItMatters: string; safety: SafetyCategory; evidence: EvidenceState[]; lines: LineState[] };
/** The shop's settings the editor uses: money parts (the labour rate, the supplies cap) only for people who see money. */
export type EditorSettings = Pick<ShopMoneySettings, "labourRateMinor" | "taxable" | "tax" | "supplies"> & {
  /** The shop's named labour rates (e.g. Diagnosis), empty for someone who doesn't see money. */
  namedRates: { name: string; rateMinor: number }[];
  /** The shop's parts markup rule: no rule for someone who doesn't see money. */
  markup: MarkupRule;
};

/** The sell price the markup rule gives a part line's typed cost, or null (no cost, no rule, unreadable). */
export function ruledPrice(line: Pick<LineState, "kind" | "cost">, markup: MarkupRule = NO_MARKUP, currency: string): number | null {
  if (line.kind !== "part" || !line.cost.trim()) return null;
  try {
    return sellFromCost(parseMoney(line.cost, currency), markup);
  } catch {
    return null;
  }
}

/** The labour rates a priced line can pick from: the default first, then the named ones, as input text. */
export function rateChoices(settings: EditorSettings, currency: string): { label: string; text: string }[] {
  const out = settings.labourRateMinor != null ? [{ label: "Shop rate", text: minorToText(settings.labourRateMinor, currency) }] : [];
  return [...out, ...settings.namedRates.map((r) => ({ label: r.name, text: minorToText(r.rateMinor, currency) }))];
}

let counter = 0;
export const newKey = () => `new-${++counter}`;

/** Minor units as plain text for an input ("1999" → "19.99"), exactly, without a float. */
export function minorToText(minor: number | null, currency: string): string {
  if (minor == null) return "";
  const digits = currencyDigits(currency);
  if (!digits) return String(minor);
  const s = String(minor).padStart(digits + 1, "0");
  return inputText(`${s.slice(0, -digits)}.${s.slice(-digits)}`, currency);
}

/** A stored line as form text; without `prices` (a technician's editor) the price fields start and stay empty. */
export function toLineState(line: DraftLine & { id?: number }, currency: string, prices = true, part?: { costMinor: number | null; priceReason: string | null }): LineState {
  const price = (minor: number | null) => (prices ? minorToText(minor, currency) : "");
  return {
    key: line.id ? `line-${line.id}` : newKey(),
    id: line.id,
    kind: line.kind,
    description: line.description,
    partNumber: line.partNumber ?? "",
    qty: line.qtyThousandths == null ? "1" : inputText(formatQuantity(line.qtyThousandths), currency),
    hours: line.hoursTenths == null ? "" : inputText(formatHours(line.hoursTenths), currency),
    unitPrice: price(line.unitPriceMinor),
    rate: price(line.rateMinor),
    amount: price(line.amountMinor),
    taxable: line.taxable,
    cost: price(part?.costMinor ?? null),
    priceReason: prices ? (part?.priceReason ?? "") : "",
  };
}

export function emptyLine(kind: LineKind, settings: Pick<ShopMoneySettings, "labourRateMinor" | "taxable">, currency: string): LineState {
  return { key: newKey(), kind, description: "", partNumber: "", qty: "1", hours: "", unitPrice: "", rate: kind === "labour" ? minorToText(settings.labourRateMinor, currency) : "", amount: "", taxable: settings.taxable[kind], cost: "", priceReason: "" };
}

/** The request body: prices only from someone who may price (the server refuses them otherwise). */
export function payload(state: FindingState, mayPrice: boolean, version?: number) {
  return {
    ...(version ? { version } : {}),
    title: state.title,
    found: state.found,
    whyItMatters: state.whyItMatters,
    safety: state.safety,
    evidence: state.evidence,
    lines: state.lines.map((l) => ({
      id: l.id,
      kind: l.kind,
      description: l.description,
      partNumber: l.kind === "part" ? l.partNumber : null,
      ...(l.kind === "part" ? { qty: l.qty } : {}),
      ...(l.kind === "labour" ? { hours: l.hours } : {}),
      ...(mayPrice ? { taxable: l.taxable, ...(l.kind === "part" ? { unitPrice: l.unitPrice, cost: l.cost, priceReason: l.priceReason, ...(l.partId ? { partId: l.partId } : {}), ...(l.id && l.newPart ? { newPart: true } : {}) } : l.kind === "labour" ? { rate: l.rate } : { amount: l.amount }) } : {}),
    })),
  };
}

/** Totals of the lines as typed, or the first reason they can't be worked out yet. */
export function preview(lines: LineState[], settings: Pick<ShopMoneySettings, "tax" | "supplies"> & { markup?: MarkupRule }, currency: string): { totals: SnapshotTotals } | { missing: string } {
  if (!lines.length) return { missing: "Add a line to see the estimate." };
  try {
    const money: Line[] = lines.map((l) => {
      // An empty price on a costed part line takes the markup rule's price, as the server will.
      const ruled = l.unitPrice.trim() ? null : ruledPrice(l, settings.markup, currency);
      if (l.kind === "part") return { kind: "part", qtyThousandths: parseQuantity(l.qty, currency), unitPriceMinor: ruled ?? parseMoney(l.unitPrice, currency), taxable: l.taxable };
      if (l.kind === "labour") return { kind: "labour", hoursTenths: parseHours(l.hours, currency), rateMinor: parseMoney(l.rate, currency), taxable: l.taxable };
      return { kind: "fee", amountMinor: parseMoney(l.amount, currency), taxable: l.taxable };
    });
    const t = totals(money, { tax: settings.tax, supplies: settings.supplies });
    return { totals: { subtotalMinor: t.subtotalMinor, suppliesMinor: t.suppliesMinor, taxMinor: t.taxMinor, preTaxTotalMinor: t.preTaxTotalMinor, totalMinor: t.totalMinor } };
  } catch (error) {
    return { missing: `Fill in every price to see the estimate (${(error as Error).message})` };
  }
}
