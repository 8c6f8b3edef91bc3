import { describe, expect, it } from "vitest";
import { markUp } from "@/lib/money";
import { type MarkupRule, asMarkupRule, checkMarkupRule, markupPercentFor, sellFromCost } from "@/lib/parts-pricing";

// Worked examples of the parts markup rule. Markup on cost in bands is common trade practice, no
// published source; the expected values are worked by hand below each line (cost × (100 + p) / 100,
// rounded half-up once to the cent, the rounding lib/money.ts uses for line totals).

// common trade practice, no published source: up to $10: +100 %, up to $50: +60 %, above: +35 %.
const BANDS: MarkupRule = {
  kind: "bands",
  bands: [
    { upToMinor: 1000, percent: "100" },
    { upToMinor: 5000, percent: "60" },
    { upToMinor: null, percent: "35" },
  ],
};

describe("markUp (lib/money.ts)", () => {
  it("is exact and rounds half-up once", () => {
    expect(markUp(800, "100")).toBe(1600); // 8.00 × 2 = 16.00
    expect(markUp(1001, "62.5")).toBe(1627); // 10.01 × 1.625 = 16.26625 → 16.27
    expect(markUp(5, "35")).toBe(7); // 0.05 × 1.35 = 0.0675 → 0.07 (half-up)
    expect(markUp(10, "35")).toBe(14); // 0.10 × 1.35 = 0.135 → 0.14 (exactly half: up)
    expect(markUp(1234, "0")).toBe(1234);
    expect(markUp(1000, "150")).toBe(2500); // a markup may pass 100 %
  });
  it("refuses a percent it can't read", () => {
    expect(() => markUp(100, "-5")).toThrow(/percent/);
    expect(() => markUp(100, "12,5")).toThrow(/percent/);
    expect(() => markUp(-1, "10")).toThrow(/negative/);
  });
});

describe("the shop's markup bands", () => {
  it("gives each cost its band's markup, the band's top included", () => {
    expect(sellFromCost(800, BANDS)).toBe(1600); // $8.00 +100 % = $16.00
    expect(sellFromCost(1000, BANDS)).toBe(2000); // $10.00 is still the first band: $20.00
    expect(sellFromCost(1001, BANDS)).toBe(1602); // $10.01 +60 % = $16.016 → $16.02
    expect(sellFromCost(4999, BANDS)).toBe(7998); // $49.99 +60 % = $79.984 → $79.98
    expect(sellFromCost(5000, BANDS)).toBe(8000); // $50.00 +60 % = $80.00
    expect(sellFromCost(12000, BANDS)).toBe(16200); // $120.00 +35 % = $162.00
    expect(markupPercentFor(5001, BANDS)).toBe("35");
  });
  it("a flat percent, and no rule at all (prices are typed)", () => {
    expect(sellFromCost(2999, { kind: "percent", percent: "40" })).toBe(4199); // $29.99 × 1.4 = $41.986 → $41.99
    expect(sellFromCost(2999, { kind: "none" })).toBeNull();
  });
  it("refuses bands out of order or a closed last band, naming the field", () => {
    expect(() => checkMarkupRule({ kind: "bands", bands: [{ upToMinor: 5000, percent: "60" }, { upToMinor: 1000, percent: "100" }, { upToMinor: null, percent: "35" }] })).toThrow(
      expect.objectContaining({ fields: { "bands.1.upTo": ["Each band must end above the one before it."] } }),
    );
    expect(() => checkMarkupRule({ kind: "bands", bands: [{ upToMinor: 1000, percent: "100" }] })).toThrow(expect.objectContaining({ fields: { "bands.0.upTo": [expect.stringContaining("open")] } }));
    expect(() => checkMarkupRule({ kind: "percent", percent: "abc" })).toThrow(expect.objectContaining({ fields: { percent: [expect.any(String)] } }));
  });
  it("reads a stored rule back, and anything unreadable as no rule", () => {
    expect(asMarkupRule(JSON.stringify(BANDS))).toEqual(BANDS);
    expect(asMarkupRule({ kind: "bands", bands: [] })).toEqual({ kind: "none" });
    expect(asMarkupRule("{not json")).toEqual({ kind: "none" });
    expect(asMarkupRule(null)).toEqual({ kind: "none" });
  });
});
