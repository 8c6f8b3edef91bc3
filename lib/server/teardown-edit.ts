import "server-only";
import { settleReassembly } from "@/db/queries/workflow";
import { reviseTeardownStep } from "@/db/queries/teardown-history";
import type { Actor } from "@/lib/permissions";
import type { TeardownDeleteInput, TeardownEditInput } from "@/lib/schemas/bench";
import type { JobAccess } from "@/lib/server/access";

// Editing and deleting teardown steps (issue 18 §7), authorised by the caller's declaration
// (bench:record, as for logging a step). The trail and the refusals (collected job, stale
// version, a step already gone) are in db/queries/teardown-history.ts, in one transaction.

export async function editTeardownStep(actor: Actor, { job }: JobAccess, input: TeardownEditInput) {
  const set = { removed: input.removed, count: input.count, size: input.size, notes: input.notes, storage: input.storage };
  const made = await reviseTeardownStep({ shopId: job.shopId, jobId: job.id, stepId: input.step, userId: actor.userId, expectedVersion: input.version, change: { kind: "edit", set } });
  return { ...made, job };
}

export async function deleteTeardownStep(actor: Actor, { job }: JobAccess, input: TeardownDeleteInput) {
  const made = await reviseTeardownStep({ shopId: job.shopId, jobId: job.id, stepId: input.step, userId: actor.userId, expectedVersion: input.version, change: { kind: "delete" } });
  // With the last open step gone, everything left may be back together: the job follows, as after a tick.
  const moved = await settleReassembly({ shopId: job.shopId, jobId: job.id, userId: actor.userId });
  return { ...made, job, jobMovedTo: moved?.to ?? null };
}
