import { describe, expect, it } from "vitest";
import { clipEvidenceLabel, momentAt } from "@/lib/clips";

// Issue 18 §6: a finding's clip evidence at a marked moment carries the technician's caption.

const moments = [
  { atMs: 12_000, label: "Chain slap on the swingarm" },
  { atMs: 42_300, label: "Slider worn through" },
];

describe("clip moments as evidence", () => {
  it("finds the marked moment exactly, or within the same whole second a time was typed in", () => {
    expect(momentAt(moments, 42_300)).toEqual(moments[1]);
    expect(momentAt(moments, 42_000)).toEqual(moments[1]);
    expect(momentAt(moments, 43_000)).toBeNull();
    expect(momentAt(moments, null)).toBeNull();
  });

  it("labels the evidence with the clip's caption and the moment's", () => {
    expect(clipEvidenceLabel("Swingarm walkaround", moments[1]!)).toBe("Swingarm walkaround — Slider worn through");
    expect(clipEvidenceLabel(null, moments[0]!)).toBe("Chain slap on the swingarm");
    expect(clipEvidenceLabel("Swingarm walkaround", null)).toBe("Swingarm walkaround");
    expect(clipEvidenceLabel(null, null)).toBeNull();
  });
});
