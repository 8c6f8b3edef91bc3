import { describe, expect, it } from "vitest";
import { torqueProof } from "@/lib/bench";
import { roundHalfUp } from "@/lib/rounding";
import { fastenerFacts, nominalTorqueNm, outcomeText, plausibilityWarning, plausibleRangeNm, torqueHeadline, torqueOutcome } from "@/lib/torque-check";

describe("spec against applied", () => {
  it("flags the 72 / 65 lbf·ft axle nut as under spec, in the unit entered with the shop's beside it", () => {
    // (65 − 72) / 72 = −9.72 %: outside ±4 % (ISO 6789-1:2017 type II class A, from memory, unverified).
    const o = torqueOutcome({ specValue: 72, appliedValue: 65, tolerancePct: 4 });
    expect(o.kind).toBe("under");
    expect(o.kind !== "not_recorded" && roundHalfUp(o.deviationPct, 2)).toBe(-9.72);
    // NIST SP 811 App. B.9 via REFERENCES.md §1: 65 lbf·ft → 88.1 N·m; 72 lbf·ft → 97.6 N·m (72 × 1.355 818 = 97.619).
    expect(outcomeText({ specValue: 72, appliedValue: 65, unit: "lbf_ft", tolerancePct: 4 }, "nm")).toBe(
      "UNDER SPEC: torqued to 65.0 lbf·ft (88.1 N·m), 9.7 % under the 72.0 lbf·ft (97.6 N·m) spec (tolerance ±4 %)",
    );
    expect(torqueHeadline(80, "lbf_ft", "lbf_ft")).toBe("80.0 lbf·ft");
  });

  it("is within only inside the tolerance, inclusive; over is flagged; empty applied is not recorded", () => {
    expect(torqueOutcome({ specValue: 100, appliedValue: 104, tolerancePct: 4 }).kind).toBe("within");
    expect(torqueOutcome({ specValue: 100, appliedValue: 96, tolerancePct: 4 }).kind).toBe("within");
    expect(torqueOutcome({ specValue: 100, appliedValue: 104.1, tolerancePct: 4 }).kind).toBe("over");
    expect(torqueOutcome({ specValue: 100, appliedValue: 105, tolerancePct: 6 }).kind).toBe("within");
    expect(torqueOutcome({ specValue: 100, appliedValue: null, tolerancePct: 4 }).kind).toBe("not_recorded");
  });

  it("never says 'to spec' unless applied is within tolerance", () => {
    const base = { specValue: 72, unit: "lbf_ft" as const, displayUnit: "nm" as const, passPercents: [30, 60, 100], pattern: null };
    for (const appliedValue of [null, 65, 80, 60]) expect(torqueProof({ ...base, appliedValue })).not.toMatch(/to spec|within/);
    expect(torqueProof({ ...base, appliedValue: null })).toMatch(/^spec 72\.0 lbf·ft \(97\.6 N·m\); applied torque not recorded/);
    // A record made before tolerances were kept is judged by the default wrench's ±4 %.
    expect(torqueProof({ ...base, appliedValue: 72 })).toMatch(/^torqued to 72\.0 lbf·ft \(97\.6 N·m\), within ±4 %/);
  });
});

describe("plausibility by fastener size and class", () => {
  it("reads size and class from what was torqued", () => {
    expect(fastenerFacts("clutch cover bolts, 8 × M6")).toEqual({ diameterMm: 6, propertyClass: null });
    expect(fastenerFacts("M10x1.25 flange bolt 10.9")).toEqual({ diameterMm: 10, propertyClass: "10.9" });
    expect(fastenerFacts("Axle nut")).toEqual({ diameterMm: null, propertyClass: null });
    expect(fastenerFacts("Axle nut m5kq2x")).toEqual({ diameterMm: null, propertyClass: null });
    expect(fastenerFacts("m8 × 1.25 studs")).toEqual({ diameterMm: 8, propertyClass: null });
  });

  it("works the nominal from ISO 898-1 proof load at 75 %, K = 0.2", () => {
    // ISO 898-1:2013: M6 stress area 20.1 mm², class 8.8 proof stress 580 MPa [C]; 75 % and K = 0.2
    // common trade practice, no published source: 0.2 × 0.75 × 580 × 20.1 × 6 / 1000 = 10.49 N·m.
    expect(roundHalfUp(nominalTorqueNm(6, "8.8")!, 2)).toBe(10.49);
    // M10 10.9: 58.0 mm², 830 MPa → 0.2 × 0.75 × 830 × 58 × 10 / 1000 = 72.21 N·m.
    expect(roundHalfUp(nominalTorqueNm(10, "10.9")!, 2)).toBe(72.21);
    // Without a class: 15 % of 8.8 (1.57) to 130 % of 12.9 (970 MPa: 17.547 × 1.3 = 22.81) — common trade practice.
    const range = plausibleRangeNm(6, null)!;
    expect([roundHalfUp(range.low, 2), roundHalfUp(range.high, 2)]).toEqual([1.57, 22.81]);
  });

  it("names the likely unit swap", () => {
    // NIST SP 811 App. B.9 via REFERENCES.md §1: 96 lbf·ft = 130.2 N·m; 96 lbf·in = 10.8 N·m (96 × 0.112 984 8 = 10.85).
    expect(plausibilityWarning(96, "lbf_ft", "8 × M6")).toBe(
      "96.0 lbf·ft is 130.2 N·m, more than an M6 fastener (usually 1.6–22.8 N·m) — did you mean 96.0 lbf·in = 10.8 N·m?",
    );
    // 500 lbf·ft on M6: no unit makes it plausible, so no guess is offered.
    expect(plausibilityWarning(500, "lbf_ft", "8 × M6")).toMatch(/^500\.0 lbf·ft is 677\.9 N·m, more than an M6 fastener \(usually 1\.6–22\.8 N·m\)$/);
    // 10 N·m on an M6 is fine; a size the text doesn't name isn't judged.
    expect(plausibilityWarning(10, "nm", "8 × M6")).toBeNull();
    expect(plausibilityWarning(500, "lbf_ft", "Axle nut")).toBeNull();
  });
});
