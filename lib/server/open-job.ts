import "server-only";
import { AppError } from "@/lib/errors";
import { type JobStatus, collectedJobRefusal } from "@/lib/job-status";

/**
 * New posts and bench records stop at collection (lib/job-status.ts, `collectedJobRefusal`): a
 * note, photo, clip, torque record, reading or teardown step for a collected job is refused with
 * 409, before anything is written or uploaded. A phone's outbox that queued one before the desk
 * handed the machine back shows these words on the item, with Retry and Discard. The status is
 * the one read with the request's access check (lib/server/access.ts), fresh for every request.
 */
export function refuseIfCollected(job: { status: JobStatus }): void {
  const reason = collectedJobRefusal(job.status, "nothing more can be posted on it");
  if (reason) throw new AppError("conflict", reason);
}
