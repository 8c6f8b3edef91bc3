// Approval requests: what a request shows the owner (its snapshot), the canonical JSON whose
// SHA-256 proves what was shown, and the totals of a decision. Pure: no I/O, safe in the browser
// (the owner's page works out the running total with the same code the server records with).
// Hashing itself lives in lib/server/approval-hash.ts (node:crypto).
import { AppError } from "@/lib/errors";
import { type Line, MoneyError, STRICT_TOLERANCE, type StatusLine, type SuppliesSetting, type TaxSetting, type ToleranceSetting, type Totals, type TotalsSettings, authorisedTotal, totals } from "@/lib/money";

// Parts a rider's safety rests on; the findings.safety column lists the same keys (migrations 07, 28).
export const SAFETY_CATEGORIES = ["none", "brakes", "steering", "suspension", "wheels_tyres", "drivetrain", "fuel", "throttle"] as const;
export type SafetyCategory = (typeof SAFETY_CATEGORIES)[number];
export const EVIDENCE_KINDS = ["photo", "reading", "clip"] as const;
export type EvidenceKind = (typeof EVIDENCE_KINDS)[number];
export const LINE_KINDS = ["part", "labour", "fee"] as const;
export type LineKind = (typeof LINE_KINDS)[number];
export const REQUEST_STATUSES = ["sent", "answered", "withdrawn", "replaced"] as const;
export type RequestStatus = (typeof REQUEST_STATUSES)[number];
export const DECISION_METHODS = ["online", "phone", "in_person"] as const;
export type DecisionMethod = (typeof DECISION_METHODS)[number];
export type LineAnswer = "approved" | "declined";

export const SAFETY_LABEL: Record<SafetyCategory, string> = {
  none: "Not safety-related",
  brakes: "Brakes",
  steering: "Steering",
  suspension: "Suspension",
  wheels_tyres: "Wheels and tyres",
  drivetrain: "Drivetrain (chain, belt or shaft)",
  fuel: "Fuel system",
  throttle: "Throttle",
};
export const LINE_KIND_LABEL: Record<LineKind, string> = { part: "Part", labour: "Labour", fee: "Fee" };
export const METHOD_LABEL: Record<DecisionMethod, string> = { online: "Answered online", phone: "By phone", in_person: "In person" };
export const REQUEST_STATUS_LABEL: Record<RequestStatus, string> = {
  sent: "Waiting for the owner",
  answered: "Answered",
  withdrawn: "Withdrawn",
  replaced: "Replaced by a revision",
};

/**
 * Cautions for findings that touch parts a rider's safety depends on; <Caution> adds the deferral
 * to the maker's service manual, local codes and licensed practice. Our own words: common trade
 * practice, no published source.
 */
export const FINDING_CAUTIONS: Record<Exclude<SafetyCategory, "none">, string> = {
  brakes: "Brakes decide whether the machine can stop. Brake work is finished and tested to the maker's specifications before the machine is ridden.",
  steering: "Steering parts decide whether the machine goes where it is pointed. Worn or loose steering parts are put right before the machine is ridden.",
  suspension: "Suspension keeps the tyres on the ground and the machine steady when braking and turning. Leaking, broken or badly worn suspension parts are put right before the machine is ridden.",
  wheels_tyres: "The tyres are all that holds the machine to the ground. A damaged, worn-out or wrongly inflated tyre, or a loose, cracked or bent wheel, is put right before the machine is ridden.",
  drivetrain: "A chain, belt or shaft that snaps or jumps off can lock the rear wheel or leave the rider without drive. It is put right and adjusted before the machine is ridden.",
  fuel: "A fuel leak can start a fire. The machine shouldn't be run until the fuel system is sealed again; keep sparks and flames away.",
  throttle: "A throttle that sticks or doesn't snap shut can keep the engine pulling after you let go. It is put right before the machine is ridden.",
};

/** The shop's money settings (table shop_money_settings; a shop without a row gets the defaults). */
export type ShopMoneySettings = {
  /** Per hour; null until the shop sets one. */
  labourRateMinor: number | null;
  tax: TaxSetting;
  /** Whether a new line of each kind starts out taxable. */
  taxable: Record<LineKind, boolean>;
  supplies: SuppliesSetting | null;
  tolerance: ToleranceSetting;
  reminderDelayHours: number;
};
export const DEFAULT_MONEY_SETTINGS: ShopMoneySettings = {
  labourRateMinor: null,
  tax: { ratePercent: "0", method: "per_invoice" },
  taxable: { part: true, labour: false, fee: false },
  supplies: null,
  tolerance: STRICT_TOLERANCE,
  reminderDelayHours: 24,
};

