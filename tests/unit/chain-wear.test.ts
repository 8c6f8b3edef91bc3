import { describe, expect, it } from "vitest";
import {
  CHAIN_PITCHES,
  chainCheck,
  chainElongation,
  chainVerdict,
  DEFAULT_CHAIN_LIMITS,
  effectiveChainLimit,
  fitsOneMorePitch,
  largeSprocketLimitPct,
  MAX_ELONGATION_PCT,
  replaceLengthMm,
} from "@/lib/chain-wear";
import { roundHalfUp } from "@/lib/rounding";

describe("chain pitches", () => {
  it("follow the rule of eighths", () => {
    // Motorcycle sizes (420/428/520…) are a chain makers' trade convention, not ANSI B29.1 numbers
    // (B29.1 numbers chains 40, 50, 60): first digit = pitch in ⅛ in — from memory, unverified.
    // 1 in = 25.4 mm (NIST SP 811).
    expect(CHAIN_PITCHES["#420"]).toBe(12.7);
    expect(CHAIN_PITCHES["#428"]).toBe(12.7);
    expect(CHAIN_PITCHES["#520"]).toBe(15.875); // REFERENCES §4: #520 = 15.875 mm
    expect(CHAIN_PITCHES["#525"]).toBe(15.875);
    // #530 is ⅝ in pitch (3/8 in roller width), not ¾ in: that is #630. Same rule of eighths.
    expect(CHAIN_PITCHES["#530"]).toBe(15.875);
  });

  it("default limits", () => {
    // REFERENCES §4 [V]: ~1.5 % fixed centres / smooth running, ~3 % for most drives
    expect(DEFAULT_CHAIN_LIMITS).toEqual({ fixedCentres: 1.5, typical: 3 });
  });
});

describe("chain elongation (REFERENCES §4)", () => {
  it("#520 over 20 pitches: nominal, replace lengths and a measured reading", () => {
    const pitchMm = CHAIN_PITCHES["#520"];
    // REFERENCES §4 [V], ANSI/ASME B29.1 practice: nominal 20 × 15.875 = 317.500 mm
    expect(roundHalfUp(chainElongation({ pitchMm, pitches: 20, measuredMm: 320 }).nominalMm, 3)).toBe(317.5);
    // REFERENCES §4: 1.5 % → 322.263 mm (322.2625 rounded half-up to 0.001)
    expect(roundHalfUp(replaceLengthMm(pitchMm, 20, 1.5), 3)).toBe(322.263);
    // REFERENCES §4: 3 % → 327.025 mm
    expect(roundHalfUp(replaceLengthMm(pitchMm, 20, 3), 3)).toBe(327.025);
    // REFERENCES §4: measured 322.3 mm → 1.512 %
    const { elongationPct } = chainElongation({ pitchMm, pitches: 20, measuredMm: 322.3 });
    expect(roundHalfUp(elongationPct, 3)).toBe(1.512);
    // 1.512 % is past the 1.5 % fixed-centres limit but within the 3 % typical limit (REFERENCES §4)
    expect(chainVerdict(elongationPct, DEFAULT_CHAIN_LIMITS.fixedCentres)).toBe("replace");
    expect(chainVerdict(elongationPct, DEFAULT_CHAIN_LIMITS.typical)).toBe("ok");
  });

  it("#428 over 20 pitches: nominal 254.0 mm, 3 % → 261.62 mm", () => {
    // REFERENCES §4 [V]
    expect(chainElongation({ pitchMm: CHAIN_PITCHES["#428"], pitches: 20, measuredMm: 255 }).nominalMm).toBeCloseTo(254.0, 10);
    expect(roundHalfUp(replaceLengthMm(CHAIN_PITCHES["#428"], 20, 3), 2)).toBe(261.62);
  });

  it("a chain measured exactly at the replace length is due", () => {
    // REFERENCES §4: "replace at ~3 %" — reaching the limit means replace
    const pitchMm = CHAIN_PITCHES["#520"];
    const at = replaceLengthMm(pitchMm, 20, 3);
    expect(chainCheck({ pitchMm, pitches: 20, measuredMm: at, limitPct: 3 }).verdict).toBe("replace");
    // REFERENCES §4: 327.025 mm is the 3 % length; 0.1 mm less is still within
    expect(chainCheck({ pitchMm, pitches: 20, measuredMm: 326.9, limitPct: 3 })).toMatchObject({ verdict: "ok" });
  });

  it("chainCheck returns every figure the form shows", () => {
    // REFERENCES §4: #520, 20 pitches, 322.3 mm, 1.5 % limit → 317.5 / 1.512 % / 322.263 / replace
    const result = chainCheck({ pitchMm: 15.875, pitches: 20, measuredMm: 322.3, limitPct: 1.5 });
    expect(roundHalfUp(result.nominalMm, 3)).toBe(317.5);
    expect(roundHalfUp(result.elongationPct, 3)).toBe(1.512);
    expect(roundHalfUp(result.replaceAtMm, 3)).toBe(322.263);
    expect(result.verdict).toBe("replace");
  });
});

