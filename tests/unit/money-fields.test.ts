import { describe, expect, it } from "vitest";
import { buildOverview } from "@/lib/approvals-overview";
import { DEFAULT_MONEY_SETTINGS } from "@/lib/approvals";
import { isMoneyKey, stripMoney } from "@/lib/money-fields";

// Which response fields count as money is our own rule (lib/money-fields.ts; DESIGN.md §4 keeps
// amounts as integers in minor units named …Minor): no published source.

describe("isMoneyKey", () => {
  it("counts amounts in minor units and the typed price fields, nothing else", () => {
    for (const key of ["totalMinor", "netMinor", "unitPriceMinor", "authorisedPreTaxMinor", "capMinor", "unitPrice", "rate", "amount", "warnings"]) expect(isMoneyKey(key), key).toBe(true);
    for (const key of ["title", "qtyThousandths", "hoursTenths", "approved", "declined", "count", "currency", "minorVersion", "ratePercent", "Amount", "amounts", "taxable"]) expect(isMoneyKey(key), key).toBe(false);
  });
});

describe("stripMoney", () => {
  it("drops money keys at any depth, in arrays too, and keeps everything else as it was", () => {
    const sentAt = new Date("2026-03-01T10:00:00Z");
    const input = {
      currency: "USD",
      totalMinor: 7522,
      warnings: [{ findingId: 1, message: "adds $10.00" }],
      findings: [{ id: 1, title: "Front brakes", lines: [{ description: "Pads", unitPrice: "19.99", unitPriceMinor: 1999, qtyThousandths: 1000 }], sentAt }],
      nested: { deeper: { rate: "100.00", hoursTenths: 15, amount: "5.00", note: null } },
    };
    const out = stripMoney(input);
    expect(out).toEqual({
      currency: "USD",
      findings: [{ id: 1, title: "Front brakes", lines: [{ description: "Pads", qtyThousandths: 1000 }], sentAt }],
      nested: { deeper: { hoursTenths: 15, note: null } },
    });
    // Dates stay dates; the input is not changed.
    expect(out.findings[0]!.sentAt).toBeInstanceOf(Date);
    expect(input.totalMinor).toBe(7522);
    expect(input.findings[0]!.lines[0]!.unitPrice).toBe("19.99");
  });

  it("leaves plain values and empty containers alone", () => {
    expect(stripMoney(null)).toBeNull();
    expect(stripMoney("19.99")).toBe("19.99");
    expect(stripMoney(42)).toBe(42);
    expect(stripMoney([])).toEqual([]);
    expect(stripMoney({})).toEqual({});
  });

  it("takes every amount out of an approvals overview, keeping what was approved and declined", () => {
    const overview = buildOverview({
      currency: "USD",
      settings: DEFAULT_MONEY_SETTINGS,
      findings: [
        {
          id: 7,
          title: "Front brakes",
          safety: "brakes",
          version: 2,
          createdBy: "Tech",
          updatedAt: "2026-03-01 09:00:00",
          lines: [{ kind: "part", description: "Pads", partNumber: null, qtyThousandths: 1000, unitPriceMinor: 1999, hoursTenths: null, rateMinor: null, amountMinor: null, taxable: false }],
        },
      ],
      requests: [
        {
          publicId: "REQUESTxxxxxxxxx",
          findingId: 7,
          version: 1,
          status: "answered",
          sentAt: "2026-03-01 10:00:00",
          sentTo: "owner@mail.test",
          sentBy: "Desk",
          openedAt: null,
          answeredAt: "2026-03-01 11:00:00",
          withdrawnAt: null,
          replacedBy: null,
          estimatePreTaxMinor: 1999,
          estimateTotalMinor: 1999,
        },
      ],
      decisions: new Map([
        [
          "REQUESTxxxxxxxxx",
          {
            method: "online" as const,
            personName: "Ada Marsh",
            decidedAt: "2026-03-01 11:00:00",
            approved: 1,
            declined: 0,
            wantsPartsBack: false,
            authorisedPreTaxMinor: 1999,
            authorisedTotalMinor: 1999,
            lines: [{ no: 1, answer: "approved" as const, kind: "part" as const, description: "Pads", netMinor: 1999 }],
          },
        ],
      ]),
    });
    const seen = stripMoney(overview);
    expect(JSON.stringify(seen)).not.toMatch(/1999|Minor|warnings/);
    expect(seen.authorised.lines).toEqual([{ requestPublicId: "REQUESTxxxxxxxxx", lineNo: 1, kind: "part", description: "Pads" }]);
    expect(seen.findings[0]!.requests[0]!.decision).toMatchObject({ approved: 1, declined: 0, personName: "Ada Marsh" });
    expect(seen.awaiting).toEqual({ count: 0 });
  });
});
