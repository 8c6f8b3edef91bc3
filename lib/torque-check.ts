// Spec against applied torque, and whether a spec is plausible for the fastener. Pure: no I/O,
// used by the server when a record is written and by every view that shows one.
import { formatFixed } from "@/lib/rounding";
import { type TorqueUnit, convertTorque, torqueUnitLabel } from "@/lib/torque";

/**
 * Hand torque tools by ISO 6789-1:2017 type and class, with the permissible deviation the
 * standard allows each (from memory, unverified: ±4 % for type I classes A and D and type II
 * classes A, B, D, E and G; ±6 % for the other classes; tools of 10 N·m maximum or less ±6 %).
 * The tool's deviation is the default tolerance of a record: an applied torque further than that
 * from the spec is not "to spec". A shop may type its own tolerance per record.
 */
export const WRENCH_CLASSES = {
  type2_4: { label: "Click / setting wrench (ISO 6789 type II, class A, B, D, E or G): ±4 %", tolerancePct: 4 },
  type2_6: { label: "Click / setting wrench (type II, class C or F): ±6 %", tolerancePct: 6 },
  type1_4: { label: "Beam or dial wrench (type I, class A or D): ±4 %", tolerancePct: 4 },
  type1_6: { label: "Indicating wrench (type I, class B, C or E): ±6 %", tolerancePct: 6 },
  small: { label: "Any wrench of 10 N·m maximum or less: ±6 %", tolerancePct: 6 },
} as const;
export type WrenchClass = keyof typeof WRENCH_CLASSES;
export const WRENCH_CLASS_IDS = Object.keys(WRENCH_CLASSES) as WrenchClass[];
/** The wrench most shops tighten with, when the record names none. */
export const DEFAULT_WRENCH_CLASS: WrenchClass = "type2_4";
export const isWrenchClass = (v: unknown): v is WrenchClass => typeof v === "string" && v in WRENCH_CLASSES;

export type TorqueOutcome =
  | { kind: "not_recorded" }
  | { kind: "within" | "under" | "over"; deviationPct: number; tolerancePct: number };

/** Applied against spec (both in the spec's unit); the tolerance is inclusive. */
export function torqueOutcome(r: { specValue: number; appliedValue: number | null; tolerancePct: number }): TorqueOutcome {
  if (r.appliedValue == null) return { kind: "not_recorded" };
  const deviationPct = ((r.appliedValue - r.specValue) / r.specValue) * 100;
  // 1e-9: 4.000000000001 % from float division is still 4 %.
  if (Math.abs(deviationPct) <= r.tolerancePct + 1e-9) return { kind: "within", deviationPct, tolerancePct: r.tolerancePct };
  return { kind: deviationPct < 0 ? "under" : "over", deviationPct, tolerancePct: r.tolerancePct };
}

export const OUTCOME_LABEL: Record<TorqueOutcome["kind"], string> = {
  within: "Within tolerance",
  under: "Under spec",
  over: "Over spec",
  not_recorded: "Applied not recorded",
};

const DECIMALS: Record<TorqueUnit, number> = { nm: 1, lbf_ft: 1, lbf_in: 1, kgf_m: 2 };
const t = (value: number, from: TorqueUnit, to: TorqueUnit = from) => `${formatFixed(convertTorque(value, from, to), DECIMALS[to])} ${torqueUnitLabel(to)}`;

/** "72.0 lbf·ft (97.6 N·m)": the unit it was entered in, the shop's beside it when different. */
export function torqueHeadline(value: number, unit: TorqueUnit, shopUnit: TorqueUnit): string {
  return unit === shopUnit ? t(value, unit) : `${t(value, unit)} (${t(value, unit, shopUnit)})`;
}

const pct = (n: number) => formatFixed(Math.abs(n), 1);

/** One line on the outcome, never "to spec" unless applied is within tolerance. */
export function outcomeText(r: { specValue: number; appliedValue: number | null; unit: TorqueUnit; tolerancePct: number }, shopUnit: TorqueUnit): string {
  const o = torqueOutcome(r);
  const spec = torqueHeadline(r.specValue, r.unit, shopUnit);
  if (o.kind === "not_recorded") return `spec ${spec}; applied torque not recorded`;
  const applied = torqueHeadline(r.appliedValue!, r.unit, shopUnit);
  if (o.kind === "within") return `torqued to ${applied}, within ±${plain(o.tolerancePct)} % of the ${spec} spec`;
  return `${o.kind === "under" ? "UNDER" : "OVER"} SPEC: torqued to ${applied}, ${pct(o.deviationPct)} % ${o.kind} the ${spec} spec (tolerance ±${plain(o.tolerancePct)} %)`;
}
const plain = (n: number) => String(Number(n.toFixed(2)));

