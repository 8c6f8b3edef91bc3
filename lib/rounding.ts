// Display rounding shared by the bench tools (torque, chain wear, readings).
import { AppError } from "@/lib/errors";

/**
 * Rounds half away from zero at `decimals` places, the way a value is read off a printed table
 * (12.25 → 12.3). Binary floats hold 1.005 as 1.00499…, so the scaled value is first cut to 15
 * significant digits (what a double can carry faithfully) to drop that noise before rounding.
 */
export function roundHalfUp(value: number, decimals = 0): number {
  if (!Number.isFinite(value)) throw new AppError("invalid", `Can't round ${value}: it is not a finite number.`);
  if (!Number.isInteger(decimals) || decimals < 0 || decimals > 12) {
    throw new AppError("invalid", `Decimals must be a whole number from 0 to 12 (got ${decimals}).`);
  }
  const scale = 10 ** decimals;
  const scaled = Number((Math.abs(value) * scale).toPrecision(15));
  const rounded = (Math.sign(value) * Math.round(scaled)) / scale;
  // Avoid "-0" reaching the screen.
  return rounded === 0 ? 0 : rounded;
}

/** Rounds half-up and always shows `decimals` places ("13.0"). */
export function formatFixed(value: number, decimals: number): string {
  return roundHalfUp(value, decimals).toFixed(decimals);
}
