// Tightening in passes: each pass brings every bolt, in pattern, to a share of the final torque.
//
// Why passes (REFERENCES.md §3): tightening to final in one go pulls the joint unevenly.
// - Common supplier practice [C]: 30 % → 60 % → 100 %, then repeat at final until no nut turns
//   (our default below).
// - ASME PCC-1 legacy increments [M, from memory]: snug (≤ 20 %), ~20–30 %, ~50–70 %, 100 %, then
//   circular passes at 100 %.
// - US Army TB 9-2320-279-13&P-2 [V]: above 30 lb·ft, tighten in pattern to 70 % of final, then
//   to final → percents [70, 100].
// The percentages are a shop setting; the maker's procedure overrides them.
import { AppError } from "@/lib/errors";
import { allUnits, assertTorqueValue, isTorqueUnit, type TorqueUnit } from "@/lib/torque";

export const DEFAULT_PASS_PERCENTS: readonly number[] = [30, 60, 100];

export type PassRow = {
  /** 1-based pass number, in the order the passes are done. */
  pass: number;
  percent: number;
  /** Torque for this pass in the spec's unit, unrounded. */
  value: number;
  unit: TorqueUnit;
  /** The same torque in every unit. */
  valueIn: Record<TorqueUnit, number>;
  /** The closing pass at 100 % that confirms no fastener still turns. */
  check: boolean;
};

/** Throws a clear error unless the percents rise strictly within (0, 100] and end at 100. */
export function assertPassPercents(percents: readonly number[]): void {
  if (!Array.isArray(percents) || percents.length === 0) {
    throw new AppError("invalid", "Give at least one pass; the last one must be 100 %.");
  }
  percents.forEach((p, i) => {
    if (typeof p !== "number" || !Number.isFinite(p) || p <= 0 || p > 100) {
      throw new AppError("invalid", `Pass ${i + 1} must be a percentage above 0 and at most 100 (got ${p}).`);
    }
    const prev = percents[i - 1];
    if (prev !== undefined && p <= prev) {
      throw new AppError("invalid", `Each pass must be higher than the one before (pass ${i + 1}: ${p} % after ${prev} %).`);
    }
  });
  if (percents[percents.length - 1] !== 100) {
    throw new AppError("invalid", "The last pass must be at 100 % of the final torque.");
  }
}

export function passSchedule(
  finalValue: number,
  unit: TorqueUnit,
  percents: readonly number[] = DEFAULT_PASS_PERCENTS,
  { checkPass = true }: { checkPass?: boolean } = {},
): PassRow[] {
  assertTorqueValue(finalValue);
  if (finalValue === 0) throw new AppError("invalid", "The final torque must be above zero.");
  if (!isTorqueUnit(unit)) throw new AppError("invalid", `Unknown torque unit "${String(unit)}".`);
  assertPassPercents(percents);

  const steps = checkPass ? [...percents, 100] : [...percents];
  return steps.map((percent, i) => {
    // Multiply before dividing so whole-number inputs stay exact (80 × 70 / 100 = 56).
    const value = percent === 100 ? finalValue : (finalValue * percent) / 100;
    return { pass: i + 1, percent, value, unit, valueIn: allUnits(value, unit), check: checkPass && i === steps.length - 1 };
  });
}
