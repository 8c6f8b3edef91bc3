// The job board's rows as sent to the browser (JSON-safe), shared by the page and the API.
import type { JobStatus } from "@/lib/job-status";
import { type WaitingOn, waitingOn } from "@/lib/job-workflow";
import { describeMachine } from "@/lib/machine";
import type { JobAttention } from "@/lib/schemas/jobs";

export type JobBoardRow = {
  number: number;
  status: JobStatus;
  customerName: string;
  machine: string;
  serial: string | null;
  concern: string;
  promisedOn: string | null;
  technician: string | null;
  updatedAt: string;
  /** Whom it waits on and the next thing to do; null once collected. */
  waitingOn: WaitingOn | null;
  next: string | null;
  /** Since when it is in its status (ISO). */
  since: string;
  /** Quick-filter facts the server worked out (see db/queries/jobs.ts). */
  answeredNotStarted: boolean;
  readyUnpaid: boolean;
  ownerWaitDays: number;
};

export type JobBoardPage = { rows: JobBoardRow[]; total: number; page: number; pageSize: number; pageCount: number };

export function toBoardRow(job: {
  number: number;
  status: JobStatus;
  customerName: string;
  machine: { year: number | null; make: string; model: string; serial: string | null };
  concern: string;
  promisedOn: string | null;
  technician: { name: string } | null;
  updatedAt: Date;
  since: Date;
  invoiceState: "none" | "draft" | "issued" | "paid";
  ownerWaitDays: number;
  answeredNotStarted: boolean;
}): JobBoardRow {
  const waits = waitingOn(job.status, { invoice: job.invoiceState, balanceMinor: job.invoiceState === "paid" ? 0 : 1 });
  return {
    number: job.number,
    status: job.status,
    customerName: job.customerName,
    machine: describeMachine(job.machine),
    serial: job.machine.serial,
    concern: job.concern.length > 140 ? `${job.concern.slice(0, 139)}…` : job.concern,
    promisedOn: job.promisedOn,
    technician: job.technician?.name ?? null,
    updatedAt: job.updatedAt.toISOString(),
    waitingOn: waits?.on ?? null,
    next: waits?.next ?? null,
    since: job.since.toISOString(),
    answeredNotStarted: job.answeredNotStarted,
    readyUnpaid: job.status === "ready" && job.invoiceState !== "paid",
    ownerWaitDays: job.ownerWaitDays,
  };
}

/** Whole days from `since` to `now` (at least 0). */
export function daysSince(since: string, now: Date = new Date()): number {
  return Math.max(0, Math.floor((now.getTime() - Date.parse(since)) / 86_400_000));
}

/** "3 days", "1 day", "today": how long a job has been waiting. */
export function waitedFor(since: string, now: Date = new Date()): string {
  const d = daysSince(since, now);
  return d === 0 ? "today" : `${d} ${d === 1 ? "day" : "days"}`;
}

/** Statuses in which a passed promised date no longer counts against the shop. */
export const DONE_STATUSES: readonly JobStatus[] = ["ready", "picked_up"];

/** Overdue: still in the shop after the promised date (compared as calendar dates, YYYY-MM-DD). */
export function isOverdue(row: { status: JobStatus; promisedOn: string | null }, today: string): boolean {
  return row.promisedOn != null && !DONE_STATUSES.includes(row.status) && row.promisedOn < today;
}

/** Whole calendar days past the promised date, or null when the job is not overdue. */
export function daysOverdue(row: { status: JobStatus; promisedOn: string | null }, today: string): number | null {
  if (!isOverdue(row, today)) return null;
  // Both are calendar dates: read them as UTC midnights so no clock change skews the count.
  return Math.round((Date.parse(`${today}T00:00:00Z`) - Date.parse(`${row.promisedOn}T00:00:00Z`)) / 86_400_000);
}

/** Why a job needs someone to act, the same tests the board's quick filters apply in SQL. */
export function jobAttention(
  row: { status: JobStatus; promisedOn: string | null } & Partial<Pick<JobBoardRow, "answeredNotStarted" | "readyUnpaid" | "since" | "ownerWaitDays">>,
  today: string,
  now: Date = new Date(),
): JobAttention[] {
  const out: JobAttention[] = [];
  if (isOverdue(row, today)) out.push("overdue");
  if (row.status === "waiting_parts") out.push("waiting_parts");
  if (row.answeredNotStarted) out.push("answered");
  if (row.readyUnpaid) out.push("ready_unpaid");
  if (row.status === "waiting_approval" && row.since && row.ownerWaitDays != null && daysSince(row.since, now) >= row.ownerWaitDays) out.push("owner_slow");
  return out;
}

export function overdueLabel(days: number): string {
  return `Overdue ${days} ${days === 1 ? "day" : "days"}`;
}

/** Today's date on the shop's wall calendar (YYYY-MM-DD) in its IANA time zone. */
export function shopToday(timeZone: string, now: Date = new Date()): string {
  // en-CA formats dates as YYYY-MM-DD.
  return new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" }).format(now);
}
