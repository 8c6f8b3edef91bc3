import { describe, expect, it } from "vitest";
import { checklistProgress, reassemblyChecklist, type TeardownStep } from "@/lib/reassembly";
import { roundHalfUp } from "@/lib/torque";

// An invented teardown of a water pump on an invented machine.
const steps: TeardownStep[] = [
  { id: 11, seq: 1, removed: "Side panel", count: 2, size: "8 mm head", storage: "Bin A" },
  {
    id: 12,
    seq: 2,
    removed: "Pump cover bolts",
    count: 8,
    size: "M6, 8 mm head",
    notes: "Different lengths: short left, long top right",
    storage: "Bag 2",
    photoIds: ["ph_cover"],
    // REFERENCES §1 worked value: 115 lbf·in → 13.0 N·m
    torqueSpec: { value: 115, unit: "lbf_in", boltCount: 8 },
  },
  { id: 13, seq: 3, removed: "Impeller", notes: "Stamped side faces out", storage: "Bag 3" },
];

describe("reassemblyChecklist", () => {
  it("lists steps in reverse removal order, whatever order they arrive in", () => {
    // common trade practice, no published source: last off, first on
    const shuffled = [steps[2]!, steps[0]!, steps[1]!];
    const list = reassemblyChecklist(shuffled);
    expect(list.map((item) => item.removed)).toEqual(["Impeller", "Pump cover bolts", "Side panel"]);
    expect(list.map((item) => item.position)).toEqual([1, 2, 3]);
    expect(list.map((item) => item.id)).toEqual([13, 12, 11]);
  });

  it("carries each step's notes, storage and photos", () => {
    const [impeller, cover, panel] = reassemblyChecklist(steps);
    expect(impeller).toMatchObject({ notes: "Stamped side faces out", storage: "Bag 3", photoIds: [], count: null, torque: null });
    expect(cover).toMatchObject({ count: 8, size: "M6, 8 mm head", storage: "Bag 2", photoIds: ["ph_cover"] });
    expect(panel).toMatchObject({ storage: "Bin A", notes: null, torque: null });
  });

  it("attaches the torque, pattern and passes to the step they were entered for", () => {
    const list = reassemblyChecklist(steps);
    expect(list.filter((item) => item.torque !== null).map((item) => item.id)).toEqual([12]);
    const torque = list.find((item) => item.id === 12)!.torque!;
    expect(torque.value).toBe(115);
    expect(torque.unit).toBe("lbf_in");
    // NIST SP 811 App. B.9; REFERENCES §1: 115 lbf·in → 13.0 N·m
    expect(roundHalfUp(torque.valueIn.nm, 1)).toBe(13.0);
    // ASME PCC-1 legacy cross pattern, REFERENCES §2: 8 bolts
    expect(torque.tighteningOrder).toEqual([1, 5, 3, 7, 2, 6, 4, 8]);
    // Common supplier practice, REFERENCES §3: 30 % → 60 % → 100 %, then a check pass
    expect(torque.passes.map((p) => p.percent)).toEqual([30, 60, 100, 100]);
    // Arithmetic: 30 % of 115 lbf·in = 34.5 lbf·in
    expect(torque.passes[0]!.value).toBeCloseTo(34.5, 12);
  });

  it("uses the step's own pass percents, and no pattern without a supported bolt count", () => {
    const list = reassemblyChecklist([
      // US Army TB 9-2320-279-13&P-2, REFERENCES §3: 70 % then final
      { id: "a", seq: 1, removed: "Caliper bolts", torqueSpec: { value: 40, unit: "nm", boltCount: 2, passPercents: [70, 100] } },
      { id: "b", seq: 2, removed: "Drain plug", torqueSpec: { value: 20, unit: "nm" } },
    ]);
    const [plug, caliper] = list;
    expect(plug!.torque).toMatchObject({ boltCount: null, tighteningOrder: null });
    expect(caliper!.torque).toMatchObject({ boltCount: 2, tighteningOrder: null });
    expect(caliper!.torque!.passes.map((p) => p.value)).toEqual([28, 40, 40]);
  });

  it("reverses ties too, so equal seq steps come back in the opposite order they were logged", () => {
    const list = reassemblyChecklist([
      { id: 1, seq: 5, removed: "Left mirror" },
      { id: 2, seq: 5, removed: "Right mirror" },
      { id: 3, seq: 4, removed: "Fairing" },
    ]);
    expect(list.map((item) => item.removed)).toEqual(["Right mirror", "Left mirror", "Fairing"]);
  });

  it("refuses duplicate ids, bad order numbers, bad bolt counts and bad torque", () => {
    expect(() => reassemblyChecklist([steps[0]!, steps[0]!])).toThrow(/appears twice/);
    expect(() => reassemblyChecklist([{ id: 1, seq: Number.NaN, removed: "Seat" }])).toThrow(/valid removal order/);
    expect(() =>
      reassemblyChecklist([{ id: 1, seq: 1, removed: "Head bolts", torqueSpec: { value: 30, unit: "nm", boltCount: 4.5 } }]),
    ).toThrow(/bolt count must be a whole number/);
    expect(() =>
      reassemblyChecklist([{ id: 1, seq: 1, removed: "Head bolts", torqueSpec: { value: -30, unit: "nm" } }]),
    ).toThrow(/negative/);
  });

  it("returns an empty checklist for an empty log", () => {
    expect(reassemblyChecklist([])).toEqual([]);
  });
});

describe("checklistProgress", () => {
  it("counts ticked items and floors the percentage", () => {
    const items = reassemblyChecklist(steps);
    // Arithmetic: 1 of 3 = 33.3 % → 33; 2 of 3 = 66.7 % → 66 (floor, never rounds up to done)
    expect(checklistProgress(items, [13])).toEqual({ done: 1, total: 3, percent: 33 });
    expect(checklistProgress(items, new Set([13, 12]))).toEqual({ done: 2, total: 3, percent: 66 });
    expect(checklistProgress(items, [11, 12, 13])).toEqual({ done: 3, total: 3, percent: 100 });
  });

  it("ignores stale ticks and matches ids given as text", () => {
    const items = reassemblyChecklist(steps);
    expect(checklistProgress(items, [99, "12"])).toEqual({ done: 1, total: 3, percent: 33 });
  });

  it("is 0 % for an empty checklist", () => {
    expect(checklistProgress([], [1])).toEqual({ done: 0, total: 0, percent: 0 });
  });
});
