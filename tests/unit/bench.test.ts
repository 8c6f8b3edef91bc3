import { describe, expect, it } from "vitest";
import { checklistFromSteps, torqueProof, torqueViews } from "@/lib/bench";
import { partSchema, passPercentsText, specSchema, torqueRecordSchema } from "@/lib/schemas/bench";

const JOB = "AAAAAAAAAAAAAAAA";

describe("torque display", () => {
  it("headlines the unit entered, the shop's unit beside it, every other unit one tap away", () => {
    const views = torqueViews(80, "lbf_ft", "nm");
    expect(views.primary).toBe("80.0 lbf·ft");
    // NIST SP 811 App. B.9 via REFERENCES.md §1: 80 lbf·ft → 108.5 N·m.
    expect(views.shop).toBe("108.5 N·m");
    // 80 lbf·ft = 960 lbf·in exactly (12 in to the ft); kgf·m by the exact 9.806 65 N·m of
    // REFERENCES.md §1: 108.465 / 9.806 65 = 11.06.
    expect(views.others).toEqual(["108.5 N·m", "960.0 lbf·in", "11.06 kgf·m"]);
    expect(torqueViews(80, "nm", "nm").shop).toBeNull();
  });

  it("words the proof the owner reads", () => {
    // Our own wording; passes are the common supplier practice of REFERENCES.md §3.
    const base = { specValue: 10, unit: "nm" as const, displayUnit: "nm" as const, passPercents: [30, 60, 100] };
    // Empty applied is "not recorded", and passes and the check pass are never assumed.
    expect(torqueProof({ ...base, appliedValue: null, pattern: "cross" })).toBe(
      "spec 10.0 N·m; applied torque not recorded; 3 passes (30 → 60 → 100 %) planned, not recorded as done; no check pass recorded; cross pattern",
    );
    // 9 against 10 is 10 % under: outside the ±4 % default of a type II click wrench (ISO 6789-1, from memory, unverified).
    expect(torqueProof({ ...base, appliedValue: 9, pattern: null, passesDone: true, checkPass: true })).toBe(
      "UNDER SPEC: torqued to 9.0 N·m, 10.0 % under the 10.0 N·m spec (tolerance ±4 %); 3 passes (30 → 60 → 100 %) done; a check pass at final in the tightening direction, no fastener turned",
    );
    expect(torqueProof({ ...base, appliedValue: 10.3, pattern: null, tolerancePct: 4 })).toMatch(/^torqued to 10\.3 N·m, within ±4 % of the 10\.0 N·m spec;/);
  });
});

describe("checklist from stored steps", () => {
  it("reverses the removal order and keeps each torque on its own step", () => {
    const steps = [
      { id: 7, seq: 1, removed: "Seat", count: null, size: null, notes: null, storage: "Bin A", photoId: null, torque: null },
      { id: 8, seq: 2, removed: "Cover", count: 8, size: "M6", notes: null, storage: null, photoId: "p".repeat(22), torque: { value: 115, unit: "lbf_in" as const, boltCount: 8 } },
    ];
    const [cover, seat] = checklistFromSteps(steps, [70, 100]);
    expect(seat).toMatchObject({ id: 7, position: 2, torque: null });
    expect(cover).toMatchObject({ id: 8, position: 1, photoIds: ["p".repeat(22)] });
    // US Army TB 9-2320-279-13&P-2 via REFERENCES.md §3: 70 % then final, plus our check pass.
    expect(cover!.torque!.passes.map((p) => p.percent)).toEqual([70, 100, 100]);
    // ASME PCC-1 legacy cross pattern for 8 bolts (REFERENCES.md §2).
    expect(cover!.torque!.tighteningOrder).toEqual([1, 5, 3, 7, 2, 6, 4, 8]);
  });
});

describe("bench form schemas", () => {
  it("reads passes written the way people write them", () => {
    expect(passPercentsText.parse("30, 60, 100")).toEqual([30, 60, 100]);
    expect(passPercentsText.parse("30 → 60 → 100")).toEqual([30, 60, 100]);
    expect(passPercentsText.safeParse("thirty").success).toBe(false);
    // Each pass through the one number reader: a decimal takes a point (the comma separates passes).
    expect(passPercentsText.parse("33.5, 66.5, 100")).toEqual([33.5, 66.5, 100]);
    const tooFine = passPercentsText.safeParse("33.333, 100");
    expect(tooFine.success).toBe(false);
    expect(tooFine.error?.issues[0]?.message).toMatch(/^Pass 1 takes at most 2 decimal places\./);
  });

  it("turns blanks into nothing and typos into a message on their own field", () => {
    // Numbers stay text here; the server reads them in the shop's style (tests/unit/number-input.test.ts).
    const ok = torqueRecordSchema.parse({ job: JOB, fastener: " Cover bolts ", specValue: " 1,200 ", unit: "nm", appliedValue: "", boltCount: "", tool: "", note: "" });
    expect(ok).toMatchObject({ fastener: "Cover bolts", specValue: "1,200", appliedValue: null, boltCount: null, passes: null, share: false, passesDone: false, checkPass: false, wrenchClass: null });
    const bad = torqueRecordSchema.safeParse({ job: JOB, fastener: "", specValue: "ten", unit: "ft", boltCount: "2.5" });
    expect(bad.success).toBe(false);
    const fields = new Set(bad.error!.issues.map((i) => i.path[0]));
    expect(fields).toEqual(new Set(["fastener", "specValue", "unit", "boltCount"]));
  });

  it("asks each kind of spec for what it needs", () => {
    const spec = { shop: "x", make: "Corvane", model: "Tarn 450", label: "Cover", source: "" };
    expect(specSchema.safeParse({ ...spec, kind: "torque", value: "10", unit: "nm" }).success).toBe(true);
    expect(specSchema.safeParse({ ...spec, kind: "torque", value: "10", unit: "mm" }).error?.issues[0]?.path).toEqual(["unit"]);
    expect(specSchema.safeParse({ ...spec, kind: "limit" }).error?.issues[0]?.path).toEqual(["max"]);
    // min above max is the server's check once the numbers are read (lib/server/bench-parts.ts addSpec).
  });

  it("checks part dates and defaults a part to needed", () => {
    expect(partSchema.parse({ job: JOB, description: "Cam chain", forWork: "booked" })).toMatchObject({ status: "needed", qty: "1", expectedOn: null, cost: null, forWork: { findingId: null, noOkNeeded: true } });
    expect(partSchema.safeParse({ job: JOB, description: "Cam chain", forWork: "booked", expectedOn: "next week" }).success).toBe(false);
  });

  it("asks what work a part is for: the booked work, or a finding that must be approved first", () => {
    expect(partSchema.parse({ job: JOB, description: "Cam chain", forWork: "finding:12" }).forWork).toEqual({ findingId: 12, noOkNeeded: false });
    const missing = partSchema.safeParse({ job: JOB, description: "Cam chain" });
    expect(missing.success).toBe(false);
    expect(missing.error?.issues[0]?.message).toBe("Say what work the part is for.");
    expect(partSchema.safeParse({ job: JOB, description: "Cam chain", forWork: "finding:abc" }).success).toBe(false);
  });
});
