import { describe, expect, it } from "vitest";
import {
  MoneyError,
  type Line,
  type StatusLine,
  type TotalsSettings,
  approvalCeiling,
  authorisedTotal,
  currencyDigits,
  discountAmount,
  formatHours,
  formatMoney,
  formatQuantity,
  lineTotal,
  needsApproval,
  parseHours,
  parseMoney,
  parseQuantity,
  taxLabel,
  toleranceFor,
  totals,
} from "@/lib/money";

// Intl puts a no-break space between a currency code and the number; compare with plain spaces.
const plain = (s: string) => s.replace(/\u00a0/g, " ");
const fee = (amountMinor: number, taxable = true): Line => ({ kind: "fee", amountMinor, taxable });
const tax825 = (method: "per_line" | "per_invoice"): TotalsSettings => ({ tax: { ratePercent: "8.25", method } });

describe("sales tax: exact, rounded half-up to the cent once", () => {
  const items = [fee(1999), fee(4250), fee(699)];

  it("per line: 1.65 + 3.51 + 0.58 = $5.74", () => {
    const t = totals(items, tax825("per_line"));
    // SSUTA §324 / RCW 82.08.054, REFERENCES §5 worked example (per item)
    expect(t.lines.map((l) => l.taxMinor)).toEqual([165, 351, 58]);
    expect(t.taxMinor).toBe(574); // SSUTA §324 / RCW 82.08.054, REFERENCES §5
    expect(t.subtotalMinor).toBe(6948); // 19.99 + 42.50 + 6.99, REFERENCES §5
    expect(t.totalMinor).toBe(6948 + 574);
  });

  it("per invoice: 69.48 × 8.25 % = 5.7321 → $5.73", () => {
    const t = totals(items, tax825("per_invoice"));
    expect(t.taxableBaseMinor).toBe(6948); // REFERENCES §5
    expect(t.taxMinor).toBe(573); // SSUTA §324 / RCW 82.08.054, REFERENCES §5 worked example (per invoice)
    expect(t.lines.every((l) => l.taxMinor === null)).toBe(true);
  });

  it("does not round twice: $0.06 × 7.5 % = 0.0045 → $0.00", () => {
    const t = totals([fee(6)], { tax: { ratePercent: "7.5", method: "per_invoice" } });
    expect(t.taxMinor).toBe(0); // SSUTA §324 / RCW 82.08.054, REFERENCES §5 edge (double rounding would give $0.01)
  });

  it("rounds up when the third decimal is 5 or more, down when it is 4", () => {
    // $10.00 × 0.05 % = 0.005 → third decimal 5 → $0.01: SSUTA §324 / RCW 82.08.054 (REFERENCES §5)
    expect(totals([fee(1000)], { tax: { ratePercent: "0.05", method: "per_line" } }).taxMinor).toBe(1);
    // $0.01 × 49.9 % = 0.00499 → third decimal 4 → $0.00: SSUTA §324 / RCW 82.08.054 (REFERENCES §5)
    expect(totals([fee(1)], { tax: { ratePercent: "49.9", method: "per_line" } }).taxMinor).toBe(0);
  });

  it("reads rates exactly, including three decimals and DECIMAL-column trailing zeros", () => {
    // $100.00 × 8.875 % = 8.875 → $8.88: SSUTA §324 / RCW 82.08.054 half-up rule (REFERENCES §5)
    expect(totals([fee(10000)], { tax: { ratePercent: "8.875", method: "per_invoice" } }).taxMinor).toBe(888);
    // Same rate as "8.2500" → same per-invoice tax as the REFERENCES §5 example, $5.73
    expect(totals(items, { tax: { ratePercent: "8.2500", method: "per_invoice" } }).taxMinor).toBe(573);
  });

  it("leaves non-taxable lines out of the taxable base", () => {
    const t = totals([fee(1999), fee(4250, false)], tax825("per_invoice"));
    expect(t.taxableBaseMinor).toBe(1999);
    expect(t.taxMinor).toBe(165); // 19.99 × 8.25 % = 1.649175 → 1.65, SSUTA §324 / RCW 82.08.054 (REFERENCES §5)
  });

  // A rate per kind (parts at the shop's rate, labour or the supplies fee at their own) is common
  // trade practice where jurisdictions tax labour differently, no published source; each amount is
  // still rounded half-up once (SSUTA §324 / RCW 82.08.054, REFERENCES §5), per line or per rate.
  const part = (unitPriceMinor: number): Line => ({ kind: "part", qtyThousandths: 1000, unitPriceMinor, taxable: true });
  const labour = (rateMinor: number): Line => ({ kind: "labour", hoursTenths: 10, rateMinor, taxable: true });
  const split = (method: "per_line" | "per_invoice"): TotalsSettings => ({ tax: { ratePercent: "8.25", method, kindRates: { labour: "5", supplies: "0" } }, supplies: { percent: "10", base: "labour", capMinor: null, taxable: true } });

  it("taxes each kind at its own rate, per line", () => {
    const t = totals([part(1999), part(2999), labour(9999)], split("per_line"));
    // 19.99 × 8.25 % = 1.649175 → 1.65; 29.99 × 8.25 % = 2.474175 → 2.47 (REFERENCES §5 per-item example)
    // 99.99 × 5 % = 4.9995 → 5.00; supplies 10 % of 99.99 = 9.999 → 10.00, at 0 % → 0.00
    expect(t.lines.map((l) => l.taxMinor)).toEqual([165, 247, 500]);
    expect(t.suppliesMinor).toBe(1000);
    expect(t.taxByRate).toEqual([
      { ratePercent: "0", baseMinor: 1000, taxMinor: 0 },
      { ratePercent: "5", baseMinor: 9999, taxMinor: 500 },
      { ratePercent: "8.25", baseMinor: 4998, taxMinor: 412 },
    ]);
    expect(t.taxMinor).toBe(912);
  });

  it("rounds once per rate on that rate's base, per invoice", () => {
    const t = totals([part(1999), part(2999), labour(9999)], split("per_invoice"));
    // 49.98 × 8.25 % = 4.12335 → 4.12; 99.99 × 5 % = 4.9995 → 5.00
    expect(t.taxByRate.map((g) => [g.ratePercent, g.taxMinor])).toEqual([["0", 0], ["5", 500], ["8.25", 412]]);
    expect(t.taxMinor).toBe(912);
    expect(t.taxableBaseMinor).toBe(4998 + 9999 + 1000);
  });

  it("reads as one rate when no kind has its own", () => {
    const t = totals([part(1999), labour(9999)], tax825("per_invoice"));
    expect(t.taxByRate).toEqual([{ ratePercent: "8.25", baseMinor: 11998, taxMinor: 990 }]); // 119.98 × 8.25 % = 9.89835 → 9.90
  });

  it("names the rates on the tax row", () => {
    expect(taxLabel({ ratePercent: "8.250000", method: "per_line" })).toBe("Tax (8.25 %)");
    expect(taxLabel({ ratePercent: "10", method: "per_line" })).toBe("Tax (10 %)");
    expect(taxLabel({ ratePercent: "8.25", method: "per_line", kindRates: { labour: "5.000000", fee: "8.25" } })).toBe("Tax (parts 8.25 %, labour 5 %)");
  });

  it("refuses a kind rate that is not a percent", () => {
    expect(() => totals([labour(100)], { tax: { ratePercent: "8", method: "per_line", kindRates: { labour: "lots" } } })).toThrow(MoneyError);
  });
});

