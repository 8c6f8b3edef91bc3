import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { inputText, parseMoney, parseQuantity } from "@/lib/money";
import { type NumberStyle, formatNumberInput, numberStyleFor, parseNumberInput } from "@/lib/number-input";
import { readNumberField } from "@/lib/schemas/number";
import { checkInSchema } from "@/lib/schemas/check-in";
import { SUPPORTED_CURRENCIES } from "@/lib/shop-settings";

// The reading rules are our own (lib/number-input.ts header); the marks of each locale are
// Intl.NumberFormat's (CLDR data shipped with Node's ICU).
const USD = numberStyleFor("USD");
const EUR = numberStyleFor("EUR");
const CAD = numberStyleFor("CAD");
const DKK = numberStyleFor("DKK");
const SEK = numberStyleFor("SEK");
const read = (text: string, style: NumberStyle) => {
  const r = parseNumberInput(text, style, { what: "Torque" });
  return r.ok ? r.value : r.message;
};

describe("the one number reader", () => {
  it("takes each locale's marks from Intl", () => {
    expect([USD.decimal, USD.group]).toEqual([".", ","]);
    expect([DKK.decimal, DKK.group]).toEqual([",", "."]);
    expect([SEK.decimal, SEK.group]).toEqual([",", "\u00a0"]);
    expect([numberStyleFor("CHF").decimal, numberStyleFor("CHF").group]).toEqual([".", "'"]);
    expect([EUR.decimal, EUR.firm, CAD.decimal, CAD.group, CAD.firm]).toEqual([",", true, ".", "\u00a0", false]);
  });

  it("reads 1,200 as twelve hundred in an en-US shop, never 1.2", () => {
    expect(read("1,200", USD)).toBe(1200);
    expect(read("1,200.5", USD)).toBe(1200.5);
    expect(read("1 200", USD)).toBe(1200);
    expect(read("1.200", USD)).toBe(1.2);
    expect(read("0.125", USD)).toBe(0.125);
    expect(read(".5", USD)).toBe(0.5);
  });

  it("refuses the shop's grouping mark used as a decimal mark, with the spelling to use", () => {
    expect(read("1,2", USD)).toBe("Torque: “1,2” isn’t how this shop writes numbers (1,234.5) — write 1.2.");
    expect(read("0,125", USD)).toBe("Torque: “0,125” isn’t how this shop writes numbers (1,234.5) — write 0.125.");
    expect(read("1.200,5", USD)).toMatch(/write 1200\.5\.$/);
    expect(read("1.2", DKK)).toMatch(/write 1,2\.$/);
  });

  it("refuses a lone mark before three digits where the shop's style doesn't decide, showing both readings", () => {
    expect(read("1,200", CAD)).toBe("Torque: “1,200” could be 1200 (the comma grouping thousands) or 1,2 (a decimal comma) — write 1200 or 1,2.");
    expect(read("1.200", CAD)).toBe("Torque: “1.200” could be 1200 (the point grouping thousands) or 1.2 (a decimal point) — write 1200 or 1.2.");
    // A euro shop writes a decimal comma (fr-FR's marks): "1,200" is 1.2 there and "1.200" has two readings.
    expect(read("1,200", EUR)).toBe(1.2);
    expect(read("1.200", EUR)).toMatch(/could be 1200 .* or 1\.2 /);
    // A space-grouping shop: the point is nobody's grouping mark there, so "1.200" is both.
    expect(read("1.200", SEK)).toMatch(/could be 1200 .* or 1\.2 /);
    // Three significant decimals: the suggested spelling can't be ambiguous again.
    expect(read("1,234", CAD)).toMatch(/write 1234 or 1,2340\.$/);
    // Only one reading: taken.
    expect(read("1,5", CAD)).toBe(1.5);
    expect(read("1 234,5", CAD)).toBe(1234.5);
    expect(read("0,125", CAD)).toBe(0.125);
    const refusal = parseNumberInput("1,200", CAD);
    expect(refusal.ok === false && refusal.readings.sort((a, b) => a - b)).toEqual([1.2, 1200]);
  });

  it("keeps the decimals typed (resolution) and applies the field's rules", () => {
    expect(parseNumberInput("0.20", USD)).toMatchObject({ ok: true, value: 0.2, canonical: "0.20", decimals: 2 });
    expect(read("-3", USD)).toBe("Torque can’t be negative.");
    expect(parseNumberInput("-0.5", USD, { allowNegative: true })).toMatchObject({ ok: true, value: -0.5 });
    expect(parseNumberInput("2.5", USD, { what: "Bolts", maxDecimals: 0 })).toMatchObject({ ok: false, message: "Bolts must be a whole number." });
    expect(parseNumberInput("60.5", USD, { what: "Minutes", max: 60 })).toMatchObject({ ok: false, message: "Minutes must be at most 60." });
    for (const junk of ["", "abc", "12.", "1e3", "--1", ".", "1,,200", "1,20,0", "1 2", "1'200 000"]) {
      expect(parseNumberInput(junk, USD).ok, junk).toBe(false);
    }
  });

  it("reads money's comma the same way as torque's", () => {
    // Same reader, same shop style: "1,200" is 1200 in both, never 1.2.
    expect(parseMoney("1,200", "USD")).toBe(120_000);
    expect(readNumberField("specValue", "1,200", USD, { what: "Spec torque" })).toBe(1200);
    expect(() => parseMoney("12,50", "USD")).toThrow(/is not a valid USD amount: .*write 12\.5/);
    expect(parseMoney("12,50", "SEK")).toBe(1250);
    // What a field is filled with reads back in every shop's style (1.250 L of oil: 1250 thousandths).
    for (const currency of SUPPORTED_CURRENCIES) expect(parseQuantity(inputText("1.250", currency), currency), currency).toBe(1250);
    expect(() => parseMoney("1,200", "CAD")).toThrow(/could be 1200 .* or 1,2 /);
    expect(() => readNumberField("specValue", "1,200", CAD, { what: "Spec torque" })).toThrow(expect.objectContaining({ fields: { specValue: [expect.stringMatching(/could be 1200/)] } }));
  });
});