describe("large sprocket limit", () => {
  it("is 200/N % over 67 teeth", () => {
    // REFERENCES §4 [V]: 200/N with N = 80 → 2.5 %
    expect(largeSprocketLimitPct(80)).toBe(2.5);
    // REFERENCES §4: the rule applies over 67 teeth only
    expect(largeSprocketLimitPct(68)).toBeCloseTo(200 / 68, 12);
    expect(largeSprocketLimitPct(67)).toBeNull();
    expect(largeSprocketLimitPct(45)).toBeNull();
  });

  it("refuses a bad tooth count", () => {
    expect(() => largeSprocketLimitPct(0)).toThrow(/whole number, at least 1/);
    expect(() => largeSprocketLimitPct(80.5)).toThrow(/whole number/);
  });
});

describe("validation", () => {
  it("refuses impossible measurements with a clear error", () => {
    expect(() => chainElongation({ pitchMm: 0, pitches: 20, measuredMm: 300 })).toThrow(/pitch must be a number above zero/);
    expect(() => chainElongation({ pitchMm: 15.875, pitches: 0, measuredMm: 300 })).toThrow(/whole number, at least 1/);
    expect(() => chainElongation({ pitchMm: 15.875, pitches: 20.5, measuredMm: 300 })).toThrow(/whole number/);
    expect(() => chainElongation({ pitchMm: 15.875, pitches: 20, measuredMm: Number.NaN })).toThrow(/measured length/);
    // Our own plausibility bound, no published source: far shorter than new means wrong input.
    expect(() => chainElongation({ pitchMm: 15.875, pitches: 20, measuredMm: 305 })).toThrow(/shorter than a new chain/);
    expect(() => chainVerdict(1, 0)).toThrow(/wear limit/);
    expect(() => chainVerdict(Number.NaN, 3)).toThrow(/elongation/);
    expect(() => replaceLengthMm(15.875, 20, 150)).toThrow(/wear limit/);
  });

  it("accepts a new chain a hair under nominal", () => {
    // common trade practice, no published source: measuring error on a new chain reads slightly short
    const { elongationPct } = chainElongation({ pitchMm: 15.875, pitches: 20, measuredMm: 317.3 });
    expect(elongationPct).toBeLessThan(0);
    expect(chainVerdict(elongationPct, 1.5)).toBe("ok");
  });
});

