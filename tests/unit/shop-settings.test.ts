import { describe, expect, it } from "vitest";
import { parseMoney, toleranceFor } from "@/lib/money";
import { TOLERANCE_PRESETS, isSupportedCurrency, isTimeZone, minorToInput, readOpeningHours, toleranceChoice, trimPercent } from "@/lib/shop-settings";

describe("shop settings helpers", () => {
  it("checks time-zone names with Intl, refusing anything it doesn't know", () => {
    expect(isTimeZone("America/Denver")).toBe(true);
    expect(isTimeZone("Europe/Vienna")).toBe(true);
    expect(isTimeZone("UTC")).toBe(true);
    expect(isTimeZone("Mars/Olympus_Mons")).toBe(false);
    expect(isTimeZone("America/Denver; DROP")).toBe(false);
    expect(isTimeZone("")).toBe(false);
  });

  it("offers only currencies it lists", () => {
    expect(isSupportedCurrency("USD")).toBe(true);
    expect(isSupportedCurrency("JPY")).toBe(true);
    expect(isSupportedCurrency("usd")).toBe(false);
    expect(isSupportedCurrency("XTS")).toBe(false);
  });

  it("shows stored amounts as the text parseMoney reads back, with the currency's minor units", () => {
    // ISO 4217 minor units: USD 2, JPY 0 (currency-codes, as lib/money.ts reads them); a euro
    // shop's field shows the decimal comma of its style (lib/number-input.ts).
    for (const [minor, currency, text] of [[9500, "USD", "95.00"], [5, "USD", "0.05"], [0, "EUR", "0,00"], [12000, "JPY", "12000"]] as const) {
      expect(minorToInput(minor, currency)).toBe(text);
      expect(parseMoney(text, currency)).toBe(minor);
    }
    expect(minorToInput(null, "USD")).toBe("");
    expect(trimPercent("8.250000")).toBe("8.25");
    expect(trimPercent("10.000000")).toBe("10");
    expect(trimPercent("0")).toBe("0");
  });

  it("names a stored tolerance by its preset, for USD shops only", () => {
    // Florida §559.909 (REFERENCES §6): greater of $10 or 10 %, capped at $50 → E = $300 allows $30.
    expect(toleranceFor(30_000, TOLERANCE_PRESETS.florida.setting)).toBe(3000);
    // Maryland §14-1002(b) (REFERENCES §6): 10 % → E = $400 allows $40.
    expect(toleranceFor(40_000, TOLERANCE_PRESETS.maryland.setting)).toBe(4000);
    expect(toleranceChoice({ kind: "greater_of", fixedMinor: 1000, percent: "10.000000", capMinor: 5000 }, "USD")).toBe("florida");
    expect(toleranceChoice({ kind: "greater_of", fixedMinor: 0, percent: "10", capMinor: null }, "USD")).toBe("maryland");
    expect(toleranceChoice({ kind: "greater_of", fixedMinor: 0, percent: "10", capMinor: null }, "EUR")).toBe("custom");
    expect(toleranceChoice({ kind: "greater_of", fixedMinor: 0, percent: "12", capMinor: null }, "USD")).toBe("custom");
    expect(toleranceChoice({ kind: "strict" }, "USD")).toBe("strict");
  });

  it("reads opening hours as stored, a broken day as closed", () => {
    expect(readOpeningHours(null)).toBeNull();
    expect(readOpeningHours("not json")).toBeNull();
    const hours = readOpeningHours('{"mon":{"open":"08:00","close":"17:30"},"tue":{"open":8},"sun":null}');
    expect(hours).toMatchObject({ mon: { open: "08:00", close: "17:30" }, tue: null, sun: null, sat: null });
  });
});
