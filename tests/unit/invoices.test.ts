import { describe, expect, it } from "vitest";
import type { DraftLine } from "@/lib/approvals";
import { type InvoiceLine, balanceOf, formatInvoiceNumber, priceInvoice, statusAfter } from "@/lib/invoices";
import { STRICT_TOLERANCE, type ToleranceSetting } from "@/lib/money";

const blank: DraftLine = { kind: "part", description: "", partNumber: null, qtyThousandths: null, unitPriceMinor: null, hoursTenths: null, rateMinor: null, amountMinor: null, taxable: true };
const part = (description: string, unitPriceMinor: number, source: InvoiceLine["source"] = "authorised"): InvoiceLine => ({
  ...blank,
  description,
  qtyThousandths: 1000,
  unitPriceMinor,
  source,
  requestPublicId: source === "authorised" ? "REQUESTxxxxxxxxx" : null,
  requestLineNo: source === "authorised" ? 1 : null,
});
const fee = (description: string, amountMinor: number, source: InvoiceLine["source"] = "added"): InvoiceLine => ({ ...blank, kind: "fee", description, amountMinor, taxable: false, source, requestPublicId: null, requestLineNo: null });
const noTax = { tax: { ratePercent: "0", method: "per_invoice" as const }, supplies: null };
// Florida §559.909 as REFERENCES §6 states it: the greater of $10 or 10 %, capped at $50.
const FLORIDA: ToleranceSetting = { kind: "greater_of", fixedMinor: 1000, percent: "10", capMinor: 5000 };

describe("invoice totals", () => {
  // REFERENCES §5 worked example: 8.25 % on $19.99, $42.50 and $6.99.
  const lines = [part("Front brake pads", 1999), part("Front rotor", 4250), part("Brake fluid", 699)];
  const authorisedPreTaxMinor = 6948;

  it("taxes per line: 1.65 + 3.51 + 0.58 = $5.74", () => {
    // SSUTA §324 / RCW 82.08.054 (REFERENCES §5): per-line rounding gives $5.74.
    const p = priceInvoice({ lines, settings: { tax: { ratePercent: "8.25", method: "per_line" }, supplies: null }, discount: null, authorisedPreTaxMinor, tolerance: STRICT_TOLERANCE });
    expect(p.lines.map((l) => l.taxMinor)).toEqual([165, 351, 58]);
    expect(p.totals.taxMinor).toBe(574);
    expect(p.totals.totalMinor).toBe(6948 + 574);
    expect(p.flaggedCount).toBe(0);
  });

  it("taxes per invoice: 69.48 × 8.25 % = 5.7321 → $5.73", () => {
    // SSUTA §324 / RCW 82.08.054 (REFERENCES §5): rounding once on the invoice gives $5.73.
    const p = priceInvoice({ lines, settings: { tax: { ratePercent: "8.25", method: "per_invoice" }, supplies: null }, discount: null, authorisedPreTaxMinor, tolerance: STRICT_TOLERANCE });
    expect(p.totals.taxMinor).toBe(573);
    expect(p.totals.totalMinor).toBe(7521);
  });

  it("rounds $0.06 at 7.5 % (0.0045) to $0.00, once from the exact value", () => {
    // REFERENCES §5 edge case (SSUTA §324: round up only when the third decimal is greater than 4).
    const p = priceInvoice({ lines: [part("Washer", 6)], settings: { tax: { ratePercent: "7.5", method: "per_invoice" }, supplies: null }, discount: null, authorisedPreTaxMinor: 6, tolerance: STRICT_TOLERANCE });
    expect(p.totals.taxMinor).toBe(0);
    expect(p.totals.totalMinor).toBe(6);
  });

  it("keeps added lines within the tolerance and flags the one that goes past it", () => {
    // Florida §559.909 (REFERENCES §6): on $300 authorised the tolerance is $30, so up to $330 before tax.
    const added = [fee("Extra clamps", 2000), fee("Hose", 1000), fee("Shop rag", 1)];
    const p = priceInvoice({ lines: [part("Authorised work", 30000), ...added], settings: noTax, discount: null, authorisedPreTaxMinor: 30000, tolerance: FLORIDA });
    expect(p.toleranceMinor).toBe(3000);
    expect(p.ceilingMinor).toBe(33000);
    expect(p.lines.map((l) => l.flagged)).toEqual([false, false, false, true]);
    expect(p.lines[3]).toMatchObject({ grossMinor: 1, netMinor: 0 });
    // The flagged line is not charged.
    expect(p.totals.totalMinor).toBe(33000);
    expect(p.flaggedCount).toBe(1);
  });

  it("with the strict default, any added charge needs a new approval; a discount can make room", () => {
    // common trade practice, no published source: a shop may discount an invoice below what was authorised.
    const strict = priceInvoice({ lines: [part("Authorised work", 10000), fee("Disposal", 500)], settings: noTax, discount: null, authorisedPreTaxMinor: 10000, tolerance: STRICT_TOLERANCE });
    expect(strict.lines.map((l) => l.flagged)).toEqual([false, true]);
    const discounted = priceInvoice({ lines: [part("Authorised work", 10000), fee("Disposal", 500)], settings: noTax, discount: { kind: "amount", amountMinor: 500 }, authorisedPreTaxMinor: 10000, tolerance: STRICT_TOLERANCE });
    expect(discounted.flaggedCount).toBe(0);
    expect(discounted.totals.totalMinor).toBe(10000);
  });

  it("refuses an added line without a price", () => {
    const unpriced: InvoiceLine = { ...fee("Mystery", 0), amountMinor: null };
    expect(() => priceInvoice({ lines: [part("Work", 100), unpriced], settings: noTax, discount: null, authorisedPreTaxMinor: 100, tolerance: STRICT_TOLERANCE })).toThrow(/no amount/);
  });
});

