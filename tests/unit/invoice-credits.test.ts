import { describe, expect, it } from "vitest";
import type { DraftLine } from "@/lib/approvals";
import { type InvoiceLine, priceInvoice } from "@/lib/invoices";
import { MoneyError, STRICT_TOLERANCE, totals } from "@/lib/money";

// Issue 19: a returned core is a credit line of its own, priced negative with its tax, never a
// negative amount typed on a line. The whole core charge comes back when the old part goes back:
// common trade practice, no published source.

const blank: DraftLine = { kind: "fee", description: "", partNumber: null, qtyThousandths: null, unitPriceMinor: null, hoursTenths: null, rateMinor: null, amountMinor: null, taxable: true };
const rotor: InvoiceLine = { ...blank, kind: "part", description: "Front rotor", qtyThousandths: 1000, unitPriceMinor: 4250, source: "authorised", requestPublicId: "REQUESTxxxxxxxxx", requestLineNo: 1 };
const core = (source: "core_charge" | "core_credit"): InvoiceLine => ({ ...blank, description: source, amountMinor: 2500, source, requestPublicId: null, requestLineNo: null, partId: 7 });
const perLine = { tax: { ratePercent: "8.25", method: "per_line" as const }, supplies: null };
const perInvoice = { tax: { ratePercent: "8.25", method: "per_invoice" as const }, supplies: null };
const price = (lines: InvoiceLine[], settings: Parameters<typeof priceInvoice>[0]["settings"] = perLine, discount: Parameters<typeof priceInvoice>[0]["discount"] = null) =>
  priceInvoice({ lines, settings, discount, authorisedPreTaxMinor: 4250, tolerance: STRICT_TOLERANCE });

describe("core charges and credits on the invoice", () => {
  it("a core charge is a charge like an added line: past a strict estimate it is flagged, not charged", () => {
    const p = price([rotor, core("core_charge")]);
    expect(p.flaggedCount).toBe(1);
    // REFERENCES §5 worked line: $42.50 at 8.25 % → $3.51 (SSUTA §324 / RCW 82.08.054, per line, half-up).
    expect([p.totals.preTaxTotalMinor, p.totals.taxMinor, p.totals.totalMinor]).toEqual([4250, 351, 4601]);
  });

  it("once the core went back, the credit gives the charge and its tax back exactly, and nothing is flagged", () => {
    const p = price([rotor, core("core_charge"), core("core_credit")]);
    expect(p.flaggedCount).toBe(0);
    // $25.00 × 8.25 % = $2.0625 → $2.06 per line (SSUTA §324 half-up); the credit takes back −$2.06.
    expect(p.lines.map((l) => [l.source, l.netMinor, l.taxMinor])).toEqual([
      ["authorised", 4250, 351],
      ["core_charge", 2500, 206],
      ["core_credit", -2500, -206],
    ]);
    expect([p.totals.subtotalMinor, p.totals.preTaxTotalMinor, p.totals.taxMinor, p.totals.totalMinor]).toEqual([4250, 4250, 351, 4601]);
  });

  it("per invoice, the credit lowers the taxable base once: $42.50 × 8.25 % = $3.50625 → $3.51", () => {
    // SSUTA §324 / RCW 82.08.054 (REFERENCES §5): tax rounded once on the invoice's taxable base.
    const p = price([rotor, core("core_charge"), core("core_credit")], perInvoice);
    expect([p.totals.taxableBaseMinor, p.totals.taxMinor, p.totals.totalMinor]).toEqual([4250, 351, 4601]);
  });

  it("a subtotal discount is taken on the charged lines only; the credit comes off whole", () => {
    // 10 % off $42.50 + $25.00 = $6.75 (common trade practice, no published source: a discount shares out by net).
    const t = totals(
      [
        { kind: "part", qtyThousandths: 1000, unitPriceMinor: 4250, taxable: false },
        { kind: "fee", amountMinor: 2500, taxable: false },
        { kind: "fee", amountMinor: 2500, taxable: false, credit: true },
      ],
      { tax: { ratePercent: "0", method: "per_invoice" }, subtotalDiscount: { kind: "percent", percent: "10" } },
    );
    expect(t.subtotalDiscountMinor).toBe(675);
    expect(t.lines.map((l) => l.netMinor)).toEqual([4250 - 425, 2500 - 250, -2500]);
    expect(t.totalMinor).toBe(4250 + 2500 - 675 - 2500);
  });

  it("on the invoice, a core charge and its credit stay out of the discount: a returned core nets to nothing", () => {
    // 10 % off the rotor only: $4.25 (common trade practice, no published source: the core is held money, not a sale).
    const p = price([rotor, core("core_charge"), core("core_credit")], { tax: { ratePercent: "0", method: "per_invoice" }, supplies: null }, { kind: "percent", percent: "10" });
    expect(p.lines.map((l) => l.netMinor)).toEqual([4250 - 425, 2500, -2500]);
    expect(p.totals.totalMinor).toBe(4250 - 425);
  });

  it("refuses a discount on a credit line", () => {
    expect(() => totals([{ kind: "fee", amountMinor: 100, taxable: false, credit: true, discount: { kind: "amount", amountMinor: 10 } }], perLine)).toThrow(MoneyError);
  });
});
