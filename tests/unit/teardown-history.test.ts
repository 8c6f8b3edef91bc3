import { describe, expect, it } from "vitest";
import { torqueText } from "@/lib/bench";
import { type StepRevision, type StepSnapshot, changedFields, nextStepSeq, snapshotOfRow, stepTrail, teardownLockReason } from "@/lib/teardown-history";

// Issue 18 §7: what the bench page says about each change to a teardown step.

const label = (v: number, u: "nm" | "lbf_ft" | "lbf_in" | "kgf_m") => torqueText(v, u, "nm");
const snap = (over: Partial<StepSnapshot> = {}): StepSnapshot => ({ removed: "Clutch cover", count: 8, size: "M6", notes: null, storage: "Tray 2", torque: null, ...over });
const rev = (version: number, change: StepRevision["change"], previous: StepSnapshot): StepRevision => ({ stepId: 7, seq: 3, version, change, previous, by: "Ana", at: "2026-12-05T10:00:00.000Z" });

describe("teardown step history", () => {
  it("names each changed field with what it was and what it is now, and nothing else", () => {
    expect(changedFields(snap(), snap({ count: 9, notes: "Dowel at 12 o'clock" }), label)).toEqual(["count was 8 (now 9)", "notes was empty (now “Dowel at 12 o'clock”)"]);
    expect(changedFields(snap(), snap(), label)).toEqual([]);
    // A delete lists no fields: the page shows the whole step as it was.
    expect(changedFields(snap(), null, label)).toEqual([]);
  });

  it("says a torque change in the shop's unit, bolts included", () => {
    // NIST SP 811 App. B.9 via REFERENCES.md §1: 115 lbf·in → 13.0 N·m.
    const before = snap({ torque: { value: 115, unit: "lbf_in", boltCount: 8, note: null } });
    expect(changedFields(before, snap({ torque: { value: 10, unit: "nm", boltCount: 8, note: null } }), label)).toEqual(["torque was 13.0 N·m, 8 bolts (now 10.0 N·m, 8 bolts)"]);
    expect(changedFields(before, snap(), label)).toEqual(["torque was 13.0 N·m, 8 bolts (now none)"]);
  });

  it("pairs each revision with the state that followed it: the next revision's previous, or the step now", () => {
    const v1 = snap();
    const v2 = snap({ count: 9 });
    const now = snap({ count: 9, removed: "Clutch cover, right" });
    const trail = stepTrail([rev(2, "edit", v2), rev(1, "edit", v1)], now);
    expect(trail.map((t) => t.revision.version)).toEqual([1, 2]);
    expect(trail.map((t) => changedFields(t.revision.previous, t.next, label))).toEqual([["count was 8 (now 9)"], ["what came off was “Clutch cover” (now “Clutch cover, right”)"]]);
    // A deleted step: the delete has no "next".
    expect(stepTrail([rev(1, "edit", v1), rev(2, "delete", v2)], null).map((t) => t.next)).toEqual([v2, null]);
  });

  it("reads a stored step row back, torque and all", () => {
    const row = { removed: "Rear caliper", count: 2, size: null, notes: "Banjo washers new", storage_label: "Bag B", torque_value: 25, torque_unit: "nm", torque_bolt_count: 2, checked_at: null };
    expect(snapshotOfRow(row)).toEqual({ removed: "Rear caliper", count: 2, size: null, notes: "Banjo washers new", storage: "Bag B", torque: { value: 25, unit: "nm", boltCount: 2, note: null } });
    expect(snapshotOfRow({ ...row, torque_value: null }).torque).toBeNull();
    // Angle stages and one-time fasteners (migration 27) are part of what the torque was.
    const special = snapshotOfRow({ ...row, torque_angle_stages: "[90]", torque_one_time: 1 });
    expect(special.torque!.note).toMatch(/^then \+ 90° by angle; one-time/);
    expect(changedFields(special, snapshotOfRow(row), label)).toEqual([expect.stringMatching(/^torque was 25\.0 N·m, 2 bolts, then \+ 90° by angle; one-time .* \(now 25\.0 N·m, 2 bolts\)$/)]);
  });

  it("closes the log once the machine is collected, and only then", () => {
    expect(teardownLockReason("picked_up")).toMatch(/collected/);
    for (const s of ["checked_in", "inspecting", "waiting_approval", "waiting_parts", "in_progress", "ready"] as const) expect(teardownLockReason(s)).toBeNull();
  });

  it("numbers the next step past every step ever logged, deleted ones included", () => {
    expect(nextStepSeq([], [])).toBe(1);
    expect(nextStepSeq([{ seq: 1 }, { seq: 2 }], [{ seq: 3 }])).toBe(4);
    expect(nextStepSeq([{ seq: 5 }], [{ seq: 2 }])).toBe(6);
  });
});