describe("balance after deposits, part payments and refunds", () => {
  // Arithmetic only (common trade practice, no published source); the total is the $75.22 invoice above.
  const total = 7522;

  it("counts a parts deposit and part payments towards the total", () => {
    const afterDeposit = balanceOf(total, [{ kind: "deposit", amountMinor: 2000 }]);
    expect(afterDeposit).toMatchObject({ paidMinor: 2000, depositsMinor: 2000, balanceMinor: 5522, state: "part_paid" });
    const afterPart = balanceOf(total, [{ kind: "deposit", amountMinor: 2000 }, { kind: "payment", amountMinor: 3000 }]);
    expect(afterPart).toMatchObject({ paidMinor: 5000, balanceMinor: 2522, state: "part_paid" });
    const settled = balanceOf(total, [{ kind: "deposit", amountMinor: 2000 }, { kind: "payment", amountMinor: 3000 }, { kind: "payment", amountMinor: 2522 }]);
    expect(settled).toMatchObject({ paidMinor: 7522, balanceMinor: 0, state: "paid" });
  });

  it("a refund reduces what was paid; paying too much shows as overpaid", () => {
    const refunded = balanceOf(total, [{ kind: "payment", amountMinor: 7522 }, { kind: "refund", amountMinor: 1000 }]);
    expect(refunded).toMatchObject({ paidMinor: 6522, refundsMinor: 1000, balanceMinor: 1000, state: "part_paid" });
    expect(balanceOf(total, [{ kind: "payment", amountMinor: 8000 }])).toMatchObject({ balanceMinor: -478, state: "overpaid" });
    expect(balanceOf(total, [])).toMatchObject({ paidMinor: 0, balanceMinor: total, state: "nothing_paid" });
  });

  it("refuses amounts that aren't positive whole minor units", () => {
    expect(() => balanceOf(total, [{ kind: "payment", amountMinor: 0 }])).toThrow(/positive whole number/);
    expect(() => balanceOf(total, [{ kind: "payment", amountMinor: 12.5 }])).toThrow(/positive whole number/);
  });

  it("an issued invoice is paid when nothing is left, and back to due after a refund; drafts stay drafts", () => {
    expect(statusAfter("issued", 7522, 0)).toBe("paid");
    expect(statusAfter("paid", 7522, 1000)).toBe("issued");
    expect(statusAfter("draft", 7522, 0)).toBe("draft");
    expect(statusAfter("void", 7522, 0)).toBe("void");
  });

  it("numbers invoices INV-0001 onwards", () => {
    expect(formatInvoiceNumber(7)).toBe("INV-0007");
    expect(formatInvoiceNumber(12345)).toBe("INV-12345");
  });
});
