import { describe, expect, it } from "vitest";
import { checklistFromSteps, torqueProof, torqueViews } from "@/lib/bench";
import { partSchema, passPercentsText, specSchema, torqueRecordSchema } from "@/lib/schemas/bench";

const JOB = "AAAAAAAAAAAAAAAA";

describe("torque display", () => {
  it("shows the shop's unit first and every other unit one tap away", () => {
    // NIST SP 811 App. B.9 via REFERENCES.md §1: 80 lbf·ft → 108.5 N·m.
    const views = torqueViews(80, "lbf_ft", "nm");
    expect(views.primary).toBe("108.5 N·m");
    // The value as entered is among the others; 80 lbf·ft = 960 lbf·in exactly (12 in to the ft);
    // kgf·m by the exact 9.806 65 N·m of REFERENCES.md §1: 108.465 / 9.806 65 = 11.06.
    expect(views.others).toEqual(["80.0 lbf·ft", "960.0 lbf·in", "11.06 kgf·m"]);
  });

  it("words the proof the owner reads", () => {
    // Our own wording; passes are the common supplier practice of REFERENCES.md §3.
    const base = { specValue: 10, unit: "nm" as const, displayUnit: "nm" as const, passPercents: [30, 60, 100] };
    expect(torqueProof({ ...base, appliedValue: null, pattern: "cross" })).toBe("torqued to spec, 3 passes (30 → 60 → 100 %) and a check pass, cross pattern");
    expect(torqueProof({ ...base, appliedValue: 9, pattern: null })).toBe("torqued to 9.0 N·m (spec 10.0 N·m), 3 passes (30 → 60 → 100 %) and a check pass");
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
  });

  it("turns blanks into nothing and typos into a message on their own field", () => {
    const ok = torqueRecordSchema.parse({ job: JOB, fastener: " Cover bolts ", specValue: "12,5", unit: "nm", appliedValue: "", boltCount: "", tool: "", note: "" });
    expect(ok).toMatchObject({ fastener: "Cover bolts", specValue: 12.5, appliedValue: null, boltCount: null, passes: null, share: false });
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
    expect(specSchema.safeParse({ ...spec, kind: "limit", min: "5", max: "4" }).error?.issues[0]?.path).toEqual(["min"]);
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
