import { unit } from "mathjs";
import { describe, expect, it } from "vitest";
import {
  allUnits,
  convertTorque,
  formatTorque,
  NEWTON_METRES_PER,
  roundHalfUp,
  TORQUE_UNIT_IDS,
  TORQUE_UNITS,
  torqueUnitLabel,
  type TorqueUnit,
} from "@/lib/torque";

// How mathjs spells each of our units; "kgf m" parses directly in mathjs 15.
const MATHJS_UNIT: Record<TorqueUnit, string> = { nm: "N m", lbf_ft: "lbf ft", lbf_in: "lbf in", kgf_m: "kgf m" };

describe("torque factors", () => {
  it("match the NIST SP 811 exact factors", () => {
    // NIST SP 811 (2008), Appendix B.9: 1 lbf·ft = 1.355 817 948 331 400 4 N·m (exact product)
    expect(NEWTON_METRES_PER.lbf_ft).toBeCloseTo(1.3558179483314004, 15);
    // NIST SP 811 (2008), Appendix B.9: 1 lbf·in = 0.112 984 829 027 616 7 N·m (exact product)
    expect(NEWTON_METRES_PER.lbf_in).toBeCloseTo(0.1129848290276167, 15);
    // NIST SP 811 (2008), Appendix B.9: 1 kgf·m = 9.806 65 N·m exactly
    expect(NEWTON_METRES_PER.kgf_m).toBe(9.80665);
  });

  it("agree with the rounded NIST table factors to ~1e-6 relative", () => {
    // NIST SP 811 (2008), Appendix B.8/B.9 table: 1.355 818 and 0.112 984 8 (REFERENCES §1)
    expect(Math.abs(NEWTON_METRES_PER.lbf_ft / 1.355818 - 1)).toBeLessThan(1e-6);
    expect(Math.abs(NEWTON_METRES_PER.lbf_in / 0.1129848 - 1)).toBeLessThan(1e-6);
  });

  it("agree with mathjs for every pair of units", () => {
    // Independent cross-check: mathjs's own unit definitions (REFERENCES §1 names mathjs).
    for (const from of TORQUE_UNIT_IDS) {
      for (const to of TORQUE_UNIT_IDS) {
        const expected = unit(37.5, MATHJS_UNIT[from]).toNumber(MATHJS_UNIT[to]);
        expect(convertTorque(37.5, from, to)).toBeCloseTo(expected, 10);
      }
    }
    // REFERENCES §1: math.unit('115 lbf in').toNumber('N m') = 12.993255338175919
    expect(unit(115, "lbf in").toNumber("N m")).toBeCloseTo(12.993255338175919, 12);
    expect(convertTorque(115, "lbf_in", "nm")).toBeCloseTo(12.993255338175919, 12);
  });
});

describe("worked conversions (REFERENCES §1, rounded half-up to 0.1)", () => {
  const cases: [number, TorqueUnit, TorqueUnit, number][] = [
    [115, "lbf_in", "nm", 13.0], // NIST SP 811 App. B.9 factor; worked value REFERENCES §1
    [80, "lbf_ft", "nm", 108.5], // NIST SP 811 App. B.9 factor; worked value REFERENCES §1
    [65, "lbf_ft", "nm", 88.1], // NIST SP 811 App. B.9 factor; worked value REFERENCES §1
    [9, "lbf_ft", "nm", 12.2], // NIST SP 811 App. B.9 factor; worked value REFERENCES §1
    [7, "lbf_ft", "nm", 9.5], // NIST SP 811 App. B.9 factor; worked value REFERENCES §1
    [25, "nm", "lbf_ft", 18.4], // NIST SP 811 App. B.9 factor; worked value REFERENCES §1
    [10, "nm", "lbf_in", 88.5], // NIST SP 811 App. B.9 factor; worked value REFERENCES §1
  ];
  it.each(cases)("%d %s → %s = %d", (value, from, to, expected) => {
    expect(roundHalfUp(convertTorque(value, from, to), 1)).toBe(expected);
  });

  it("formats with the unit label, half-up, keeping the trailing zero", () => {
    // NIST SP 811 App. B.9; REFERENCES §1: 115 lbf·in → 13.0 N·m
    expect(formatTorque(convertTorque(115, "lbf_in", "nm"), "nm")).toBe("13.0 N·m");
    // NIST SP 811 App. B.9; REFERENCES §1: 10 N·m → 88.5 lbf·in
    expect(formatTorque(convertTorque(10, "nm", "lbf_in"), "lbf_in")).toBe("88.5 lbf·in");
    // NIST SP 811 App. B.9; REFERENCES §1: 80 lbf·ft → 108.5 N·m, shown to 0 decimals → 108 (108.47)
    expect(formatTorque(convertTorque(80, "lbf_ft", "nm"), "nm", 0)).toBe("108 N·m");
    // 1 kgf·m = 9.80665 N·m exactly (NIST SP 811 App. B.9), shown to 2 decimals half-up
    expect(formatTorque(9.80665, "nm", 2)).toBe("9.81 N·m");
  });
});

