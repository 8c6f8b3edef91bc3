import { describe, expect, it } from "vitest";
import { JOB_STATUSES, NEXT_STATUSES, canMoveStatus, statusMoveError } from "@/lib/job-status";

// The job's life from the product brief (DESIGN.md §1): checked in → inspecting → waiting on
// approval ⇄ waiting on parts ⇄ in progress → ready → picked up, any of them repeating.
// Our own workflow rule: no published source.
describe("status transitions", () => {
  it("allows the brief's forward path", () => {
    const path = ["checked_in", "inspecting", "waiting_approval", "waiting_parts", "in_progress", "ready", "picked_up"] as const;
    for (let i = 1; i < path.length; i++) expect(canMoveStatus(path[i - 1]!, path[i]!)).toBe(true);
  });

  it("lets the waits and the bench work loop both ways", () => {
    for (const [a, b] of [
      ["waiting_approval", "waiting_parts"],
      ["waiting_parts", "in_progress"],
      ["waiting_approval", "in_progress"],
    ] as const) {
      expect(canMoveStatus(a, b)).toBe(true);
      expect(canMoveStatus(b, a)).toBe(true);
    }
  });

  it("refuses jumps that skip the work", () => {
    expect(canMoveStatus("checked_in", "ready")).toBe(false);
    expect(canMoveStatus("checked_in", "picked_up")).toBe(false);
    expect(canMoveStatus("waiting_parts", "ready")).toBe(false);
    expect(canMoveStatus("in_progress", "picked_up")).toBe(false);
  });

  it("closes a collected job and never moves a job to where it already is", () => {
    expect(NEXT_STATUSES.picked_up).toEqual([]);
    for (const s of JOB_STATUSES) expect(canMoveStatus(s, s)).toBe(false);
  });

  it("only names statuses that exist", () => {
    for (const s of JOB_STATUSES) for (const t of NEXT_STATUSES[s]) expect(JOB_STATUSES).toContain(t);
  });

  it("explains a refusal in plain words, naming the allowed moves", () => {
    expect(statusMoveError("checked_in", "ready")).toBe(
      'A job that is "Booked in" can\'t go straight to "Ready to collect". It can go to "Diagnosing", "Needs owner\'s OK", "Waiting on parts", "On the bench".',
    );
    expect(statusMoveError("picked_up", "in_progress")).toMatch(/closed/);
    expect(statusMoveError("ready", "ready")).toMatch(/already/);
    expect(statusMoveError("ready", "picked_up")).toBeNull();
  });
});
