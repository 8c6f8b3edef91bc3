// How a reading reads, wherever it is shown (bench page, timeline, e-mails, an approval's
// evidence): its value at the resolution it was typed with, its limit, its source and its verdict,
// in one place so the owner never gets the number without the limit. Pure: safe in the browser.
import type { ChainSnapshot, ReadingBody, ReadingDecimals } from "@/lib/bench";
import { plainNumber } from "@/lib/bench";
import { type ReadingVerdict, evaluateReading } from "@/lib/readings";
import { formatFixed } from "@/lib/rounding";

/** What any stored form of a reading (timeline body, table row, evidence choice) has. */
export type ReadingLike = Pick<ReadingBody, "label" | "value" | "unit" | "min" | "max" | "source" | "verdict"> & {
  chain?: ChainSnapshot | null;
  /** The snapshot's own margin words; computed when absent. */
  marginText?: string | null;
  decimals?: Partial<ReadingDecimals> | null;
};

/** A number at its typed resolution ("0.20"); without one, as before (no trailing zeros). */
export function atResolution(n: number, decimals: number | null | undefined): string {
  // A snapshot is JSON from the database: anything but a sensible count reads as "not known".
  return Number.isInteger(decimals) && decimals! >= 0 && decimals! <= 12 ? formatFixed(n, decimals!) : plainNumber(n);
}

const withUnit = (text: string, unit: string | null) => (unit ? `${text} ${unit}` : text);

/** "0.20 mm". */
export function readingValueText(r: Pick<ReadingLike, "value" | "unit" | "decimals">): string {
  return withUnit(atResolution(r.value, r.decimals?.value), r.unit);
}

/** "0.10–0.20 mm", "at least 4.5 mm", "at most 3 %", or null with no limit. */
export function readingLimitText(r: Pick<ReadingLike, "min" | "max" | "unit" | "decimals">): string | null {
  const lo = r.min == null ? null : atResolution(r.min, r.decimals?.min);
  const hi = r.max == null ? null : atResolution(r.max, r.decimals?.max);
  if (lo != null && hi != null) return withUnit(`${lo}–${hi}`, r.unit);
  if (lo != null) return `at least ${withUnit(lo, r.unit)}`;
  if (hi != null) return `at most ${withUnit(hi, r.unit)}`;
  return null;
}

/** Chain wear, judged "replace" once it reaches the limit (lib/chain-wear.ts), in its own words. */
function chainMargin(value: number, limitPct: number): string {
  const gap = formatFixed(Math.abs(value - limitPct), 2);
  return value >= limitPct - 1e-9 ? `at or past the replace-at limit by ${gap} %` : `${gap} % short of the replace-at limit`;
}

/** "0.04 mm under the minimum", "at the maximum"… or null with no limit. */
export function readingMarginText(r: ReadingLike): string | null {
  if (r.marginText !== undefined) return r.marginText;
  if (r.verdict === "no_limit") return null;
  if (r.chain && r.max != null) return chainMargin(r.value, r.max);
  const d = r.decimals;
  const decimals = d ? Math.max(d.value ?? 0, d.min ?? 0, d.max ?? 0) : null;
  return evaluateReading({ value: r.value, min: r.min, max: r.max, unit: r.unit, decimals }).marginText ?? null;
}

const VERDICT_WORDS: Record<ReadingVerdict, string> = {
  within: "within the limit",
  above: "OUT OF LIMIT",
  below: "OUT OF LIMIT",
  no_limit: "no limit given",
};

/** The verdict with its margin: "OUT OF LIMIT: 0.04 mm under the minimum". */
export function readingVerdictText(r: ReadingLike): string {
  const margin = readingMarginText(r);
  return margin ? `${VERDICT_WORDS[r.verdict]}: ${margin}` : VERDICT_WORDS[r.verdict];
}

/** Why a chain's limit is tighter than the shop's: the 200/N rule (lib/chain-wear.ts). */
export function chainLimitReason(chain: ChainSnapshot | null | undefined): string | null {
  if (!chain?.sprocketTeeth || chain.shopLimitPct == null || chain.shopLimitPct === chain.limitPct) return null;
  return `200/N for a large sprocket of ${chain.sprocketTeeth} teeth, tighter than the shop's ${plainNumber(chain.shopLimitPct)} %`;
}

/** "(maker's manual; 200/N …)" after the limit, or "". */
export function limitNotes(r: Pick<ReadingLike, "source" | "chain">): string {
  const notes = [r.source, chainLimitReason(r.chain)].filter(Boolean);
  return notes.length ? ` (${notes.join("; ")})` : "";
}

/**
 * The one line an owner reads: "Intake valve clearance, left: 0.06 mm — limit 0.10–0.20 mm
 * (maker's manual) — OUT OF LIMIT: 0.04 mm under the minimum".
 */
export function readingLine(r: ReadingLike): string {
  const limit = readingLimitText(r);
  return `${r.label}: ${readingValueText(r)}${limit ? ` — limit ${limit}${limitNotes(r)}` : ""} — ${readingVerdictText(r)}`;
}
