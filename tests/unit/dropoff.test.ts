import { describe, expect, it } from "vitest";
import { canonicalJson } from "@/lib/approvals";
import { buildDropoffSnapshot, diagnosisLine, dropoffCanonical } from "@/lib/dropoff";
import { totalAuthorisedPreTax } from "@/lib/invoices";
import { approvalCeiling, toleranceFor } from "@/lib/money";

const base = { authorisation: "A".repeat(16), job: "B".repeat(16), shop: "Ridgeback Small Engines", machine: "2019 Testmark TR-450", owner: "Rowan Pike", currency: "usd", terms: null };
const FLORIDA = { kind: "greater_of" as const, fixedMinor: 1000, percent: "10", capMinor: 5000 };
const MARYLAND = { kind: "greater_of" as const, fixedMinor: 0, percent: "10", capMinor: null };

describe("drop-off authorisation snapshot", () => {
  it("words the agreement from the amounts, before tax, and canonicalises stably", () => {
    const s = buildDropoffSnapshot({ ...base, diagnosis: { kind: "labour", description: "Inspection and diagnosis", hoursTenths: 15, rateMinor: 9000, taxable: false }, authorisedUpToMinor: 30_000 });
    // 1.5 h × $90.00 = $135.00: common trade practice, no published source.
    expect(s.diagnosis.netMinor).toBe(13_500);
    expect(s.currency).toBe("USD");
    expect(s.wording).toContain("1.5 h at $90.00 an hour ($135.00)");
    expect(s.wording).toContain("up to $300.00 in total before tax");
    expect(dropoffCanonical(s)).toBe(canonicalJson(JSON.parse(JSON.stringify(s))));
    expect(diagnosisLine(s)).toMatchObject({ kind: "labour", hoursTenths: 15, rateMinor: 9000, amountMinor: null });
  });

  it("refuses a limit below the diagnosis charge, naming the field; a free diagnosis makes no invoice line", () => {
    expect(() => buildDropoffSnapshot({ ...base, diagnosis: { kind: "fee", description: "Inspection", amountMinor: 9500, taxable: false }, authorisedUpToMinor: 5000 })).toThrow(
      expect.objectContaining({ fields: { authorisedUpTo: [expect.stringContaining("$95.00")] } }),
    );
    const free = buildDropoffSnapshot({ ...base, diagnosis: { kind: "fee", description: "Inspection", amountMinor: 0, taxable: false }, authorisedUpToMinor: 5000 });
    expect(free.wording).toContain("at no charge");
    expect(diagnosisLine(free)).toBeNull();
  });
});

describe("what the owner authorised, for the over-estimate check", () => {
  it("adds the drop-off amount to the approved requests (REFERENCES §6)", () => {
    // Maryland Com. Law §14-1002(b), REFERENCES §6: E = $400 → $440 ceiling; here $300 at drop-off + $100 approved.
    expect(approvalCeiling(totalAuthorisedPreTax(30_000, [10_000]), MARYLAND)).toBe(44_000);
    // Florida §559.909, REFERENCES §6: E = $300 → $30 tolerance; E = $800 → $50 (the cap).
    expect(toleranceFor(totalAuthorisedPreTax(20_000, [6_000, 4_000]), FLORIDA)).toBe(3000);
    expect(toleranceFor(totalAuthorisedPreTax(50_000, [30_000]), FLORIDA)).toBe(5000);
    // No drop-off authorisation: only the requests count. E = $80 → $10 (Florida, REFERENCES §6).
    expect(toleranceFor(totalAuthorisedPreTax(null, [8_000]), FLORIDA)).toBe(1000);
    expect(() => totalAuthorisedPreTax(-1, [])).toThrow();
  });
});
