import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { JOB_STATUSES, type JobStatus, canMoveStatus } from "@/lib/job-status";
import {
  INITIAL_STATE,
  type JobFacts,
  STAGE,
  type WorkflowEvent,
  applyEvent,
  collectionRefusal,
  moveFor,
  ownerStanding,
  replay,
  waitingOn,
} from "@/lib/job-workflow";

// The workflow is our own rule (common trade practice, no published source): these tests check
// its promises, not values from outside.

const status = fc.constantFrom(...JOB_STATUSES);
const event: fc.Arbitrary<WorkflowEvent> = fc.oneof(
  fc.constantFrom<WorkflowEvent>(
    { kind: "request_sent" },
    { kind: "request_answered" },
    { kind: "request_withdrawn" },
    { kind: "part_needed" },
    { kind: "part_received" },
    { kind: "reassembly_finished" },
    { kind: "invoice_issued" },
    { kind: "invoice_paid" },
    { kind: "invoice_refunded" },
  ),
  fc.record({ kind: fc.constant("collected" as const), override: fc.option(fc.constantFrom("owner pays on account", "x", "  "), { nil: null }) }),
  fc.record({ kind: fc.constant("manual" as const), to: status }),
);
const events = fc.array(event, { maxLength: 60 });
const facts: fc.Arbitrary<JobFacts> = fc.record({
  openRequests: fc.nat(3),
  outstandingParts: fc.nat(3),
  invoice: fc.constantFrom("none", "draft", "issued", "paid"),
  balanceMinor: fc.integer({ min: 0, max: 50_000 }),
});

describe("job workflow (property tests over random event sequences)", () => {
  it("every move is one the status table allows, and the state is always a known status", () => {
    fc.assert(
      fc.property(events, (seq) => {
        let s = INITIAL_STATE;
        for (const e of seq) {
          const { state, move } = applyEvent(s, e);
          if (move) expect(canMoveStatus(s.status, move.to) || (e.kind === "collected" && move.to === "picked_up")).toBe(true);
          expect(JOB_STATUSES).toContain(state.status);
          s = state;
        }
      }),
      { numRuns: 2000 },
    );
  });

  it("an automatic move never goes backwards", () => {
    fc.assert(
      fc.property(events, (seq) => {
        let s = INITIAL_STATE;
        for (const e of seq) {
          const { state, move } = applyEvent(s, e);
          if (move && e.kind !== "manual") expect(STAGE[move.to]).toBeGreaterThanOrEqual(STAGE[s.status]);
          s = state;
        }
      }),
      { numRuns: 2000 },
    );
  });

  it("the job's state is a function of its events: replaying them gives the same state", () => {
    fc.assert(
      fc.property(events, (seq) => {
        let s = INITIAL_STATE;
        for (const e of seq) s = applyEvent(s, e).state;
        expect(replay(seq)).toEqual(s);
        expect(replay([...seq])).toEqual(replay(seq));
      }),
      { numRuns: 1000 },
    );
  });

  it("a collected job stays collected whatever happens next", () => {
    fc.assert(
      fc.property(events, events, (before, after) => {
        const closed = replay([...before, { kind: "invoice_issued" }, { kind: "invoice_paid" }]);
        if (closed.status !== "ready") return;
        const collected = applyEvent(closed, { kind: "collected", override: null }).state;
        expect(collected.status).toBe("picked_up");
        let s = collected;
        for (const e of after) s = applyEvent(s, e).state;
        expect(s.status).toBe("picked_up");
      }),
      { numRuns: 1000 },
    );
  });

  it("the collection gate holds for every status and invoice: only a settled ready job, or a reason", () => {
    fc.assert(
      fc.property(status, facts, (st, f) => {
        const refusal = collectionRefusal(st, f, null);
        const settled = f.invoice === "paid" || (f.invoice === "issued" && f.balanceMinor <= 0);
        expect(refusal === null).toBe(st === "ready" && settled);
        if (st === "ready") expect(collectionRefusal(st, f, "Owner pays on account, agreed by phone")).toBeNull();
      }),
    );
  });
});

