// A measured reading against the limits the shop typed in from the maker's manual.
// Limits are inclusive: a reading exactly at the service limit is still within it.
import { AppError } from "@/lib/errors";
import { formatFixed } from "@/lib/rounding";

export type ReadingVerdict = "within" | "below" | "above" | "no_limit";

/** decimals: the resolution the numbers were typed with ("0.20" → 2); the margin is never shown coarser. */
export type ReadingInput = { value: number; min?: number | null; max?: number | null; unit?: string | null; decimals?: number | null };

export type ReadingResult = {
  verdict: ReadingVerdict;
  /** Distance past the broken limit, or to the nearest limit when within. Absent with no limit. */
  margin?: number;
  /** e.g. "0.15 mm over the maximum" (above), "0.05 mm under the maximum" (within), "at the minimum". */
  marginText?: string;
};

function finiteOrAbsent(name: string, value: number | null | undefined): number | undefined {
  if (value === null || value === undefined) return undefined;
  if (typeof value !== "number" || !Number.isFinite(value)) {
    throw new AppError("invalid", `The ${name} must be a finite number (got ${value}).`);
  }
  return value;
}

// Decimal places as typed ("0.125" → 3), so a margin isn't shown as 0.15000000000000002
// nor rounded coarser than the measurement itself.
function decimalsOf(n: number): number {
  const text = String(n);
  const exp = /e-(\d+)$/.exec(text);
  const [mantissa] = text.split("e");
  const frac = mantissa?.split(".")[1]?.length ?? 0;
  return Math.min(12, frac + (exp ? Number(exp[1]) : 0));
}

export function evaluateReading({ value, min, max, unit, decimals: typed }: ReadingInput): ReadingResult {
  if (typeof value !== "number" || !Number.isFinite(value)) {
    throw new AppError("invalid", `The reading must be a finite number (got ${value}).`);
  }
  const lo = finiteOrAbsent("minimum", min);
  const hi = finiteOrAbsent("maximum", max);
  if (lo !== undefined && hi !== undefined && lo > hi) {
    throw new AppError("invalid", `The minimum (${lo}) can't be above the maximum (${hi}).`);
  }
  if (lo === undefined && hi === undefined) return { verdict: "no_limit" };

  const decimals = Math.min(12, Math.max(typed ?? 0, ...[value, lo, hi].filter((n) => n !== undefined).map(decimalsOf)));
  const text = (margin: number, where: string) =>
    `${formatFixed(margin, decimals)}${unit ? ` ${unit}` : ""} ${where}`;

  if (lo !== undefined && value < lo) {
    const margin = lo - value;
    return { verdict: "below", margin, marginText: text(margin, "under the minimum") };
  }
  if (hi !== undefined && value > hi) {
    const margin = value - hi;
    return { verdict: "above", margin, marginText: text(margin, "over the maximum") };
  }
  // Within: report the room left to whichever limit is nearer.
  const toMin = lo === undefined ? Infinity : value - lo;
  const toMax = hi === undefined ? Infinity : hi - value;
  const nearMax = toMax <= toMin;
  const margin = nearMax ? toMax : toMin;
  const limitName = nearMax ? "maximum" : "minimum";
  const marginText =
    Number(formatFixed(margin, decimals)) === 0 ? `at the ${limitName}` : text(margin, `${nearMax ? "under" : "over"} the ${limitName}`);
  return { verdict: "within", margin, marginText };
}
