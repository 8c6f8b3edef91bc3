// Roller-chain wear from a length measured over a number of pitches (REFERENCES.md §4:
// ANSI/ASME B29.1 practice and chain makers' guides). The maker's service limit for a given
// chain always wins: the shop enters it; the defaults below only pre-fill the form.
import { AppError } from "@/lib/errors";

const INCH_MM = 25.4;

// Chain numbers follow the rule of eighths: the first digit is the pitch in ⅛ in (ANSI B29.1),
// the rest is roller width. So #530 is ⅝ in pitch like #520/#525 — only wider.
export const CHAIN_PITCHES: Readonly<Record<"#420" | "#428" | "#520" | "#525" | "#530", number>> = {
  "#420": (4 / 8) * INCH_MM, // 12.7 mm
  "#428": (4 / 8) * INCH_MM, // 12.7 mm
  "#520": (5 / 8) * INCH_MM, // 15.875 mm
  "#525": (5 / 8) * INCH_MM, // 15.875 mm
  "#530": (5 / 8) * INCH_MM, // 15.875 mm
};
export type ChainSize = keyof typeof CHAIN_PITCHES;

/** Replace-at elongation, %: ~1.5 % for fixed centres or smooth running, ~3 % for most drives. */
export const DEFAULT_CHAIN_LIMITS = { fixedCentres: 1.5, typical: 3 } as const;

/** Above this many teeth on the large sprocket the limit tightens to 200/N % (REFERENCES §4). */
export const LARGE_SPROCKET_TEETH = 67;

// Our own plausibility bound, no published source: a reading well under a new chain's length
// means the pitch count or chain size was entered wrong, not that the chain shrank.
const SHORTER_THAN_NEW_TOLERANCE_PCT = 1;

function positive(name: string, value: number): void {
  if (typeof value !== "number" || !Number.isFinite(value) || value <= 0) {
    throw new AppError("invalid", `${name} must be a number above zero (got ${value}).`);
  }
}

function pitchCount(pitches: number): void {
  if (!Number.isInteger(pitches) || pitches < 1) {
    throw new AppError("invalid", `The number of pitches measured must be a whole number, at least 1 (got ${pitches}).`);
  }
}

export type ChainMeasurement = { pitchMm: number; pitches: number; measuredMm: number };

/** Elongation % = (L_measured − n·p) / (n·p) × 100 (REFERENCES §4). Unrounded. */
export function chainElongation({ pitchMm, pitches, measuredMm }: ChainMeasurement): {
  nominalMm: number;
  elongationPct: number;
} {
  positive("The chain pitch", pitchMm);
  pitchCount(pitches);
  positive("The measured length", measuredMm);
  const nominalMm = pitches * pitchMm;
  const elongationPct = ((measuredMm - nominalMm) / nominalMm) * 100;
  if (elongationPct < -SHORTER_THAN_NEW_TOLERANCE_PCT) {
    throw new AppError(
      "invalid",
      `${measuredMm} mm is shorter than a new chain over ${pitches} pitches (${nominalMm} mm). Check the pitch count and chain size.`,
    );
  }
  return { nominalMm, elongationPct };
}

function assertLimit(limitPct: number): void {
  if (typeof limitPct !== "number" || !Number.isFinite(limitPct) || limitPct <= 0 || limitPct >= 100) {
    throw new AppError("invalid", `The wear limit must be a percentage above 0 and below 100 (got ${limitPct}).`);
  }
}

/** "replace" once the elongation reaches the limit. */
export function chainVerdict(elongationPct: number, limitPct: number): "ok" | "replace" {
  if (typeof elongationPct !== "number" || !Number.isFinite(elongationPct)) {
    throw new AppError("invalid", `The elongation must be a finite number (got ${elongationPct}).`);
  }
  assertLimit(limitPct);
  // A chain measured exactly at the replace length must read "replace", whatever the float noise.
  return elongationPct >= limitPct - 1e-9 ? "replace" : "ok";
}

/** The measured length over `pitches` at which the chain is due: n·p·(1 + limit/100). */
export function replaceLengthMm(pitchMm: number, pitches: number, limitPct: number): number {
  positive("The chain pitch", pitchMm);
  pitchCount(pitches);
  assertLimit(limitPct);
  return pitches * pitchMm * (1 + limitPct / 100);
}

/** 200/N % for a large sprocket over 67 teeth; null when the rule doesn't apply (use the usual limit). */
export function largeSprocketLimitPct(teeth: number): number | null {
  if (!Number.isInteger(teeth) || teeth < 1) {
    throw new AppError("invalid", `The sprocket's tooth count must be a whole number, at least 1 (got ${teeth}).`);
  }
  return teeth > LARGE_SPROCKET_TEETH ? 200 / teeth : null;
}

/** Everything the chain-wear form shows, in one call. */
export function chainCheck(input: ChainMeasurement & { limitPct: number }): {
  nominalMm: number;
  elongationPct: number;
  replaceAtMm: number;
  verdict: "ok" | "replace";
} {
  const { nominalMm, elongationPct } = chainElongation(input);
  return {
    nominalMm,
    elongationPct,
    replaceAtMm: replaceLengthMm(input.pitchMm, input.pitches, input.limitPct),
    verdict: chainVerdict(elongationPct, input.limitPct),
  };
}
