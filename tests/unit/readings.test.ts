import { describe, expect, it } from "vitest";
import { evaluateReading } from "@/lib/readings";

// The limits here are invented, as a shop would type them from its manual; the checks test
// the comparison rule: limits are inclusive (common trade practice, no published source).

describe("evaluateReading", () => {
  it("is within between inclusive limits, and at either limit", () => {
    expect(evaluateReading({ value: 0.1, min: 0.05, max: 0.15, unit: "mm" })).toMatchObject({ verdict: "within" });
    expect(evaluateReading({ value: 0.05, min: 0.05, max: 0.15 })).toMatchObject({ verdict: "within", marginText: "at the minimum" });
    expect(evaluateReading({ value: 0.15, min: 0.05, max: 0.15 })).toMatchObject({ verdict: "within", marginText: "at the maximum" });
  });

  it("reports how far past the limit a reading is, without float noise", () => {
    const above = evaluateReading({ value: 0.35, min: 0.1, max: 0.2, unit: "mm" });
    expect(above.verdict).toBe("above");
    expect(above.margin).toBeCloseTo(0.15, 12);
    expect(above.marginText).toBe("0.15 mm over the maximum");

    const below = evaluateReading({ value: 3.8, min: 4, unit: "mm" });
    expect(below).toMatchObject({ verdict: "below", marginText: "0.2 mm under the minimum" });
  });

  it("names the nearer limit when within", () => {
    expect(evaluateReading({ value: 0.18, min: 0.1, max: 0.2, unit: "mm" }).marginText).toBe("0.02 mm under the maximum");
    expect(evaluateReading({ value: 12.2, min: 12, max: 13, unit: "V" }).marginText).toBe("0.2 V over the minimum");
    // Only a maximum (e.g. runout) or only a minimum (e.g. pad thickness)
    expect(evaluateReading({ value: 0.03, max: 0.05 })).toMatchObject({ verdict: "within", marginText: "0.02 under the maximum" });
    expect(evaluateReading({ value: 1, min: 1.5 })).toMatchObject({ verdict: "below", marginText: "0.5 under the minimum" });
    expect(evaluateReading({ value: 300, min: 150, max: null })).toMatchObject({ verdict: "within", margin: 150 });
  });

  it("gives no verdict without a limit", () => {
    expect(evaluateReading({ value: 7 })).toEqual({ verdict: "no_limit" });
    expect(evaluateReading({ value: 7, min: null, max: null })).toEqual({ verdict: "no_limit" });
  });

  it("refuses bad input with a clear error", () => {
    expect(() => evaluateReading({ value: Number.NaN, max: 1 })).toThrow(/reading must be a finite number/);
    expect(() => evaluateReading({ value: 1, min: 2, max: 1 })).toThrow(/minimum \(2\) can't be above the maximum \(1\)/);
    expect(() => evaluateReading({ value: 1, max: Number.POSITIVE_INFINITY })).toThrow(/maximum must be a finite number/);
  });

  it("accepts equal min and max as an exact value", () => {
    expect(evaluateReading({ value: 2, min: 2, max: 2 })).toMatchObject({ verdict: "within" });
    expect(evaluateReading({ value: 2.01, min: 2, max: 2 })).toMatchObject({ verdict: "above", marginText: "0.01 over the maximum" });
  });

  it("keeps the typed resolution in the margin: 0.20 against 0.10–0.25 is 0.05, never coarser", () => {
    // 0.25 − 0.20 = 0.05; with decimals 3 (a 0.001 mm instrument) the margin shows 0.050
    expect(evaluateReading({ value: 0.2, min: 0.1, max: 0.25, unit: "mm", decimals: 3 }).marginText).toBe("0.050 mm under the maximum");
    // without decimals, as before: as many decimals as the numbers need
    expect(evaluateReading({ value: 0.2, min: 0.1, max: 0.25, unit: "mm" }).marginText).toBe("0.05 mm under the maximum");
  });
});
