import { describe, expect, it } from "vitest";
import { assertPassPercents, DEFAULT_PASS_PERCENTS, passSchedule } from "@/lib/tightening-passes";
import { roundHalfUp } from "@/lib/torque";

describe("passSchedule", () => {
  it("defaults to 30 % → 60 % → 100 %, then a check pass at 100 %", () => {
    // Common supplier practice [C], REFERENCES §3: 30 → 60 → 100 %, then repeat at final
    expect(DEFAULT_PASS_PERCENTS).toEqual([30, 60, 100]);
    const rows = passSchedule(40, "nm");
    expect(rows.map((r) => [r.pass, r.percent, r.check])).toEqual([
      [1, 30, false],
      [2, 60, false],
      [3, 100, false],
      [4, 100, true],
    ]);
    // Arithmetic: 30 % and 60 % of 40 N·m
    expect(rows.map((r) => r.value)).toEqual([12, 24, 40, 40]);
    expect(rows.every((r) => r.unit === "nm")).toBe(true);
  });

  it("gives each pass in every unit", () => {
    // REFERENCES §1 worked value: 80 lbf·ft → 108.5 N·m (NIST SP 811 App. B.9 factor)
    const rows = passSchedule(80, "lbf_ft");
    const last = rows[rows.length - 1]!;
    expect(roundHalfUp(last.valueIn.nm, 1)).toBe(108.5);
    expect(last.valueIn.lbf_ft).toBe(80);
    // 30 % of 80 lbf·ft = 24 lbf·ft; × 1.355 817 948 N·m (NIST SP 811 App. B.9) = 32.54 → 32.5
    expect(rows[0]!.value).toBe(24);
    expect(roundHalfUp(rows[0]!.valueIn.nm, 1)).toBe(32.5);
    // 1 ft = 12 in (NIST SP 811 App. B.9): 60 % of 80 lbf·ft = 48 lbf·ft = 576 lbf·in
    expect(rows[1]!.valueIn.lbf_in).toBeCloseTo(576, 10);
  });

  it("reproduces the US Army two-step schedule", () => {
    // US Army TB 9-2320-279-13&P-2 [V], REFERENCES §3: above 30 lb·ft, in pattern to 70 % of
    // final, then to final. 80 lbf·ft final → 56 lbf·ft, then 80 lbf·ft.
    const rows = passSchedule(80, "lbf_ft", [70, 100], { checkPass: false });
    expect(rows.map((r) => [r.pass, r.percent, r.value])).toEqual([
      [1, 70, 56],
      [2, 100, 80],
    ]);
    // 56 lbf·ft × 1.355 817 948 (NIST SP 811 App. B.9) = 75.93 → 75.9 N·m
    expect(roundHalfUp(rows[0]!.valueIn.nm, 1)).toBe(75.9);
    expect(rows.some((r) => r.check)).toBe(false);
  });

  it("takes the shop's own percentages", () => {
    // ASME PCC-1 legacy increments [M], REFERENCES §3 (from memory, unverified): ~20, ~50–70, 100
    const rows = passSchedule(25, "nm", [20, 50, 100]);
    expect(rows.map((r) => r.value)).toEqual([5, 12.5, 25, 25]);
    expect(rows[3]!.check).toBe(true);
  });

  it("allows a single pass at 100 %", () => {
    // common trade practice, no published source: small fasteners go straight to final
    expect(passSchedule(10, "nm", [100], { checkPass: false }).map((r) => r.value)).toEqual([10]);
  });
});

describe("pass percent validation", () => {
  it("refuses percents that don't rise, leave (0, 100] or end below 100", () => {
    expect(() => assertPassPercents([])).toThrow(/at least one pass/);
    expect(() => assertPassPercents([60, 30, 100])).toThrow(/higher than the one before \(pass 2: 30 % after 60 %\)/);
    expect(() => assertPassPercents([30, 30, 100])).toThrow(/higher than the one before/);
    expect(() => assertPassPercents([0, 50, 100])).toThrow(/above 0 and at most 100/);
    expect(() => assertPassPercents([50, 110])).toThrow(/above 0 and at most 100/);
    expect(() => assertPassPercents([30, 60, 90])).toThrow(/last pass must be at 100 %/);
    expect(() => assertPassPercents([30, Number.NaN, 100])).toThrow(/Pass 2/);
    expect(() => assertPassPercents([30, 60, 100])).not.toThrow();
  });

  it("refuses a missing, zero or negative final torque and unknown units", () => {
    expect(() => passSchedule(0, "nm")).toThrow(/above zero/);
    expect(() => passSchedule(-3, "nm")).toThrow(/negative/);
    expect(() => passSchedule(Number.NaN, "nm")).toThrow(/must be a number/);
    expect(() => passSchedule(10, "ft" as "nm")).toThrow(/Unknown torque unit/);
    expect(() => passSchedule(10, "nm", [50, 90])).toThrow(/100 %/);
  });
});
