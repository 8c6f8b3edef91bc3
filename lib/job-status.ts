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

/**
 * Where a job may go next. A job can loop between diagnosing, waiting and bench work as often as
 * the work needs; once collected it is closed (a comeback is a new job). Our own workflow rule.
 */
export const NEXT_STATUSES: Record<JobStatus, readonly JobStatus[]> = {
  checked_in: ["inspecting", "waiting_approval", "waiting_parts", "in_progress"],
  inspecting: ["waiting_approval", "waiting_parts", "in_progress", "ready"],
  waiting_approval: ["inspecting", "waiting_parts", "in_progress", "ready"],
  waiting_parts: ["inspecting", "waiting_approval", "in_progress"],
  in_progress: ["inspecting", "waiting_approval", "waiting_parts", "ready"],
  ready: ["in_progress", "picked_up"],
  picked_up: [],
};

export function canMoveStatus(from: JobStatus, to: JobStatus): boolean {
  return NEXT_STATUSES[from].includes(to);
}

/** The message shown when someone asks for a move the rules don't allow. */
export function statusMoveError(from: JobStatus, to: JobStatus): string | null {
  if (from === to) return `The job is already "${JOB_STATUS_LABEL[to]}".`;
  if (canMoveStatus(from, to)) return null;
  const options = NEXT_STATUSES[from].map((s) => `"${JOB_STATUS_LABEL[s]}"`);
  return options.length
    ? `A job that is "${JOB_STATUS_LABEL[from]}" can't go straight to "${JOB_STATUS_LABEL[to]}". It can go to ${options.join(", ")}.`
    : `A job that is "${JOB_STATUS_LABEL[from]}" is closed; check the machine in again as a new job.`;
}

/**
 * Once the owner has collected the machine the job is closed (a comeback is a new job): nothing
 * new lands on it. The words for a refusal of that kind, `closed` saying what is shut ("its
 * teardown log is closed"), or null while the job is open. One wording for every writer that
 * stops at collection (journal posts, bench records, the teardown log).
 */
export function collectedJobRefusal(status: JobStatus, closed: string): string | null {
  return status === "picked_up" ? `This job was collected, so ${closed}. Note anything new on the machine's next job.` : null;
}
