// Torque units and conversion. Pure: used by server actions and by the phone screens alike.
import { AppError } from "@/lib/errors";
import { formatFixed, roundHalfUp } from "@/lib/rounding";

export { roundHalfUp };

export const TORQUE_UNIT_IDS = ["nm", "lbf_ft", "lbf_in", "kgf_m"] as const;
export type TorqueUnit = (typeof TORQUE_UNIT_IDS)[number];

// Exact definitions behind NIST SP 811 (2008), Appendix B.8/B.9: 1 ft = 0.3048 m,
// 1 in = 0.0254 m, 1 lb = 0.45359237 kg, standard gravity gₙ = 9.80665 m/s². Writing the
// products out (instead of the rounded table factors) keeps conversions exact to the double.
const FOOT_M = 0.3048;
const INCH_M = 0.0254;
const POUND_KG = 0.45359237;
const STANDARD_GRAVITY = 9.80665;

/** Newton-metres in one of each unit. */
export const NEWTON_METRES_PER: Readonly<Record<TorqueUnit, number>> = {
  nm: 1,
  lbf_ft: FOOT_M * POUND_KG * STANDARD_GRAVITY, // 1.355 817 948 331 400 4 N·m
  lbf_in: INCH_M * POUND_KG * STANDARD_GRAVITY, // 0.112 984 829 027 616 7 N·m
  kgf_m: STANDARD_GRAVITY, // 9.806 65 N·m, exact by definition
};

export const TORQUE_UNITS: readonly { id: TorqueUnit; label: string; name: string }[] = [
  { id: "nm", label: "N·m", name: "newton-metres" },
  { id: "lbf_ft", label: "lbf·ft", name: "pound-force feet" },
  { id: "lbf_in", label: "lbf·in", name: "pound-force inches" },
  { id: "kgf_m", label: "kgf·m", name: "kilogram-force metres" },
];

export function isTorqueUnit(value: unknown): value is TorqueUnit {
  return typeof value === "string" && (TORQUE_UNIT_IDS as readonly string[]).includes(value);
}

export function torqueUnitLabel(unit: TorqueUnit): string {
  return TORQUE_UNITS.find((u) => u.id === assertUnit(unit))!.label;
}

function assertUnit(unit: unknown): TorqueUnit {
  if (!isTorqueUnit(unit)) {
    throw new AppError("invalid", `Unknown torque unit "${String(unit)}". Use one of: ${TORQUE_UNIT_IDS.join(", ")}.`);
  }
  return unit;
}

/** Torque values are magnitudes: a finite number, zero or more. */
export function assertTorqueValue(value: unknown): number {
  if (typeof value !== "number" || Number.isNaN(value)) {
    throw new AppError("invalid", "Torque must be a number.");
  }
  if (!Number.isFinite(value)) throw new AppError("invalid", "Torque must be a finite number.");
  if (value < 0) throw new AppError("invalid", "Torque can't be negative.");
  return value;
}

export function convertTorque(value: number, from: TorqueUnit, to: TorqueUnit): number {
  assertTorqueValue(value);
  assertUnit(from);
  assertUnit(to);
  if (from === to) return value;
  return (value * NEWTON_METRES_PER[from]) / NEWTON_METRES_PER[to];
}

/** "13.0 N·m": rounded half-up, like a printed table. */
export function formatTorque(value: number, unit: TorqueUnit, decimals = 1): string {
  assertTorqueValue(value);
  return `${formatFixed(value, decimals)} ${torqueUnitLabel(unit)}`;
}

/** The same torque in every unit, so the other units are one tap away. Unrounded. */
export function allUnits(value: number, unit: TorqueUnit): Record<TorqueUnit, number> {
  assertTorqueValue(value);
  assertUnit(unit);
  return Object.fromEntries(TORQUE_UNIT_IDS.map((to) => [to, convertTorque(value, unit, to)])) as Record<
    TorqueUnit,
    number
  >;
}