describe("ISO 4217 minor units and formatting", () => {
  it("takes minor units from currency-codes", () => {
    expect(currencyDigits("USD")).toBe(2); // ISO 4217 via currency-codes, REFERENCES §5
    expect(currencyDigits("JPY")).toBe(0); // ISO 4217 via currency-codes, REFERENCES §5
    expect(currencyDigits("KWD")).toBe(3); // ISO 4217 via currency-codes, REFERENCES §5
  });

  it("formats with exactly the ISO number of decimals", () => {
    expect(formatMoney(123450, "USD")).toBe("$1,234.50"); // ISO 4217 USD 2 digits, REFERENCES §5
    expect(formatMoney(1234, "JPY")).toBe("¥1,234"); // ISO 4217 JPY 0 digits, REFERENCES §5
    expect(plain(formatMoney(1234567, "KWD"))).toBe("KWD 1,234.567"); // ISO 4217 KWD 3 digits, REFERENCES §5
    expect(formatMoney(-1250, "USD")).toBe("-$12.50");
  });

  it("follows ISO, not Intl, where they disagree (HUF: ISO 2, Intl 0)", () => {
    // ISO 4217 via currency-codes, REFERENCES §5 ("they disagree for ~29 codes")
    expect(plain(formatMoney(123450, "HUF"))).toBe("HUF 1,234.50");
  });

  it("is exact up to the largest safe integer", () => {
    expect(formatMoney(Number.MAX_SAFE_INTEGER, "USD")).toBe("$90,071,992,547,409.91");
  });

  it("refuses unknown currencies and non-integer amounts", () => {
    expect(() => formatMoney(100, "XYZ")).toThrow(/Unknown currency code "XYZ"/);
    expect(() => formatMoney(12.5, "USD")).toThrow("Amount (minor units) must be a whole number, got 12.5.");
    expect(() => formatMoney(2 ** 53, "USD")).toThrow(MoneyError);
  });
});

