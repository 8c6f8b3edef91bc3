// The job board's rows as sent to the browser (JSON-safe), shared by the page and the API.
import type { JobStatus } from "@/lib/job-status";
import { describeMachine } from "@/lib/machine";

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
}): JobBoardRow {
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
  };
}

/** Overdue: still in the shop after the promised date (compared as calendar dates, YYYY-MM-DD). */
export function isOverdue(row: { status: JobStatus; promisedOn: string | null }, today: string): boolean {
  return row.promisedOn != null && row.status !== "ready" && row.status !== "picked_up" && row.promisedOn < today;
}