describe("format → parse round trips (fast-check)", () => {
  const styles = SUPPORTED_CURRENCIES.map((c) => [c, numberStyleFor(c)] as const);

  it.each(styles)("%s: what the field shows reads back as the same number and resolution", (_code, style) => {
    fc.assert(
      fc.property(fc.oneof(fc.bigInt({ min: 0n, max: 10n ** 7n }), fc.bigInt({ min: 0n, max: 10n ** 13n })), fc.integer({ min: 0, max: 4 }), fc.boolean(), (n, decimals, negative) => {
        const value = (negative ? -1 : 1) * (Number(n) / 10 ** decimals);
        const text = formatNumberInput(value, style, decimals);
        const r = parseNumberInput(text, style, { allowNegative: true });
        // Where a lone mark before three digits has two readings, the field shows one more zero.
        const shown = !style.firm && decimals === 3 && /^-?[1-9]\d{0,2}[.,]\d{4}$/.test(text) ? 4 : decimals;
        expect(r).toMatchObject({ ok: true, decimals: shown });
        expect(r.ok && r.value).toBe(value === 0 ? r.ok && r.value : value);
      }),
      { numRuns: 400 },
    );
  });

  it.each(styles)("%s: a lone mark before three digits is never read a thousand times off the style's meaning", (_code, style) => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 999 }), fc.integer({ min: 0, max: 999 }), fc.constantFrom(".", ","), (whole, part, mark) => {
        const text = `${whole}${mark}${String(part).padStart(3, "0")}`;
        const r = parseNumberInput(text, style);
        if (!r.ok) return; // refused: fine
        // Read as a decimal only where the mark is the style's firm decimal mark, as grouping only where it groups.
        if (mark === style.decimal && style.firm) expect(r.value).toBe(Number(`${whole}.${String(part).padStart(3, "0")}`));
        else if (mark === style.group) expect(r.value).toBe(whole * 1000 + part);
        else throw new Error(`${text} was read as ${r.value} in ${style.locale}, where "${mark}" means neither`);
      }),
      { numRuns: 300 },
    );
  });

  it("canonical text reads back to itself in every point-decimal shop", () => {
    fc.assert(
      fc.property(fc.bigInt({ min: 0n, max: 10n ** 15n }), fc.integer({ min: 0, max: 6 }), (n, decimals) => {
        const text = decimals ? `${n / 10n ** BigInt(decimals)}.${String(n % 10n ** BigInt(decimals)).padStart(decimals, "0")}` : String(n);
        const r = parseNumberInput(text, USD);
        expect(r.ok && r.canonical).toBe(text);
      }),
    );
  });
});

describe("check-in numbers, read before the shop is known", () => {
  const form = (over: Record<string, string>) => ({
    customerMode: "new", customerName: "Hollis Varga", customerEmail: "hollis@mail.test", machineMode: "new", machineOdometerUnit: "mi", machineKind: "dirt_bike", machineMake: "Corvane", machineModel: "Tarn 250", concern: "Stalls.", ...over,
  });
  const field = (name: string, value: string) => {
    const r = checkInSchema.safeParse(form({ [name]: value }));
    return r.success ? "ok" : r.error.issues.filter((i) => i.path[0] === name).map((i) => i.message).join(" ");
  };
  it("takes what every convention reads alike and refuses the rest with both readings", () => {
    expect(checkInSchema.parse(form({ machineHours: "312,4", machineOdometer: "6,120" })).machine).toMatchObject({ hours: 312.4, odometer: 6120 });
    expect(field("machineHours", "1,200")).toBe("The number: “1,200” could be 1200 (the comma grouping thousands) or 1,2 (a decimal comma) — write 1200 or 1,2.");
    // Not well-formed grouping, and a whole number can't be 1.2: refused, never 12.
    expect(field("machineOdometer", "1,2")).toBe("Odometer is a whole number, like 6120");
  });
});