describe("the limit a chain is judged by: the shop's, or 200/N when tighter (REFERENCES §4)", () => {
  it("80 teeth: 200/80 = 2.5 % replaces a 3 % shop limit, with the reason", () => {
    // REFERENCES §4 [V]: 200/N with N = 80 → 2.5 %
    expect(effectiveChainLimit(3, 80)).toEqual({ limitPct: 2.5, reason: "200/N for a large sprocket of 80 teeth: 2.5 %, tighter than 3 %" });
  });

  it("keeps the shop's limit when it is already tighter, or the sprocket is 67 teeth or fewer", () => {
    // REFERENCES §4: 200/80 = 2.5 % is looser than a 1.5 % fixed-centres limit
    expect(effectiveChainLimit(1.5, 80)).toEqual({ limitPct: 1.5, reason: null });
    // REFERENCES §4: the rule is for large sprockets over 67 teeth; a 45-tooth rear sprocket keeps 3 %
    expect(effectiveChainLimit(3, 45)).toEqual({ limitPct: 3, reason: null });
    expect(effectiveChainLimit(3, null)).toEqual({ limitPct: 3, reason: null });
  });

  it("chainCheck judges by the tighter limit: 2.6 % is within 3 % but due at 200/80 = 2.5 %", () => {
    // REFERENCES §4: #520, 20 pitches, nominal 317.5 mm; 317.5 × 1.026 = 325.755 mm → 2.6 %
    const input = { pitchMm: CHAIN_PITCHES["#520"], pitches: 20, measuredMm: 325.755, limitPct: 3 };
    expect(chainCheck(input)).toMatchObject({ verdict: "ok", limitPct: 3, limitReason: null });
    const tight = chainCheck({ ...input, sprocketTeeth: 80 });
    expect(tight).toMatchObject({ verdict: "replace", limitPct: 2.5 });
    // REFERENCES §4: 2.5 % over 20 × 15.875 mm → 325.4375 mm
    expect(roundHalfUp(tight.replaceAtMm, 4)).toBe(325.4375);
  });
});

describe("plausibility: pitches = pins − 1 and an upper bound", () => {
  it("refuses a length more than 10 % over new (common trade practice, no published source)", () => {
    expect(MAX_ELONGATION_PCT).toBe(10);
    // 20 × 15.875 = 317.5 mm (REFERENCES §4); 317.5 × 1.10 = 349.25 mm is the last length taken
    expect(chainElongation({ pitchMm: 15.875, pitches: 20, measuredMm: 349.25 }).elongationPct).toBeCloseTo(10, 9);
    expect(() => chainElongation({ pitchMm: 15.875, pitches: 20, measuredMm: 349.3 })).toThrow(/pitches = pins − 1/);
    // 22 pitches of a new chain entered as 20: 349.25 + 15.875 = 365.125 mm → 15 %
    expect(() => chainElongation({ pitchMm: 15.875, pitches: 20, measuredMm: 365.125 })).toThrow(/more than any chain still on a machine stretches/);
  });

  it("a new chain over 21 pitches entered as 20 reads as 5 % stretched and is flagged as a likely miscount", () => {
    // REFERENCES §4 formula: 21 × 15.875 = 333.375 mm; over 20 pitches (317.5 mm) that is 5 %
    const r = chainCheck({ pitchMm: 15.875, pitches: 20, measuredMm: 333.375, limitPct: 3 });
    expect(roundHalfUp(r.elongationPct, 3)).toBe(5);
    expect(r).toMatchObject({ verdict: "replace", maybeMiscounted: true });
    expect(fitsOneMorePitch({ pitchMm: 15.875, pitches: 20, measuredMm: 333.375 }, 3)).toBe(true);
  });

  it("a worn chain past the limit that does not fit one more pitch is not flagged", () => {
    // REFERENCES §4: 3 % → 327.025 mm; 328 mm over 20 pitches is 3.31 %, and 5 % short of 21 pitches
    const r = chainCheck({ pitchMm: 15.875, pitches: 20, measuredMm: 328, limitPct: 3 });
    expect(r).toMatchObject({ verdict: "replace", maybeMiscounted: false });
    // within the limit: never asked about, whatever it fits
    expect(chainCheck({ pitchMm: 15.875, pitches: 20, measuredMm: 320, limitPct: 3 }).maybeMiscounted).toBe(false);
  });
});