export type EvidenceRef = { kind: EvidenceKind; ref: string; momentMs: number | null; label: string | null };

/** A finding line as stored: prices are null until the desk prices it. */
export type DraftLine = {
  kind: LineKind;
  description: string;
  partNumber: string | null;
  qtyThousandths: number | null;
  unitPriceMinor: number | null;
  hoursTenths: number | null;
  rateMinor: number | null;
  amountMinor: number | null;
  taxable: boolean;
};

export type SnapshotLine = DraftLine & { no: number; grossMinor: number; netMinor: number; taxMinor: number | null };
export type SnapshotTotals = Pick<Totals, "subtotalMinor" | "suppliesMinor" | "taxMinor" | "preTaxTotalMinor" | "totalMinor">;
export type Pricing = { tax: TaxSetting; supplies: SuppliesSetting | null };

/** Exactly what a request shows; its canonical JSON is hashed and the decision records that hash. */
export type RequestSnapshot = {
  format: 1;
  request: string;
  job: string;
  version: number;
  currency: string;
  finding: { title: string; found: string; whyItMatters: string | null; safety: SafetyCategory };
  evidence: EvidenceRef[];
  lines: SnapshotLine[];
  pricing: Pricing;
  totals: SnapshotTotals;
};

// ---- canonical JSON ---------------------------------------------------------------------------

/**
 * JSON with object members sorted by UTF-16 code units and no whitespace (RFC 8785, for the
 * values we use: strings, booleans, null and safe integers — so number formatting can't differ
 * between writers). Undefined members are left out, as JSON.stringify does, so a snapshot read
 * back from the database canonicalises to the same text.
 */
export function canonicalJson(value: unknown): string {
  if (value === null) return "null";
  switch (typeof value) {
    case "string":
    case "boolean":
      return JSON.stringify(value);
    case "number":
      if (!Number.isSafeInteger(value)) throw new AppError("invalid", `Canonical JSON holds whole numbers only (got ${value}).`);
      return JSON.stringify(value);
    case "object": {
      if (Array.isArray(value)) return `[${value.map((v) => (v === undefined ? "null" : canonicalJson(v))).join(",")}]`;
      const entries = Object.entries(value as Record<string, unknown>).filter(([, v]) => v !== undefined);
      // The default sort compares UTF-16 code units, which is the order RFC 8785 §3.2.3 asks for.
      const keys = entries.map(([k]) => k).sort();
      const map = new Map(entries);
      return `{${keys.map((k) => `${JSON.stringify(k)}:${canonicalJson(map.get(k))}`).join(",")}}`;
    }
    default:
      throw new AppError("invalid", `Canonical JSON can't hold a ${typeof value}.`);
  }
}

// ---- building a request ------------------------------------------------------------------------

const lineName = (line: DraftLine, i: number) => `Line ${i + 1} (${line.description})`;

/** The money module's line for a priced finding line; says which price is missing otherwise. */
export function toMoneyLine(line: DraftLine, index = 0): Line {
  const missing = (what: string) => new AppError("invalid", `${lineName(line, index)} has no ${what} yet: price it before sending.`, { [`lines.${index}`]: [`Enter the ${what}.`] });
  switch (line.kind) {
    case "part":
      if (line.qtyThousandths == null || line.qtyThousandths <= 0) throw missing("quantity");
      if (line.unitPriceMinor == null) throw missing("unit price");
      return { kind: "part", qtyThousandths: line.qtyThousandths, unitPriceMinor: line.unitPriceMinor, taxable: line.taxable };
    case "labour":
      if (line.hoursTenths == null || line.hoursTenths <= 0) throw missing("hours");
      if (line.rateMinor == null) throw missing("labour rate");
      return { kind: "labour", hoursTenths: line.hoursTenths, rateMinor: line.rateMinor, taxable: line.taxable };
    case "fee":
      if (line.amountMinor == null) throw missing("amount");
      return { kind: "fee", amountMinor: line.amountMinor, taxable: line.taxable };
    default:
      throw new MoneyError(`Unknown line kind ${JSON.stringify((line as { kind?: unknown }).kind)}.`);
  }
}

export function pricingSettings(pricing: Pricing): TotalsSettings {
  return { tax: pricing.tax, supplies: pricing.supplies };
}

function pickTotals(t: Totals): SnapshotTotals {
  return { subtotalMinor: t.subtotalMinor, suppliesMinor: t.suppliesMinor, taxMinor: t.taxMinor, preTaxTotalMinor: t.preTaxTotalMinor, totalMinor: t.totalMinor };
}

