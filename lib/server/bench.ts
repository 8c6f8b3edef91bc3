import "server-only";
import { settleReassembly } from "@/db/queries/workflow";
import { getBenchSettings, insertReading, insertTeardownStep, insertTorqueRecord, jobHasPhoto, listTeardownSteps, setStepChecked, setStepReplaced, setStepTorque } from "@/db/queries/bench";
import { getShopBySlug } from "@/db/queries/shops";
import type { ReadingBody, ReadingDecimals, TorqueBody } from "@/lib/bench";
import { type NumberStyle, numberStyleFor } from "@/lib/number-input";
import { chainCheck } from "@/lib/chain-wear";
import { AppError } from "@/lib/errors";
import type { Actor } from "@/lib/permissions";
import { evaluateReading } from "@/lib/readings";
import { formatFixed, roundHalfUp } from "@/lib/rounding";
import type { ChainReadingInput, ReadingInput, TeardownStepInput, TorqueRecordInput } from "@/lib/schemas/bench";
import { type NumberInput, readMeasuredField, readNumberField, readOptMeasuredField, readOptNumberField } from "@/lib/schemas/number";
import type { JobAccess } from "@/lib/server/access";
import { refuseIfCollected } from "@/lib/server/open-job";
import { passSchedule } from "@/lib/tightening-passes";
import { supportsCrossPattern } from "@/lib/tightening-order";
import { type TorqueUnit, convertTorque, torqueUnitLabel } from "@/lib/torque";
import { WRENCH_CLASSES } from "@/lib/torque-check";
import { stepFastener, torqueAngleWarning } from "@/lib/torque-special";
import { type StepExtrasInput, type TorqueExtrasInput, readStepTorqueExtras, readTorqueExtras } from "@/lib/server/torque-special";

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

/** The convention the shop's people type numbers in (lib/number-input.ts). */
export async function shopNumberStyle(shopSlug: string): Promise<NumberStyle> {
  return numberStyleFor((await getShopBySlug({ slug: shopSlug }))?.currency);
}

/**
 * No powersports or small-engine fastener comes near 2,000 N·m (the largest axle and clutch nuts
 * are a few hundred) — common trade practice, no published source. Above it is a typing slip.
 */
const MAX_TORQUE_NM = 2000;
function readTorque(field: string, input: NumberInput, unit: TorqueUnit, style: NumberStyle, what: string): number {
  // Three decimals: what the column keeps (DECIMAL(10,3)); more would be rounded without a word.
  const value = readNumberField(field, input, style, { what, min: 0, max: 1_000_000, maxDecimals: 3 });
  const say = (message: string) => new AppError("invalid", message, { [field]: [message] });
  if (value === 0) throw say(`${what} can’t be 0${field === "appliedValue" ? ": leave it empty if it wasn’t measured" : ""}.`);
  if (convertTorque(value, unit, "nm") > MAX_TORQUE_NM) {
    throw say(`${what} of ${value} ${torqueUnitLabel(unit)} is over ${MAX_TORQUE_NM} N·m, more than any fastener on these machines: check the number and the unit.`);
  }
  return value;
}

/** What recordTorque takes: the form's fields as typed (text), or numbers from code. */
export type TorqueRecordData = Omit<TorqueRecordInput, "specValue" | "appliedValue" | "tolerancePct" | "wrenchClass" | "passesDone" | "checkPass" | "plausibleChecked" | keyof TorqueExtrasInput> & TorqueExtrasInput & {
  specValue: NumberInput;
  appliedValue: NumberInput | null;
  tolerancePct?: NumberInput | null;
  wrenchClass?: TorqueRecordInput["wrenchClass"];
  passesDone?: boolean;
  checkPass?: boolean;
  plausibleChecked?: boolean;
};