describe("parsing what people type", () => {
  it("reads amounts into minor units", () => {
    expect(parseMoney("12.50", "USD")).toBe(1250);
    expect(parseMoney(" 1,234.5 ", "USD")).toBe(123450);
    expect(parseMoney(".5", "USD")).toBe(50);
    expect(parseMoney("1,234", "JPY")).toBe(1234);
    expect(parseMoney("1.234", "KWD")).toBe(1234);
    expect(parseMoney("-3", "USD", { allowNegative: true })).toBe(-300);
  });

  it("refuses extra decimals, negatives, junk and huge numbers with clear messages", () => {
    expect(() => parseMoney("12.505", "USD")).toThrow("A USD amount has at most 2 decimal places (got 12.505).");
    expect(() => parseMoney("12.5", "JPY")).toThrow("A JPY amount here has no decimal places (got 12.5).");
    expect(() => parseMoney("1.2345", "KWD")).toThrow(/at most 3 decimal places/);
    expect(() => parseMoney("-3", "USD")).toThrow("A USD amount can't be negative (got -3).");
    for (const junk of ["", "abc", "12.", "1,23.4", "1e3", "$12", "12,50", "--1", "."]) {
      expect(() => parseMoney(junk, "USD"), junk).toThrow(/is not a valid USD amount/);
    }
    expect(() => parseMoney("99999999999999999", "USD")).toThrow(/too large/);
  });

  it("reads hours as tenths and quantities as thousandths", () => {
    expect(parseHours("1.5")).toBe(15);
    expect(parseHours("2")).toBe(20);
    expect(() => parseHours("1.25")).toThrow(/at most 1 decimal place/);
    expect(parseQuantity("1.5")).toBe(1500);
    expect(parseQuantity("0.25")).toBe(250);
    expect(() => parseQuantity("-1")).toThrow(/can't be negative/);
    expect([formatHours(15), formatHours(20)]).toEqual(["1.5", "2"]);
    expect([formatQuantity(1500), formatQuantity(2000), formatQuantity(1050), formatQuantity(10000)]).toEqual(["1.5", "2", "1.05", "10"]);
  });
});

describe("line totals", () => {
  it("parts: quantity × unit price", () => {
    expect(lineTotal({ kind: "part", qtyThousandths: 2000, unitPriceMinor: 1299, taxable: true })).toBe(2598);
    // 1.5 L at $8.99 = 13.485 → $13.49, half-up to the cent: common trade practice, no published source
    expect(lineTotal({ kind: "part", qtyThousandths: 1500, unitPriceMinor: 899, taxable: true })).toBe(1349);
  });

  it("labour: tenths of an hour × rate, half-up to the cent", () => {
    expect(lineTotal({ kind: "labour", hoursTenths: 15, rateMinor: 9500, taxable: false })).toBe(14250);
    // 0.3 h × $89.99 = 26.997 → $27.00: common trade practice, no published source
    expect(lineTotal({ kind: "labour", hoursTenths: 3, rateMinor: 8999, taxable: false })).toBe(2700);
    // 0.5 h × $80.01 = 40.005 → $40.01 (half-up): common trade practice, no published source
    expect(lineTotal({ kind: "labour", hoursTenths: 5, rateMinor: 8001, taxable: false })).toBe(4001);
  });

  it("refuses bad lines", () => {
    expect(() => lineTotal({ kind: "part", qtyThousandths: 1000, unitPriceMinor: 12.5, taxable: true })).toThrow(/Part unit price \(minor units\) must be a whole number/);
    expect(() => lineTotal({ kind: "labour", hoursTenths: -5, rateMinor: 9000, taxable: true })).toThrow(/can't be negative/);
    expect(() => lineTotal({ kind: "tip", amountMinor: 1 } as unknown as Line)).toThrow(/Unknown line kind "tip"/);
  });
});

describe("discounts and the shop-supplies fee", () => {
  it("never takes a line or the subtotal below zero", () => {
    expect(discountAmount(2598, { kind: "amount", amountMinor: 5000 })).toBe(2598);
    expect(discountAmount(14250, { kind: "percent", percent: "10" })).toBe(1425);
    const t = totals([{ ...fee(2000), discount: { kind: "amount", amountMinor: 9999 } }, fee(500)], {
      ...tax825("per_line"),
      subtotalDiscount: { kind: "amount", amountMinor: 100000 },
    });
    expect(t.lines.map((l) => l.netMinor)).toEqual([0, 0]);
    expect([t.discountsMinor, t.preTaxTotalMinor, t.taxMinor, t.totalMinor]).toEqual([2500, 0, 0, 0]);
    expect(() => discountAmount(1000, { kind: "percent", percent: "120" })).toThrow(/more than 100 %/);
    expect(() => discountAmount(1000, { kind: "amount", amountMinor: -5 })).toThrow(/can't be negative/);
  });

  it("spreads a subtotal discount across lines in proportion, so the taxable base shrinks with it", () => {
    // Proportional allocation, remainders to the largest fractions: common trade practice, no published source
    const t = totals([fee(3000), fee(1000, false)], { ...tax825("per_invoice"), subtotalDiscount: { kind: "amount", amountMinor: 1000 } });
    expect(t.lines.map((l) => l.subtotalDiscountShareMinor)).toEqual([750, 250]);
    expect(t.taxableBaseMinor).toBe(2250);
    expect(t.taxMinor).toBe(186); // 22.50 × 8.25 % = 1.85625 → 1.86, SSUTA §324 / RCW 82.08.054 (REFERENCES §5)
    const thirds = totals([fee(1), fee(1), fee(1)], { ...tax825("per_line"), subtotalDiscount: { kind: "amount", amountMinor: 2 } });
    expect(thirds.lines.map((l) => l.subtotalDiscountShareMinor)).toEqual([1, 1, 0]);
  });

  it("charges a percent of labour (or parts + labour), half-up, capped", () => {
    const labour: Line = { kind: "labour", hoursTenths: 15, rateMinor: 9500, taxable: false };
    const part: Line = { kind: "part", qtyThousandths: 1000, unitPriceMinor: 5000, taxable: true };
    const supplies = { percent: "7.5", base: "labour" as const, capMinor: 2500, taxable: false };
    // 7.5 % of $142.50 = 10.6875 → $10.69, half-up: common trade practice, no published source
    expect(totals([labour, part], { ...tax825("per_line"), supplies }).suppliesMinor).toBe(1069);
    // 7.5 % of ($142.50 + $50.00) = 14.4375 → $14.44: common trade practice, no published source
    expect(totals([labour, part], { ...tax825("per_line"), supplies: { ...supplies, base: "parts_and_labour" } }).suppliesMinor).toBe(1444);
    // 7.5 % of 4 h × $95 = $28.50, capped at $25.00: common trade practice, no published source
    const big = totals([{ ...labour, hoursTenths: 40 }], { ...tax825("per_line"), supplies });
    expect(big.suppliesMinor).toBe(2500);
    expect(big.preTaxTotalMinor).toBe(38000 + 2500);
    // Taxable supplies join the taxable base: 8.25 % of $25.00 = 2.0625 → $2.06, SSUTA §324 / RCW 82.08.054
    expect(totals([{ ...labour, hoursTenths: 40 }], { ...tax825("per_line"), supplies: { ...supplies, taxable: true } }).taxMinor).toBe(206);
  });

  it("refuses bad rates and settings", () => {
    expect(() => totals([fee(100)], { tax: { ratePercent: "8.25%", method: "per_line" } })).toThrow(/Tax rate must be a number of percent/);
    expect(() => totals([fee(100)], { tax: { ratePercent: 8.25 as unknown as string, method: "per_line" } })).toThrow(MoneyError);
    expect(() => totals([fee(100)], { tax: { ratePercent: "8", method: "sometimes" as "per_line" } })).toThrow(/per_line or per_invoice/);
    expect(() => totals([{ kind: "fee", amountMinor: 100 } as Line], tax825("per_line"))).toThrow(/taxable: true or false/);
  });
});

describe("estimate, authorisation and the over-estimate tolerance (pre-tax)", () => {
  const florida = { kind: "greater_of", fixedMinor: 1000, percent: "10", capMinor: 5000 } as const;
  const maryland = { kind: "greater_of", fixedMinor: 0, percent: "10" } as const;

  it("Florida: greater of $10 or 10 %, capped at $50", () => {
    expect(toleranceFor(8000, florida)).toBe(1000); // Fla. Stat. §559.909, REFERENCES §6: E = $80 → $10
    expect(toleranceFor(30000, florida)).toBe(3000); // Fla. Stat. §559.909, REFERENCES §6: E = $300 → $30
    expect(toleranceFor(80000, florida)).toBe(5000); // Fla. Stat. §559.909, REFERENCES §6: E = $800 → $50
    expect(needsApproval(30000, 33000, florida)).toBe(false); // Fla. Stat. §559.909: "more than" $30 over needs consent
    expect(needsApproval(30000, 33001, florida)).toBe(true); // Fla. Stat. §559.909, REFERENCES §6
  });

  it("Maryland: 10 % over the estimate, $400 → $440 ceiling", () => {
    expect(approvalCeiling(40000, maryland)).toBe(44000); // Md. Com. Law §14-1002(b), REFERENCES §6
    expect(needsApproval(40000, 44000, maryland)).toBe(false); // Md. Com. Law §14-1002(b), REFERENCES §6
    expect(needsApproval(40000, 44001, maryland)).toBe(true); // Md. Com. Law §14-1002(b), REFERENCES §6
  });

  it("strict by default: any increase needs approval", () => {
    // Default per issue 5 / REFERENCES §6 ("default strict (any increase needs approval)")
    expect(toleranceFor(40000)).toBe(0);
    expect(needsApproval(40000, 40001)).toBe(true);
    expect(needsApproval(40000, 40000)).toBe(false);
    expect(needsApproval(40000, 39000, { kind: "strict" })).toBe(false);
  });

  it("compares totals without sales tax", () => {
    // REFERENCES §6: several such rules leave sales tax out of the comparison
    const settings = tax825("per_invoice");
    const estimate = totals([fee(40000)], settings);
    const proposed = totals([fee(44000)], settings);
    expect(proposed.totalMinor).toBe(47630); // $440 + 8.25 % ($36.30), SSUTA §324 / RCW 82.08.054
    expect(needsApproval(estimate.preTaxTotalMinor, proposed.preTaxTotalMinor, maryland)).toBe(false); // Md. Com. Law §14-1002(b)
  });

  it("authorises only approved lines", () => {
    const lines: StatusLine[] = [
      { ...fee(1999), status: "approved" },
      { ...fee(4250), status: "declined" },
      { ...fee(699), status: "approved" },
      { ...fee(10000), status: "pending" },
    ];
    const t = authorisedTotal(lines, tax825("per_line"));
    expect(t.subtotalMinor).toBe(2698);
    expect(t.taxMinor).toBe(165 + 58); // per-line taxes from REFERENCES §5 (SSUTA §324 / RCW 82.08.054)
    expect(() => authorisedTotal([{ ...fee(1), status: "maybe" as "pending" }], tax825("per_line"))).toThrow(/approved, declined or pending/);
  });

  it("refuses bad tolerance settings", () => {
    expect(() => toleranceFor(1000, { kind: "greater_of", fixedMinor: 1000, percent: "ten" })).toThrow(/Tolerance percent/);
    expect(() => toleranceFor(-1, florida)).toThrow(/Estimate \(minor units\) can't be negative/);
    expect(() => toleranceFor(1000, { kind: "lenient" } as unknown as typeof florida)).toThrow(/strict" or "greater_of/);
  });
});