describe("job workflow (the story of one job)", () => {
  const noFacts: JobFacts = { openRequests: 0, outstandingParts: 0, invoice: "none", balanceMinor: 0 };

  it("the last answer moves the job off the owner, to parts when authorised parts are outstanding", () => {
    expect(moveFor("waiting_approval", { kind: "request_answered" }, { ...noFacts, openRequests: 1 })).toBeNull();
    expect(moveFor("waiting_approval", { kind: "request_answered" }, noFacts)).toEqual({ to: "in_progress", cause: "request_answered" });
    expect(moveFor("waiting_approval", { kind: "request_answered" }, { ...noFacts, outstandingParts: 2 })).toEqual({ to: "waiting_parts", cause: "request_answered" });
  });

  it("a part for cleared work waits the job only while nobody is waiting on the owner", () => {
    expect(moveFor("in_progress", { kind: "part_needed" }, { ...noFacts, outstandingParts: 1 })?.to).toBe("waiting_parts");
    expect(moveFor("waiting_approval", { kind: "part_needed" }, { ...noFacts, outstandingParts: 1 })).toBeNull();
    // A part that isn't cleared doesn't count: no outstanding part, no move.
    expect(moveFor("in_progress", { kind: "part_needed" }, noFacts)).toBeNull();
  });

  it("a request sent to a ready job doesn't drag it back; a hand move may", () => {
    expect(moveFor("ready", { kind: "request_sent" }, noFacts)).toBeNull();
    expect(moveFor("ready", { kind: "manual", to: "in_progress" }, noFacts)).toEqual({ to: "in_progress", cause: "manual" });
    expect(moveFor("ready", { kind: "manual", to: "picked_up" }, noFacts)).toBeNull();
  });

  it("a full run: check-in to collection", () => {
    const run: [WorkflowEvent, JobStatus][] = [
      [{ kind: "manual", to: "inspecting" }, "inspecting"],
      [{ kind: "request_sent" }, "waiting_approval"],
      [{ kind: "request_sent" }, "waiting_approval"],
      [{ kind: "request_answered" }, "waiting_approval"],
      [{ kind: "request_answered" }, "in_progress"],
      [{ kind: "part_needed" }, "waiting_parts"],
      [{ kind: "part_received" }, "in_progress"],
      [{ kind: "reassembly_finished" }, "ready"],
      [{ kind: "collected", override: null }, "ready"],
      [{ kind: "invoice_issued" }, "ready"],
      [{ kind: "invoice_paid" }, "ready"],
      [{ kind: "collected", override: null }, "picked_up"],
    ];
    let s = INITIAL_STATE;
    for (const [e, expected] of run) {
      s = applyEvent(s, e, 12_500).state;
      expect(s.status, e.kind).toBe(expected);
    }
  });

  it("whom a job waits on, and what to do next", () => {
    expect(waitingOn("waiting_approval", noFacts)?.on).toBe("owner");
    expect(waitingOn("waiting_parts", noFacts)?.on).toBe("parts");
    expect(waitingOn("ready", { invoice: "draft", balanceMinor: 0 })).toEqual({ on: "payment", next: "Issue the invoice" });
    expect(waitingOn("ready", { invoice: "issued", balanceMinor: 100 })).toEqual({ on: "payment", next: "Take payment" });
    expect(waitingOn("ready", { invoice: "issued", balanceMinor: 0 })?.on).toBe("owner");
    expect(waitingOn("picked_up", noFacts)).toBeNull();
  });
});

describe("what the owner's page says", () => {
  const base = { promisedOn: "2026-12-10", declined: [] as string[], collectedOn: null, facts: { openRequests: 0, invoice: "none" as const, balanceMinor: 0 } };

  it("shows the promised date only while the machine is being worked on", () => {
    expect(ownerStanding({ ...base, status: "in_progress" }).lines.join(" ")).toContain("2026-12-10");
    for (const status of ["ready", "picked_up", "waiting_approval"] as const) {
      expect(ownerStanding({ ...base, status }).lines.join(" ")).not.toContain("2026-12-10");
    }
  });

  it("ready says ready and whether it is paid; collected says when", () => {
    expect(ownerStanding({ ...base, status: "ready" }).headline).toMatch(/ready to collect/i);
    expect(ownerStanding({ ...base, status: "ready", facts: { openRequests: 0, invoice: "paid", balanceMinor: 0 } }).lines[0]).toMatch(/paid/);
    expect(ownerStanding({ ...base, status: "picked_up", collectedOn: "2026-12-12" }).headline).toBe("Collected on 2026-12-12.");
  });

  it("declined work is named with what happens to it", () => {
    const s = ownerStanding({ ...base, status: "in_progress", declined: ["Rear tyre"] });
    expect(s.lines.at(-1)).toMatch(/You declined: Rear tyre\. The shop won't do that work/);
  });
});