export async function recordTorque(actor: Actor, { job }: JobAccess, input: TorqueRecordData) {
  refuseIfCollected(job);
  const settings = await getBenchSettings({ shopId: job.shopId });
  const shop = await getShopBySlug({ slug: job.shopSlug });
  const style = numberStyleFor(shop?.currency);
  const passPercents = input.passes ?? settings.passPercents;
  const specValue = readTorque("specValue", input.specValue, input.unit, style, "Spec torque");
  const appliedValue = input.appliedValue == null || input.appliedValue === "" ? null : readTorque("appliedValue", input.appliedValue, input.unit, style, "Applied torque");
  // The wrench named on the record, else the shop's usual one (bench settings).
  const wrenchClass = input.wrenchClass ?? settings.wrenchClass;
  const tolerancePct =
    readOptNumberField("tolerancePct", input.tolerancePct, style, { what: "The tolerance (%)", min: 0.5, max: 25, maxDecimals: 2 }) ?? WRENCH_CLASSES[wrenchClass].tolerancePct;
  // The wrench's serial, calibration (a future date refused, in the shop's time zone) and maximum; angle, lubrication…
  const extras = readTorqueExtras(input, input.unit, style, shop?.timezone ?? "UTC");
  // Only a warning: a value the maker's manual gives is never refused, once someone has looked.
  const warning = torqueAngleWarning(specValue, input.unit, input.fastener, extras.angleStages ?? []);
  if (warning && !input.plausibleChecked) {
    const message = `${warning}. Check the number and the unit against the maker's manual; if it is right, tick “Value checked” and log it again.`;
    throw new AppError("invalid", message, { specValue: [message] });
  }
  const body: TorqueBody = {
    fastener: input.fastener,
    specValue,
    unit: input.unit,
    appliedValue,
    tool: input.tool,
    passPercents,
    boltCount: input.boltCount,
    pattern: checkTorque(specValue, input.unit, passPercents, input.boltCount),
    note: input.note,
    displayUnit: settings.torqueUnit,
    tolerancePct,
    wrenchClass,
    passesDone: input.passesDone ?? false,
    checkPass: input.checkPass ?? false,
    warning,
    ...extras,
  };
  const made = await insertTorqueRecord({ shopId: job.shopId, jobId: job.id, userId: actor.userId, visibility: input.share ? "shared" : "shop", body });
  return { ...made, job };
}

type Numbers<T, K extends keyof T> = Omit<T, K> & { [P in K]: T[P] extends string ? NumberInput : NumberInput | null };
/**
 * decimals (optional, for callers passing numbers): the resolution to keep for each number. Text
 * from a form carries its own ("0.20" → 2); a number passed without it is shown as before.
 */
export type ReadingData = Numbers<ReadingInput, "value" | "min" | "max"> & { decimals?: Partial<ReadingDecimals> };

/** A temperature (a coolant's freeze point, say) is the one kind of reading that can be below zero. */
const TEMPERATURE_UNIT = /^\s*(?:°|º|deg\s*)?\s*[CF]\s*$/i;

/** A measured size or its limit: read with its resolution, never below zero (a temperature aside). */
function readMeasure(field: string, input: NumberInput, style: NumberStyle, what: string, unit: string | null | undefined) {
  // Six decimals: what the columns keep (DECIMAL(16,6)).
  const read = readMeasuredField(field, input, style, { what, min: -1_000_000, max: 1_000_000, allowNegative: true, maxDecimals: 6 });
  if (read.value < 0 && !TEMPERATURE_UNIT.test(unit ?? "")) {
    const message = `${what} can’t be below zero: a thickness, a clearance, a length or a pad measures 0 or more (only a temperature in °C or °F can be). Type it without a minus sign.`;
    throw new AppError("invalid", message, { [field]: [message] });
  }
  return read;
}

export async function recordReading(actor: Actor, { job }: JobAccess, input: ReadingData) {
  refuseIfCollected(job);
  const style = await shopNumberStyle(job.shopSlug);
  const value = readMeasure("value", input.value, style, "The reading", input.unit);
  const min = input.min == null || input.min === "" ? null : readMeasure("min", input.min, style, "The minimum", input.unit);
  const max = input.max == null || input.max === "" ? null : readMeasure("max", input.max, style, "The maximum", input.unit);
  const decimals: ReadingDecimals = {
    value: input.decimals?.value ?? value.decimals,
    min: min ? (input.decimals?.min ?? min.decimals) : null,
    max: max ? (input.decimals?.max ?? max.decimals) : null,
  };
  const resolution = Math.max(decimals.value ?? 0, decimals.min ?? 0, decimals.max ?? 0);
  const result = onField("min", () => evaluateReading({ value: value.value, min: min?.value, max: max?.value, unit: input.unit, decimals: resolution }));
  const body: ReadingBody = {
    label: input.label,
    value: value.value,
    unit: input.unit,
    min: min?.value ?? null,
    max: max?.value ?? null,
    source: input.source,
    verdict: result.verdict,
    marginText: result.marginText ?? null,
    chain: null,
    decimals,
  };
  return { ...(await insertReading({ shopId: job.shopId, jobId: job.id, userId: actor.userId, body })), job };
}

