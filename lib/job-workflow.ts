// The job follows what happens to it. Pure: every writer that records an event (a request sent,
// the last answer in, a part for cleared work, reassembly finished, an invoice paid, the machine
// collected) asks `moveFor` where the job goes, and the board and the owner's page ask
// `waitingOn` whom it waits on. The rules are our own workflow, not a published standard.

import { JOB_STATUS_LABEL, type JobStatus, canMoveStatus } from "@/lib/job-status";

/** What the job's state depends on besides its status, read after the event was recorded. */
export type JobFacts = {
  /** Approval requests sent and not answered, withdrawn or replaced. */
  openRequests: number;
  /** Parts needed or ordered (not in yet) for work the owner authorised or that needs no OK. */
  outstandingParts: number;
  /** The job's live invoice: none yet, a draft, issued (money owed or not), or settled. */
  invoice: "none" | "draft" | "issued" | "paid";
  /** What is still owed on the issued invoice, in minor units (0 when none is issued). */
  balanceMinor: number;
};

export type WorkflowEvent =
  | { kind: "request_sent" }
  | { kind: "request_answered" }
  | { kind: "request_withdrawn" }
  | { kind: "part_needed" }
  | { kind: "part_received" }
  | { kind: "reassembly_finished" }
  | { kind: "invoice_issued" }
  | { kind: "invoice_paid" }
  | { kind: "invoice_refunded" }
  | { kind: "collected"; override: string | null }
  | { kind: "manual"; to: JobStatus };

export type WorkflowCause = WorkflowEvent["kind"];

/** What the status history says moved the job. */
export const CAUSE_LABEL: Record<WorkflowCause, string> = {
  request_sent: "An approval request went to the owner",
  request_answered: "The owner answered every open request",
  request_withdrawn: "The last open request was withdrawn",
  part_needed: "Waiting for parts to arrive for the work you approved.",
  part_received: "All parts are in; work continues.",
  reassembly_finished: "Reassembly finished",
  invoice_issued: "Invoice issued",
  invoice_paid: "Invoice paid",
  invoice_refunded: "Payment refunded",
  collected: "The owner collected the machine",
  manual: "Moved by hand",
};

/**
 * How far along a job is. An automatic move never lowers it; the three middle statuses are one
 * stage (work loops between waiting on the owner, on parts and bench work as often as it needs).
 */
export const STAGE: Record<JobStatus, number> = {
  checked_in: 0,
  inspecting: 1,
  waiting_approval: 2,
  waiting_parts: 2,
  in_progress: 2,
  ready: 3,
  picked_up: 4,
};

export type Move = { to: JobStatus; cause: WorkflowCause };

/** Settled: nothing more owed on an issued (or paid) invoice. A job with no invoice isn't. */
export function isSettled(f: Pick<JobFacts, "invoice" | "balanceMinor">): boolean {
  return f.invoice === "paid" || (f.invoice === "issued" && f.balanceMinor <= 0);
}

/** Where the bench work goes once nothing is awaited from the owner. */
function afterOwner(f: JobFacts): JobStatus {
  return f.outstandingParts > 0 ? "waiting_parts" : "in_progress";
}

/**
 * Where an automatic event moves a job in `status`, given the facts after the event; null when
 * it stays. Collection and hand moves are checked by `collectionRefusal` / `canMoveStatus`.
 */
export function moveFor(status: JobStatus, event: WorkflowEvent, f: JobFacts): Move | null {
  const to = ((): JobStatus | null => {
    switch (event.kind) {
      case "request_sent":
        return ["checked_in", "inspecting", "in_progress", "waiting_parts"].includes(status) ? "waiting_approval" : null;
      case "request_answered":
      case "request_withdrawn":
        return status === "waiting_approval" && f.openRequests === 0 ? afterOwner(f) : null;
      case "part_needed":
        return ["checked_in", "inspecting", "in_progress"].includes(status) && f.outstandingParts > 0 ? "waiting_parts" : null;
      case "part_received":
        return status === "waiting_parts" && f.outstandingParts === 0 ? (f.openRequests > 0 ? "waiting_approval" : "in_progress") : null;
      case "reassembly_finished":
        return ["inspecting", "in_progress"].includes(status) && f.openRequests === 0 && f.outstandingParts === 0 ? "ready" : null;
      case "collected":
        return status === "ready" ? "picked_up" : null;
      case "manual":
        // Handing back goes through the collection gate ("collected"), never a plain move.
        return event.to !== "picked_up" && canMoveStatus(status, event.to) ? event.to : null;
      // Money changes whom a ready job waits on (see waitingOn), not its status.
      case "invoice_issued":
      case "invoice_paid":
      case "invoice_refunded":
        return null;
    }
  })();
  if (to === null || to === status) return null;
  // A hand move may step back (the trade needs it: a comeback to the bench); an event never does.
  if (event.kind !== "manual" && STAGE[to] < STAGE[status]) return null;
  return { to, cause: event.kind };
}

/** Why the machine can't be marked collected yet, or null. An override with a reason passes. */
export function collectionRefusal(status: JobStatus, f: JobFacts, override: string | null): string | null {
  if (status !== "ready") return `Only a job that is "${JOB_STATUS_LABEL.ready}" can be collected; this one is "${JOB_STATUS_LABEL[status]}".`;
  if (isSettled(f)) return null;
  if (override && override.trim().length >= 3) return null;
  const why =
    f.invoice === "none" ? "there is no invoice yet" : f.invoice === "draft" ? "the invoice is still a draft" : "the invoice isn't paid";
  return `It can't be handed back yet: ${why}. Take payment first, or give a reason to hand it back anyway.`;
}

