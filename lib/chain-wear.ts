// Roller-chain wear from a length measured over a number of pitches (REFERENCES.md §4:
// ANSI/ASME B29.1 practice and chain makers' guides). The maker's service limit for a given
// chain always wins: the shop enters it; the defaults below only pre-fill the form.
import { AppError } from "@/lib/errors";

const INCH_MM = 25.4;

// ANSI B29.1 numbers roller chains 40, 50, 60…: the digits before the last are the pitch in ⅛ in
// (#40 = ½ in, #50 = ⅝ in). The motorcycle sizes below (420, 428, 520, 525, 530) are not ANSI
// numbers: they are a chain makers' trade convention that borrows the same first digit for the
// pitch in ⅛ in, the rest standing for the width (both from memory, unverified). So #530 is ⅝ in
// pitch like #520/#525, only wider. The pitch is what the wear sum needs; the maker's chart wins.
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

/**
 * The other bound: more than 10 % over the new length is taken as a miscount or the wrong chain
 * size, not wear. Common trade practice, no published source: the replace-at limits are ~1.5–3 %
 * (REFERENCES §4) and a chain stretched a few percent past them already rides up the sprocket
 * teeth and skips, so a running chain is not found at three times the limit.
 */
export const MAX_ELONGATION_PCT = 10;

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
  if (elongationPct > MAX_ELONGATION_PCT) {
    throw new AppError(
      "invalid",
      `${measuredMm} mm over ${pitches} pitches would be ${Math.round(elongationPct)} % longer than new (${nominalMm} mm), more than any chain still on a machine stretches. Check the pitch count (pitches = pins − 1) and the chain size.`,
    );
  }
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

/**
 * The limit a chain is judged by: the shop's (or the maker's, typed), tightened to 200/N % when the
 * large sprocket has over 67 teeth and 200/N is the smaller (REFERENCES §4). `reason` says which.
 */
export function effectiveChainLimit(shopLimitPct: number, sprocketTeeth?: number | null): { limitPct: number; reason: string | null } {
  assertLimit(shopLimitPct);
  if (sprocketTeeth == null) return { limitPct: shopLimitPct, reason: null };
  const rule = largeSprocketLimitPct(sprocketTeeth);
  if (rule == null || rule >= shopLimitPct) return { limitPct: shopLimitPct, reason: null };
  return { limitPct: rule, reason: `200/N for a large sprocket of ${sprocketTeeth} teeth: ${formatPct(rule)} %, tighter than ${formatPct(shopLimitPct)} %` };
}
const formatPct = (n: number) => String(Number(n.toFixed(2)));

/**
 * True when the length reads as one pitch MORE than entered, within the limit: the likely slip of
 * counting pins as pitches (21 pins span 20 pitches). A past-limit reading that fits it is asked
 * about before it is logged.
 */
export function fitsOneMorePitch({ pitchMm, pitches, measuredMm }: ChainMeasurement, limitPct: number): boolean {
  const oneMore = (pitches + 1) * pitchMm;
  const pct = ((measuredMm - oneMore) / oneMore) * 100;
  return pct >= -SHORTER_THAN_NEW_TOLERANCE_PCT && pct < limitPct;
}

/** Everything the chain-wear form shows, in one call; limitPct is the shop's (or typed) limit. */
export function chainCheck(input: ChainMeasurement & { limitPct: number; sprocketTeeth?: number | null }): {
  nominalMm: number;
  elongationPct: number;
  replaceAtMm: number;
  verdict: "ok" | "replace";
  /** The limit applied and, when 200/N tightened it, why. */
  limitPct: number;
  limitReason: string | null;
  /** A past-limit length that reads as one more pitch within the limit (pins counted as pitches?). */
  maybeMiscounted: boolean;
} {
  const { nominalMm, elongationPct } = chainElongation(input);
  const { limitPct, reason } = effectiveChainLimit(input.limitPct, input.sprocketTeeth);
  const verdict = chainVerdict(elongationPct, limitPct);
  return {
    nominalMm,
    elongationPct,
    replaceAtMm: replaceLengthMm(input.pitchMm, input.pitches, limitPct),
    verdict,
    limitPct,
    limitReason: reason,
    maybeMiscounted: verdict === "replace" && fitsOneMorePitch(input, limitPct),
  };
}
