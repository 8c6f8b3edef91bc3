import "server-only";
import { settleReassembly } from "@/db/queries/workflow";
import { getBenchSettings, insertReading, insertTeardownStep, insertTorqueRecord, jobHasPhoto, setStepChecked, setStepReplaced, setStepTorque } from "@/db/queries/bench";
import type { ReadingBody, TorqueBody } from "@/lib/bench";
import { chainCheck } from "@/lib/chain-wear";
import { AppError } from "@/lib/errors";
import type { Actor } from "@/lib/permissions";
import { evaluateReading } from "@/lib/readings";
import { formatFixed, roundHalfUp } from "@/lib/rounding";
import type { ChainReadingInput, ReadingInput, TeardownStepInput, TorqueRecordInput } from "@/lib/schemas/bench";
import type { JobAccess } from "@/lib/server/access";
import { passSchedule } from "@/lib/tightening-passes";
import { supportsCrossPattern } from "@/lib/tightening-order";
import type { TorqueUnit } from "@/lib/torque";

// Bench records for one job, already resolved and authorised by the caller's declaration
// (lib/server/access.ts): check with the pure domain modules → write the row and its timeline
// entry together.

/** Runs a domain check and pins its message to the form field it is about. */
export function onField<T>(field: string, check: () => T): T {
  try {
    return check();
  } catch (error) {
    if (error instanceof AppError && error.code === "invalid") throw new AppError("invalid", error.message, { [field]: [error.message] });
    throw error;
  }
}

function checkTorque(value: number, unit: TorqueUnit, passPercents: readonly number[], boltCount: number | null) {
  // passSchedule refuses a zero torque and passes that don't rise to 100 %, in plain words.
  onField("passes", () => passSchedule(value, unit, passPercents));
  return boltCount != null && supportsCrossPattern(boltCount) ? ("cross" as const) : null;
}

export async function recordTorque(actor: Actor, { job }: JobAccess, input: TorqueRecordInput) {
  const settings = await getBenchSettings({ shopId: job.shopId });
  const passPercents = input.passes ?? settings.passPercents;
  const body: TorqueBody = {
    fastener: input.fastener,
    specValue: input.specValue,
    unit: input.unit,
    appliedValue: input.appliedValue,
    tool: input.tool,
    passPercents,
    boltCount: input.boltCount,
    pattern: checkTorque(input.specValue, input.unit, passPercents, input.boltCount),
    note: input.note,
    displayUnit: settings.torqueUnit,
  };
  const made = await insertTorqueRecord({ shopId: job.shopId, jobId: job.id, userId: actor.userId, visibility: input.share ? "shared" : "shop", body });
  return { ...made, job };
}

export async function recordReading(actor: Actor, { job }: JobAccess, input: ReadingInput) {
  const result = onField("min", () => evaluateReading({ value: input.value, min: input.min, max: input.max, unit: input.unit }));
  const body: ReadingBody = {
    label: input.label,
    value: input.value,
    unit: input.unit,
    min: input.min,
    max: input.max,
    source: input.source,
    verdict: result.verdict,
    marginText: result.marginText ?? null,
    chain: null,
  };
  return { ...(await insertReading({ shopId: job.shopId, jobId: job.id, userId: actor.userId, body })), job };
}

/** Chain wear over N pitches → elongation % as the reading, the shop's (or typed) limit as its maximum. */
export async function recordChainReading(actor: Actor, { job }: JobAccess, input: ChainReadingInput) {
  const limitPct = input.limitPct ?? (await getBenchSettings({ shopId: job.shopId })).chainLimitPct;
  const check = onField("measuredMm", () => chainCheck({ pitchMm: input.pitchMm, pitches: input.pitches, measuredMm: input.measuredMm, limitPct }));
  const value = roundHalfUp(check.elongationPct, 3);
  const gap = formatFixed(Math.abs(check.elongationPct - limitPct), 2);
  const body: ReadingBody = {
    label: input.label,
    value,
    unit: "%",
    min: null,
    max: limitPct,
    source: input.source,
    // The chain rule: due for replacement once it reaches the limit (lib/chain-wear.ts).
    verdict: check.verdict === "replace" ? "above" : "within",
    marginText: check.verdict === "replace" ? `at or past the replace-at limit by ${gap} %` : `${gap} % short of the replace-at limit`,
    chain: { pitchMm: input.pitchMm, pitches: input.pitches, measuredMm: input.measuredMm, limitPct },
  };
  return { ...(await insertReading({ shopId: job.shopId, jobId: job.id, userId: actor.userId, body })), job, check };
}

export async function addTeardownStep(actor: Actor, { job }: JobAccess, input: TeardownStepInput) {
  if (input.photo && !(await jobHasPhoto({ shopId: job.shopId, jobId: job.id, publicId: input.photo }))) {
    throw new AppError("invalid", "Choose one of this job's posted photos.", { photo: ["Choose one of this job's posted photos."] });
  }
  const made = await insertTeardownStep({
    shopId: job.shopId,
    jobId: job.id,
    userId: actor.userId,
    photoId: input.photo,
    step: { removed: input.removed, count: input.count, size: input.size, notes: input.notes, storage: input.storage },
  });
  return { ...made, job };
}

function found(ok: boolean) {
  if (!ok) throw new AppError("not_found", "That teardown step isn't on this job.");
}

export async function setTeardownTorque(actor: Actor, { job }: JobAccess, input: { step: number; torqueValue: number; torqueUnit: TorqueUnit; boltCount: number | null }) {
  const settings = await getBenchSettings({ shopId: job.shopId });
  checkTorque(input.torqueValue, input.torqueUnit, settings.passPercents, input.boltCount);
  found(await setStepTorque({ shopId: job.shopId, jobId: job.id, stepId: input.step, torque: { value: input.torqueValue, unit: input.torqueUnit, boltCount: input.boltCount } }));
  return { job };
}

export async function tickTeardownStep(actor: Actor, { job }: JobAccess, input: { step: number; value: boolean }) {
  found(await setStepChecked({ shopId: job.shopId, jobId: job.id, stepId: input.step, userId: actor.userId, done: input.value }));
  // The last step back together: the job follows (ready, when nothing else is awaited).
  const moved = input.value ? await settleReassembly({ shopId: job.shopId, jobId: job.id, userId: actor.userId }) : null;
  return { job, jobMovedTo: moved?.to ?? null };
}

export async function markStepReplaced(actor: Actor, { job }: JobAccess, input: { step: number; value: boolean }) {
  found(await setStepReplaced({ shopId: job.shopId, jobId: job.id, stepId: input.step, replaced: input.value }));
  return { job };
}