/**
 * Chain wear over N pitches → elongation % as the reading, the limit as its maximum: the shop's
 * (or typed) limit, or 200/N % when a large sprocket's tooth count makes that tighter.
 * sprocketTeeth and countChecked are optional for callers from before they existed.
 */
export type ChainReadingData = Omit<Numbers<ChainReadingInput, "pitchMm" | "measuredMm" | "limitPct">, "sprocketTeeth" | "countChecked"> & {
  sprocketTeeth?: number | null;
  countChecked?: boolean;
};
export async function recordChainReading(actor: Actor, { job }: JobAccess, input: ChainReadingData) {
  refuseIfCollected(job);
  const style = await shopNumberStyle(job.shopSlug);
  const pitchMm = readNumberField("pitchMm", input.pitchMm, style, { what: "The chain pitch (mm)", min: 1, max: 100 });
  const measuredMm = readNumberField("measuredMm", input.measuredMm, style, { what: "The measured length (mm)", min: 1, max: 100_000 });
  const typedLimit = readOptMeasuredField("limitPct", input.limitPct, style, { what: "The wear limit (%)", min: 0.1, max: 50, maxDecimals: 2 });
  const shopLimitPct = typedLimit?.value ?? (await getBenchSettings({ shopId: job.shopId })).chainLimitPct;
  const sprocketTeeth = input.sprocketTeeth ?? null;
  const check = onField("measuredMm", () => chainCheck({ pitchMm, pitches: input.pitches, measuredMm, limitPct: shopLimitPct, sprocketTeeth }));
  if (check.maybeMiscounted && !input.countChecked) {
    const n = input.pitches;
    const message = `${measuredMm} mm is past the limit over ${n} pitches, but is a chain within its limit over ${n + 1}. Count again: pitches = pins − 1 (${n + 2} pins span ${n + 1} pitches). If ${n} is right, tick “Pitch count checked” and log it again.`;
    throw new AppError("invalid", message, { pitches: [message] });
  }
  const limitPct = check.limitPct;
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
    chain: { pitchMm, pitches: input.pitches, measuredMm, limitPct, sprocketTeeth, shopLimitPct },
    // The stretch as the helper shows it (2 decimals); the typed limit at its own, 200/N as computed.
    decimals: { value: 2, min: null, max: limitPct === shopLimitPct ? (typedLimit?.decimals ?? null) : null },
  };
  return { ...(await insertReading({ shopId: job.shopId, jobId: job.id, userId: actor.userId, body })), job, check };
}

export async function addTeardownStep(actor: Actor, { job }: JobAccess, input: TeardownStepInput) {
  refuseIfCollected(job);
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

/** Issue 18 §3–4: angle stages, lubrication and one-time fasteners; the plausibility check as on a torque record. */
type StepTorqueExtras = StepExtrasInput & { plausibleChecked?: boolean };
export async function setTeardownTorque(actor: Actor, { job }: JobAccess, input: { step: number; torqueValue: NumberInput; torqueUnit: TorqueUnit; boltCount: number | null } & StepTorqueExtras) {
  const settings = await getBenchSettings({ shopId: job.shopId });
  const style = await shopNumberStyle(job.shopSlug);
  const value = readTorque("torqueValue", input.torqueValue, input.torqueUnit, style, "Torque");
  checkTorque(value, input.torqueUnit, settings.passPercents, input.boltCount);
  const step = (await listTeardownSteps({ shopId: job.shopId, jobId: job.id })).find((s) => s.id === input.step);
  found(!!step);
  const extras = readStepTorqueExtras(input, style);
  const warning = torqueAngleWarning(value, input.torqueUnit, stepFastener(step!), extras.angleStages ?? []);
  if (warning && !input.plausibleChecked) {
    const message = `${warning}. Check the number and the unit against the maker's manual; if it is right, tick “Value checked” and save it again.`;
    throw new AppError("invalid", message, { torqueValue: [message] });
  }
  found(await setStepTorque({ shopId: job.shopId, jobId: job.id, stepId: input.step, userId: actor.userId, torque: { value, unit: input.torqueUnit, boltCount: input.boltCount, ...extras } }));
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