/** The step a hand move most likely wants next: what the status control offers first. */
export const SUGGESTED_NEXT: Record<JobStatus, JobStatus | null> = {
  checked_in: "inspecting",
  inspecting: "in_progress",
  waiting_approval: "in_progress",
  waiting_parts: "in_progress",
  in_progress: "ready",
  ready: "picked_up",
  picked_up: null,
};

export type WaitingOn = "owner" | "parts" | "shop" | "payment";

export const WAITING_ON_LABEL: Record<WaitingOn, string> = {
  owner: "The owner",
  parts: "Parts",
  shop: "The shop",
  payment: "Payment",
};

/** Whom the job waits on, and the next thing to do about it; null once it is collected. */
export function waitingOn(status: JobStatus, f: Pick<JobFacts, "invoice" | "balanceMinor">): { on: WaitingOn; next: string } | null {
  switch (status) {
    case "checked_in":
      return { on: "shop", next: "Start diagnosing" };
    case "inspecting":
      return { on: "shop", next: "Write up what was found" };
    case "waiting_approval":
      return { on: "owner", next: "Chase the owner's answer" };
    case "waiting_parts":
      return { on: "parts", next: "Chase the parts; receive them when in" };
    case "in_progress":
      return { on: "shop", next: "Finish the work" };
    case "ready":
      if (isSettled(f)) return { on: "owner", next: "Hand it back when they come" };
      return { on: "payment", next: f.invoice === "none" || f.invoice === "draft" ? "Issue the invoice" : "Take payment" };
    case "picked_up":
      return null;
  }
}

/** Everything the property tests replay: the status and the facts, changed by one event. */
export type WorkflowState = { status: JobStatus; facts: JobFacts };

export const INITIAL_STATE: WorkflowState = { status: "checked_in", facts: { openRequests: 0, outstandingParts: 0, invoice: "none", balanceMinor: 0 } };

/** The facts after an event, as the database would read them once the writer has written. */
export function factsAfter(f: JobFacts, event: WorkflowEvent, amountMinor = 0): JobFacts {
  switch (event.kind) {
    case "request_sent":
      return { ...f, openRequests: f.openRequests + 1 };
    case "request_answered":
    case "request_withdrawn":
      return { ...f, openRequests: Math.max(0, f.openRequests - 1) };
    case "part_needed":
      return { ...f, outstandingParts: f.outstandingParts + 1 };
    case "part_received":
      return { ...f, outstandingParts: Math.max(0, f.outstandingParts - 1) };
    case "invoice_issued":
      return f.invoice === "paid" ? f : { ...f, invoice: "issued", balanceMinor: amountMinor };
    case "invoice_paid":
      return f.invoice === "issued" ? { ...f, invoice: "paid", balanceMinor: 0 } : f;
    case "invoice_refunded":
      return f.invoice === "paid" ? { ...f, invoice: "issued", balanceMinor: Math.max(amountMinor, 1) } : f;
    default:
      return f;
  }
}

/** One event applied: the facts it changes, then the move it causes (if any). */
export function applyEvent(state: WorkflowState, event: WorkflowEvent, amountMinor = 0): { state: WorkflowState; move: Move | null } {
  const facts = factsAfter(state.facts, event, amountMinor);
  const gate = event.kind === "collected" ? collectionRefusal(state.status, facts, event.override) : null;
  const move = gate ? null : moveFor(state.status, event, facts);
  return { state: { status: move ? move.to : state.status, facts }, move };
}

/** The state a sequence of events leads to from check-in. */
export function replay(events: readonly WorkflowEvent[]): WorkflowState {
  return events.reduce((s, e) => applyEvent(s, e).state, INITIAL_STATE);
}

/**
 * What the owner's page says about where the job stands, in words that match the real state:
 * the promised date only while the machine is still being worked on; ready and collected say so;
 * declined work says what happens next. Pure.
 */
export function ownerStanding(p: {
  status: JobStatus;
  promisedOn: string | null;
  facts: Pick<JobFacts, "openRequests" | "invoice" | "balanceMinor">;
  /** Lines the owner declined, by description (empty for followers, who don't see decisions). */
  declined: string[];
  /** When it was collected (YYYY-MM-DD in the shop's calendar), for a collected job. */
  collectedOn: string | null;
}): { headline: string; lines: string[] } {
  const lines: string[] = [];
  const promised = p.promisedOn ? `The shop expects to have it ready by ${p.promisedOn}.` : "The shop hasn't set a ready date yet.";
  let headline: string;
  switch (p.status) {
    case "checked_in":
    case "inspecting":
      headline = "The shop is looking it over.";
      lines.push(promised);
      break;
    case "waiting_approval":
      headline =
        p.facts.openRequests === 1
          ? "The shop is waiting for your answer on one request before going further."
          : `The shop is waiting for your answer on ${p.facts.openRequests || "some"} requests before going further.`;
      break;
    case "waiting_parts":
      headline = "Waiting for parts to arrive for the work you approved.";
      lines.push(promised);
      break;
    case "in_progress":
      headline = "It's on the bench.";
      lines.push(promised);
      break;
    case "ready":
      headline = "It's ready to collect.";
      if (isSettled(p.facts)) lines.push("The invoice is paid; bring nothing but yourself.");
      else if (p.facts.invoice === "issued") lines.push("The invoice is waiting for payment: pay online below or at the counter.");
      else lines.push("The shop is preparing the invoice.");
      break;
    case "picked_up":
      headline = p.collectedOn ? `Collected on ${p.collectedOn}.` : "Collected.";
      break;
  }
  if (p.declined.length && p.status !== "picked_up") {
    lines.push(`You declined: ${p.declined.join("; ")}. The shop won't do that work; the machine goes back together without it. Ask the shop if you change your mind.`);
  }
  return { headline, lines };
}
