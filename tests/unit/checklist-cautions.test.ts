import { describe, expect, it } from "vitest";
import { checklistFromSteps } from "@/lib/bench";
import { checklistCautions } from "@/lib/checklist-cautions";
import { CAUTIONS } from "@/lib/cautions";

// Issue 18 §7: the reassembly checklist carries the torque, brake and fuel cautions
// (lib/cautions.ts) where they apply. The keyword rule is ours: common trade words, no published source.

const step = (id: number, removed: string, notes: string | null = null, torque: { value: number; unit: "nm"; boltCount: number | null } | null = null) => ({
  id,
  seq: id,
  removed,
  count: null,
  size: null,
  notes,
  storage: null,
  photoId: null,
  torque,
});

describe("cautions on the reassembly checklist", () => {
  it("gives a torqued item the torque caution, a brake item the brake caution, a fuel item the fuel caution", () => {
    const items = checklistFromSteps(
      [
        step(1, "Front brake caliper", null, { value: 25, unit: "nm", boltCount: 2 }),
        step(2, "Fuel tank", "Petcock off, line plugged"),
        step(3, "Seat"),
        step(4, "Carb", null, { value: 6, unit: "nm", boltCount: 4 }),
        step(5, "Rear master cylinder"),
      ],
      [30, 60, 100],
    );
    // Checklist order is the reverse of removal (lib/reassembly.ts).
    expect(items.map((i) => [i.removed, checklistCautions(i)])).toEqual([
      ["Rear master cylinder", ["brakes"]],
      ["Carb", ["torque", "fuel"]],
      ["Seat", []],
      ["Fuel tank", ["fuel"]],
      ["Front brake caliper", ["torque", "brakes"]],
    ]);
  });

  it("reads the notes too, whatever the case, and keys only ones the caution list has", () => {
    expect(checklistCautions({ removed: "Left side cover", notes: "BRAKE LINE clip behind it", torque: null })).toEqual(["brakes"]);
    expect(checklistCautions({ removed: "Intake boot", notes: "Injector o-ring nicked", torque: null })).toEqual(["fuel"]);
    for (const k of checklistCautions({ removed: "Brake and fuel lines", notes: null, torque: { value: 1 } })) expect(CAUTIONS[k].text.length).toBeGreaterThan(20);
  });

  it("doesn't fire on words that only contain the keyword", () => {
    // "breakdown" is not a brake, "carbon" not a carburettor.
    expect(checklistCautions({ removed: "Carbon heel guard", notes: "Breakdown cover sticker kept", torque: null })).toEqual([]);
  });
});