/** What was done, as recorded: passes and the check pass are never assumed. */
export function passesText(r: { passPercents: number[]; passesDone?: boolean | null; checkPass?: boolean | null }): string {
  const n = r.passPercents.length;
  const plan = `${n} pass${n === 1 ? "" : "es"} (${r.passPercents.join(" → ")} %)`;
  const passes = r.passesDone ? `${plan} done` : `${plan} planned, not recorded as done`;
  const check = r.checkPass ? "a check pass at final in the tightening direction, no fastener turned" : "no check pass recorded";
  return `${passes}; ${check}`;
}

// ---- plausibility -------------------------------------------------------------------------------

/**
 * Tensile stress areas (mm²) of metric coarse threads, ISO 898-1:2013 Table 4 / ISO 724 [C]; proof
 * stresses (MPa) of the property classes, ISO 898-1:2013 Table 3 [C] (8.8: 580 up to M16, 600 above). The torque that loads a bolt to 75 % of proof with a nut factor K = 0.2
 * (dry, plain steel) is T = K · F · d — common trade practice, no published source for the 75 % and
 * the K; it moves ±30 % with lubrication. So this only warns; the maker's value always wins.
 */
const STRESS_AREA: Record<number, number> = { 3: 5.03, 4: 8.78, 5: 14.2, 6: 20.1, 8: 36.6, 10: 58, 12: 84.3, 14: 115, 16: 157, 18: 192, 20: 245, 22: 303, 24: 353, 27: 459, 30: 561 };
const PROOF_MPA = { "8.8": 600, "10.9": 830, "12.9": 970 } as const;
export type PropertyClass = keyof typeof PROOF_MPA;

/** "8 × M6", "M10x1.25 10.9" → size and class, when the text names them. */
export function fastenerFacts(text: string): { diameterMm: number | null; propertyClass: PropertyClass | null } {
  // "M6", "m8", "M10x1.25", "M10 × 1.25" as a word of its own (not inside "m5abc").
  const size = /\bM(\d{1,2})(?:\s?[x×]\s?\d+(?:\.\d+)?)?\b/i.exec(text);
  const d = size ? Number(size[1]) : null;
  const cls = /(?:^|[^\d.])(8\.8|10\.9|12\.9)(?![\d])/.exec(text);
  return { diameterMm: d != null && STRESS_AREA[d] ? d : null, propertyClass: (cls?.[1] as PropertyClass | undefined) ?? null };
}

/** N·m for a size and class at 75 % proof load, K = 0.2 (see above). */
export function nominalTorqueNm(diameterMm: number, cls: PropertyClass): number | null {
  const area = STRESS_AREA[diameterMm];
  if (!area) return null;
  const proof = cls === "8.8" && diameterMm <= 16 ? 580 : PROOF_MPA[cls];
  return (0.2 * 0.75 * proof * area * diameterMm) / 1000;
}

/**
 * The band a spec for this fastener plausibly falls in, N·m: with a class, 30–130 % of its nominal;
 * without, 15 % of 8.8 (soft parts, covers into aluminium) to 130 % of 12.9 — common trade
 * practice, no published source.
 */
export function plausibleRangeNm(diameterMm: number, cls: PropertyClass | null): { low: number; high: number } | null {
  const n88 = nominalTorqueNm(diameterMm, "8.8");
  if (n88 == null) return null;
  if (cls) return { low: 0.3 * nominalTorqueNm(diameterMm, cls)!, high: 1.3 * nominalTorqueNm(diameterMm, cls)! };
  return { low: 0.15 * n88, high: 1.3 * nominalTorqueNm(diameterMm, "12.9")! };
}

const SWAPS: Record<TorqueUnit, TorqueUnit[]> = { lbf_ft: ["lbf_in", "nm"], lbf_in: ["lbf_ft", "nm"], nm: ["lbf_in", "lbf_ft", "kgf_m"], kgf_m: ["nm"] };

/** A warning when `value unit` is far outside the fastener's band, naming the likely unit mix-up; null when plausible or unknown. */
export function plausibilityWarning(value: number, unit: TorqueUnit, fastener: string): string | null {
  const { diameterMm, propertyClass } = fastenerFacts(fastener);
  if (diameterMm == null) return null;
  const range = plausibleRangeNm(diameterMm, propertyClass);
  if (!range) return null;
  const nm = convertTorque(value, unit, "nm");
  if (nm >= range.low && nm <= range.high) return null;
  const bolt = `an M${diameterMm}${propertyClass ? ` class ${propertyClass}` : ""} fastener (usually ${formatFixed(range.low, 1)}–${formatFixed(range.high, 1)} N·m)`;
  const says = unit === "nm" ? t(value, unit) : `${t(value, unit)} is ${t(value, unit, "nm")}`;
  const swap = SWAPS[unit].find((u) => {
    const other = convertTorque(value, u, "nm");
    return other >= range.low && other <= range.high;
  });
  const hint = swap ? ` — did you mean ${t(value, swap)}${swap === "nm" ? "" : ` = ${t(value, swap, "nm")}`}?` : "";
  return `${says}, ${nm > range.high ? "more" : "less"} than ${bolt}${hint}`;
}
