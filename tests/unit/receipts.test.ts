import { describe, expect, it } from "vitest";
import { formatReceiptNumber, holdsServiceId, ownerReference, receiptNumbers } from "@/lib/receipts";

// The numbering is the product's own convention (job number + place in the job's money), no published source.
describe("receipt numbers", () => {
  it("joins the job number and the payment's place", () => {
    expect(formatReceiptNumber(5, 1)).toBe("J-0005-R1");
    expect(formatReceiptNumber(12345, 12)).toBe("J-12345-R12");
    expect(() => formatReceiptNumber(5, 0)).toThrow(RangeError);
    expect(() => formatReceiptNumber(5, 1.5)).toThrow(RangeError);
  });

  it("numbers a job's payments in the order they were recorded, whatever order they come in", () => {
    // listJobPayments orders by received_at: a back-dated cash payment may come first but keeps its number.
    const numbers = receiptNumbers(7, [{ id: 40 }, { id: 12 }, { id: 31 }]);
    expect([...numbers.entries()]).toEqual([
      [12, "J-0007-R1"],
      [31, "J-0007-R2"],
      [40, "J-0007-R3"],
    ]);
    expect(receiptNumbers(7, []).size).toBe(0);
  });

  it("keeps earlier numbers when a later payment is added", () => {
    const before = receiptNumbers(3, [{ id: 8 }, { id: 9 }]);
    const after = receiptNumbers(3, [{ id: 9 }, { id: 8 }, { id: 15 }]);
    expect(after.get(8)).toBe(before.get(8));
    expect(after.get(9)).toBe(before.get(9));
    expect(after.get(15)).toBe("J-0003-R3");
  });
});

describe("references an owner may read", () => {
  it("recognises the payments service's ids", () => {
    for (const id of ["pi_3PqZt2abcDEF1234", "ch_3PqZt2abcDEF1234", "re_3PqZt2abcDEF1234", "cs_test_a1B2c3D4e5F6g7H8", "cs_live_a1B2c3D4e5F6g7H8", "Refund of pi_3PqZt2abcDEF1234"]) {
      expect(holdsServiceId(id), id).toBe(true);
    }
    for (const ref of ["AUTH 55120", "Cheque 1042", "Refund: Goodwill", "pi_short", "api_key left on the bench"]) {
      expect(holdsServiceId(ref), ref).toBe(false);
    }
  });

  it("drops the service's ids and keeps what the desk typed", () => {
    expect(ownerReference({ reference: "pi_3PqZt2abcDEF1234", providerPaymentId: "pi_3PqZt2abcDEF1234" })).toBeNull();
    // Equal to the provider's id even when it doesn't look like one (another id format).
    expect(ownerReference({ reference: "pay-77", providerPaymentId: "pay-77" })).toBeNull();
    expect(ownerReference({ reference: "re_9XyZ8wVu7tSr6", providerRefundId: null })).toBeNull();
    expect(ownerReference({ reference: "Cheque 1042" })).toBe("Cheque 1042");
    expect(ownerReference({ reference: "  Refund: Goodwill " })).toBe("Refund: Goodwill");
    expect(ownerReference({ reference: null })).toBeNull();
    expect(ownerReference({ reference: "   " })).toBeNull();
  });
});
