// The shop's parts markup rule: the sell price a priced part line gets from the part's cost. Pure
// (safe in the browser: the finding editor shows the rule's price as the desk types a cost).
// Markup on cost, flat or in bands by cost, is common trade practice, no published source: cheap
// parts carry a bigger percentage than dear ones (e.g. up to $10: +100 %, up to $50: +60 %,
// above: +35 %). The arithmetic is lib/money.ts markUp (exact, rounded half-up once).
import { AppError } from "@/lib/errors";
import { markUp } from "@/lib/money";

/** upToMinor: the band holds costs up to and including it; the last band has null (no limit). */
export type MarkupBand = { upToMinor: number | null; percent: string };
export type MarkupRule = { kind: "none" } | { kind: "percent"; percent: string } | { kind: "bands"; bands: MarkupBand[] };

/** A shop that set nothing types every sell price itself. */
export const NO_MARKUP: MarkupRule = { kind: "none" };
export const MAX_MARKUP_BANDS = 6;

const PERCENT = /^\d{1,4}(?:\.\d{1,4})?$/;

/** Checks a rule read from a form or the database; field errors name `percent` or `bands.N.*`. */
export function checkMarkupRule(rule: MarkupRule): MarkupRule {
  const bad = (field: string, message: string) => new AppError("invalid", message, { [field]: [message] });
  if (rule.kind === "none") return rule;
  if (rule.kind === "percent") {
    if (!PERCENT.test(rule.percent)) throw bad("percent", "Type the markup as a percent, e.g. 35.");
    return rule;
  }
  if (!rule.bands.length || rule.bands.length > MAX_MARKUP_BANDS) throw bad("bands", `Give between 1 and ${MAX_MARKUP_BANDS} bands.`);
  let last = -1;
  rule.bands.forEach((b, i) => {
    if (!PERCENT.test(b.percent)) throw bad(`bands.${i}.percent`, "Type the markup as a percent, e.g. 60.");
    const isLast = i === rule.bands.length - 1;
    if (isLast && b.upToMinor !== null) throw bad(`bands.${i}.upTo`, "Leave the last band open: it holds every dearer part.");
    if (!isLast) {
      if (b.upToMinor === null || !Number.isSafeInteger(b.upToMinor) || b.upToMinor <= last) throw bad(`bands.${i}.upTo`, "Each band must end above the one before it.");
      last = b.upToMinor;
    }
  });
  return rule;
}

/** The percent the rule applies to this cost, or null when the shop has no rule. */
export function markupPercentFor(costMinor: number, rule: MarkupRule): string | null {
  if (rule.kind === "none") return null;
  if (rule.kind === "percent") return rule.percent;
  return (rule.bands.find((b) => b.upToMinor === null || costMinor <= b.upToMinor) ?? rule.bands.at(-1)!).percent;
}

/** The unit sell price the rule gives for a unit cost; null when the shop has no rule. */
export function sellFromCost(costMinor: number, rule: MarkupRule): number | null {
  const percent = markupPercentFor(costMinor, rule);
  return percent === null ? null : markUp(costMinor, percent);
}

/** Reads a stored rule; anything unreadable counts as no rule (prices are then typed). */
export function asMarkupRule(value: unknown): MarkupRule {
  try {
    const v = (typeof value === "string" ? JSON.parse(value) : value) as MarkupRule | null;
    return v && (v.kind === "none" || v.kind === "percent" || v.kind === "bands") ? checkMarkupRule(v) : NO_MARKUP;
  } catch {
    return NO_MARKUP;
  }
}