describe("allUnits", () => {
  it("gives the value in every unit, the given one unchanged", () => {
    const all = allUnits(80, "lbf_ft");
    expect(Object.keys(all).sort()).toEqual([...TORQUE_UNIT_IDS].sort());
    expect(all.lbf_ft).toBe(80);
    // NIST SP 811 App. B.9; REFERENCES §1: 80 lbf·ft → 108.5 N·m
    expect(roundHalfUp(all.nm, 1)).toBe(108.5);
    // 1 ft = 12 in by definition (NIST SP 811 App. B.9): 80 lbf·ft = 960 lbf·in
    expect(all.lbf_in).toBeCloseTo(960, 10);
    // cross-check with mathjs units
    expect(all.kgf_m).toBeCloseTo(unit(80, "lbf ft").toNumber("kgf m"), 10);
  });
});

describe("roundHalfUp", () => {
  it("rounds halves away from zero despite binary representation", () => {
    // common trade practice, no published source: table values are read half-up
    expect(roundHalfUp(1.005, 2)).toBe(1.01); // 1.005 is stored as 1.00499999999999989…
    expect(roundHalfUp(12.25, 1)).toBe(12.3);
    expect(roundHalfUp(12.24, 1)).toBe(12.2);
    expect(roundHalfUp(2.5)).toBe(3);
    expect(roundHalfUp(-2.5)).toBe(-3);
    expect(Object.is(roundHalfUp(-0.04, 1), 0)).toBe(true);
  });

  it("refuses bad input", () => {
    expect(() => roundHalfUp(Number.NaN, 1)).toThrow(/not a finite number/);
    expect(() => roundHalfUp(1, -1)).toThrow(/Decimals/);
    expect(() => roundHalfUp(1, 1.5)).toThrow(/Decimals/);
  });
});

describe("validation and labels", () => {
  it("lists the four units with their labels", () => {
    expect(TORQUE_UNITS.map((u) => u.label)).toEqual(["N·m", "lbf·ft", "lbf·in", "kgf·m"]);
    expect(torqueUnitLabel("kgf_m")).toBe("kgf·m");
  });

  it("rejects NaN, infinities, negatives and unknown units with a clear error", () => {
    expect(() => convertTorque(Number.NaN, "nm", "lbf_ft")).toThrow("Torque must be a number.");
    expect(() => convertTorque(Number.POSITIVE_INFINITY, "nm", "lbf_ft")).toThrow(/finite/);
    expect(() => convertTorque(-1, "nm", "lbf_ft")).toThrow(/negative/);
    expect(() => convertTorque(1, "ft_lb" as TorqueUnit, "nm")).toThrow(/Unknown torque unit "ft_lb"/);
    expect(() => formatTorque(Number.NaN, "nm")).toThrow(/must be a number/);
    expect(() => allUnits(-5, "nm")).toThrow(/negative/);
  });

  it("keeps zero and same-unit conversions exact", () => {
    expect(convertTorque(0, "lbf_ft", "nm")).toBe(0);
    expect(convertTorque(13.7, "kgf_m", "kgf_m")).toBe(13.7);
  });
});
