import { describe, expect, it } from "vitest";
import { FINDING_CAUTIONS, SAFETY_CATEGORIES, SAFETY_LABEL } from "@/lib/approvals";
import { findingInputSchema } from "@/lib/schemas/approvals";

// Issue 18 §7: the safety categories a finding can carry, with the caution the owner reads.
// The caution texts are our own words (common trade practice, no published source); <Caution>
// and the e-mail add the deferral to the maker's manual.

describe("safety categories of findings", () => {
  it("cover brakes, steering, suspension, wheels and tyres, the drivetrain, fuel and the throttle", () => {
    expect([...SAFETY_CATEGORIES].sort()).toEqual(["brakes", "drivetrain", "fuel", "none", "steering", "suspension", "throttle", "wheels_tyres"]);
  });

  it("each has its own label, and each but none an owner-facing caution saying it is put right before riding", () => {
    const labels = SAFETY_CATEGORIES.map((c) => SAFETY_LABEL[c]);
    expect(new Set(labels).size).toBe(labels.length);
    for (const c of SAFETY_CATEGORIES) {
      if (c === "none") continue;
      expect(FINDING_CAUTIONS[c]).toMatch(/before the machine is ridden|shouldn't be run/);
    }
    expect(Object.keys(FINDING_CAUTIONS).sort()).toEqual(SAFETY_CATEGORIES.filter((c) => c !== "none").sort());
  });

  it("the finding form takes every category and refuses others with a message naming them", () => {
    const base = { title: "Rear tyre", found: "Cord showing on the shoulder.", whyItMatters: "", evidence: [], lines: [] };
    for (const safety of SAFETY_CATEGORIES) expect(findingInputSchema.safeParse({ ...base, safety }).success).toBe(true);
    const bad = findingInputSchema.safeParse({ ...base, safety: "tyres" });
    expect(bad.success).toBe(false);
    expect(bad.error!.issues[0]!.message).toMatch(/suspension, wheels and tyres, the drivetrain/);
  });
});