/** Prices every line with the shop's settings of the moment and freezes the result. */
export function buildSnapshot(input: {
  request: string;
  job: string;
  version: number;
  currency: string;
  finding: RequestSnapshot["finding"];
  evidence: EvidenceRef[];
  lines: DraftLine[];
  pricing: Pricing;
}): RequestSnapshot {
  if (!input.lines.length) throw new AppError("invalid", "Add at least one line (a part, labour or a fee) before sending.");
  const money = input.lines.map(toMoneyLine);
  const t = totals(money, pricingSettings(input.pricing));
  return {
    format: 1,
    request: input.request,
    job: input.job,
    version: input.version,
    currency: input.currency.toUpperCase(),
    finding: input.finding,
    evidence: input.evidence.map((e) => ({ kind: e.kind, ref: e.ref, momentMs: e.momentMs, label: e.label })),
    lines: input.lines.map((line, i) => ({ ...line, no: i + 1, grossMinor: t.lines[i]!.grossMinor, netMinor: t.lines[i]!.netMinor, taxMinor: t.lines[i]!.taxMinor })),
    pricing: input.pricing,
    totals: pickTotals(t),
  };
}

/** What the owner is asked about, without the request's own id and version: equal when nothing changed. */
export function snapshotContent(s: RequestSnapshot): string {
  return canonicalJson({ currency: s.currency, finding: s.finding, evidence: s.evidence, lines: s.lines, pricing: s.pricing, totals: s.totals });
}

// ---- answers and decision totals ------------------------------------------------------------------

export type Answers = Record<number, LineAnswer>;

/** Every line answered once, approved or declined, and nothing else; field errors name the lines. */
export function checkAnswers(snapshot: RequestSnapshot, given: readonly { no: number; answer: string }[]): Answers {
  const answers: Answers = {};
  const fields: Record<string, string[]> = {};
  const known = new Set(snapshot.lines.map((l) => l.no));
  for (const a of given) {
    if (!known.has(a.no)) fields[`lines.${a.no}`] = ["This request has no such line."];
    else if (a.answer !== "approved" && a.answer !== "declined") fields[`lines.${a.no}`] = ["Approve or decline this line."];
    else if (answers[a.no]) fields[`lines.${a.no}`] = ["This line was answered twice."];
    else answers[a.no] = a.answer;
  }
  for (const line of snapshot.lines) {
    if (!answers[line.no] && !fields[`lines.${line.no}`]) fields[`lines.${line.no}`] = [`Approve or decline “${line.description}”.`];
  }
  const problems = Object.keys(fields).length;
  if (problems) throw new AppError("invalid", problems === 1 ? "One line still needs an answer." : `${problems} lines still need an answer.`, fields);
  return answers;
}

export type DecisionTotals = {
  estimate: SnapshotTotals;
  authorised: SnapshotTotals;
  approvedCount: number;
  declinedCount: number;
  /** Pre-tax amount of what was declined: estimate minus authorised. */
  declinedPreTaxMinor: number;
};

/**
 * The estimate as sent against what the answers authorise. Answers may be partial (the owner's
 * running total while choosing): unanswered lines authorise nothing. The authorised total is the
 * approved lines priced alone with the same settings (supplies and tax recomputed on them).
 */
export function decisionTotals(snapshot: RequestSnapshot, answers: Partial<Answers>): DecisionTotals {
  const settings = pricingSettings(snapshot.pricing);
  const lines: StatusLine[] = snapshot.lines.map((l, i) => ({ ...toMoneyLine(l, i), status: answers[l.no] ?? "pending" }));
  const authorised = pickTotals(authorisedTotal(lines, settings));
  return {
    estimate: snapshot.totals,
    authorised,
    approvedCount: lines.filter((l) => l.status === "approved").length,
    declinedCount: lines.filter((l) => l.status === "declined").length,
    declinedPreTaxMinor: snapshot.totals.preTaxTotalMinor - authorised.preTaxTotalMinor,
  };
}

/** Reads a stored snapshot back, refusing anything that isn't one (a damaged row is not answered). */
export function asSnapshot(value: unknown): RequestSnapshot {
  const s = value as RequestSnapshot | null;
  if (!s || s.format !== 1 || !Array.isArray(s.lines) || !Array.isArray(s.evidence) || !s.finding || !s.totals || !s.pricing) {
    throw new AppError("conflict", "This request's record is damaged and can't be answered. Ask the shop to send it again.");
  }
  return s;
}
