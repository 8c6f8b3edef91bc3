// A job's life at the bench. The keys are stored in the database; the labels are ours.
export const JOB_STATUSES = [
  "checked_in",
  "inspecting",
  "waiting_approval",
  "waiting_parts",
  "in_progress",
  "ready",
  "picked_up",
] as const;

export type JobStatus = (typeof JOB_STATUSES)[number];

export const JOB_STATUS_LABEL: Record<JobStatus, string> = {
  checked_in: "Booked in",
  inspecting: "Diagnosing",
  waiting_approval: "Needs owner's OK",
  waiting_parts: "Waiting on parts",
  in_progress: "On the bench",
  ready: "Ready to collect",
  picked_up: "Collected",
};

/** Statuses in which the machine is still in the shop. */
export const OPEN_STATUSES: readonly JobStatus[] = JOB_STATUSES.filter((s) => s !== "picked_up");

export function isJobStatus(value: unknown): value is JobStatus {
  return typeof value === "string" && (JOB_STATUSES as readonly string[]).includes(value);
}
