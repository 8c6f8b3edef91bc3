import cc from "currency-codes";
import { describe, expect, it } from "vitest";
import { ISO_4217_CODES, iso4217Digits } from "@/lib/currency-minor-units";
import { currencyDigits } from "@/lib/money";

// The browser-sized table must say what the `currency-codes` package (ISO 4217) says, code for code.
describe("ISO 4217 minor units, as the browser reads them", () => {
  it("lists exactly the package's codes, each with its digits", () => {
    expect([...ISO_4217_CODES].sort()).toEqual(cc.codes().sort());
    for (const code of cc.codes()) expect([code, iso4217Digits(code)]).toEqual([code, cc.code(code)!.digits]);
  });

  it("reads codes in any case and refuses what is not a code", () => {
    expect(iso4217Digits("kwd")).toBe(3); // ISO 4217: Kuwaiti dinar, 3 minor-unit digits (REFERENCES §5)
    expect(iso4217Digits("ZZZ")).toBeUndefined();
    expect(() => currencyDigits("ZZZ")).toThrow(/Unknown currency code "ZZZ"/);
  });
});
