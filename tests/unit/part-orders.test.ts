import { describe, expect, it } from "vitest";
import { isLate, partWaitLines } from "@/lib/part-orders";

describe("parts on order", () => {
  it("is late only once the expected day has passed", () => {
    // The expected day itself still counts as on time: common trade practice, no published source.
    expect(isLate("2026-12-04", "2026-12-05")).toBe(true);
    expect(isLate("2026-12-05", "2026-12-05")).toBe(false);
    expect(isLate("2027-01-02", "2026-12-31")).toBe(false);
    expect(isLate(null, "2026-12-05")).toBe(false);
  });

  it("tells the owner what is on the way and when", () => {
    expect(
      partWaitLines([
        { description: "Fuel pump", status: "back_ordered", expectedOn: "2026-12-20" },
        { description: "Gasket set", status: "ordered", expectedOn: null },
      ]),
    ).toEqual(["Part on back-order: Fuel pump, expected 2026-12-20.", "Part on order: Gasket set, no date from the supplier yet."]);
  });
});
