import "server-only";
import { claimSetFinding, discardUnclaimedDraft, insertMeasurementSet, listMeasurementSets } from "@/db/queries/measurements";
import { AppError } from "@/lib/errors";
import { type ItemLimit, type JudgedItem, MEASUREMENT_KIND_INFO, type MeasurementSetBody, type Typed, type ValveSide, findingFromSet, isOut, itemKey, judgeItem, rowField } from "@/lib/measurements";
import type { NumberStyle } from "@/lib/number-input";
import type { Actor } from "@/lib/permissions";
import type { MeasurementSetInput } from "@/lib/schemas/measurements";
import { type NumberInput, readMeasuredField } from "@/lib/schemas/number";
import type { JobAccess } from "@/lib/server/access";
import { shopNumberStyle } from "@/lib/server/bench";
import { createFinding } from "@/lib/server/findings";
import { refuseIfCollected } from "@/lib/server/open-job";

// Measurement sets from the bench page: every number read by the one parser in the shop's style
// (never below zero, decimals kept), every item judged by the reading rule, the set written whole
// with its timeline entry. "Draft a finding" turns a set with an item out of limit into a draft
// finding through the findings code, its text carrying each value with its limit, source and verdict.

const say = (field: string, message: string) => new AppError("invalid", message, { [field]: [message] });

/** A measured size or a limit as typed: 0 or more, at most 6 decimals (DECIMAL(16,6)), its resolution kept. */
function readTyped(field: string, input: NumberInput, style: NumberStyle, what: string): Typed {
  const read = readMeasuredField(field, input, style, { what, min: 0, max: 1_000_000, maxDecimals: 6 });
  const decimals = read.decimals ?? Math.min(6, (String(read.value).split(".")[1] ?? "").length);
  return { value: read.value, decimals };
}
const readOptTyped = (field: string, input: NumberInput | null | undefined, style: NumberStyle, what: string) =>
  input == null || input === "" ? null : readTyped(field, input, style, what);

/** `side`: "Intake" / "Exhaust" on a valve set, null for the set's one limit. */
function readLimit(minField: string, maxField: string, input: { min: NumberInput | null; max: NumberInput | null }, style: NumberStyle, side: string | null): ItemLimit {
  const [minName, maxName] = side ? [`The ${side.toLowerCase()} minimum`, `the ${side.toLowerCase()} maximum`] : ["The minimum", "the maximum"];
  const limit = { min: readOptTyped(minField, input.min, style, minName), max: readOptTyped(maxField, input.max, style, maxName.replace(/^t/, "T")) };
  if (limit.min && limit.max && limit.min.value > limit.max.value) throw say(minField, `${minName} can’t be above ${maxName}.`);
  return limit;
}

/** What recordMeasurementSet takes: the form's fields as posted, or numbers from code. */
export type MeasurementSetData = Omit<MeasurementSetInput, "min" | "max" | "exhaustMin" | "exhaustMax" | "rows"> & {
  min: NumberInput | null;
  max: NumberInput | null;
  exhaustMin: NumberInput | null;
  exhaustMax: NumberInput | null;
  rows: (Omit<MeasurementSetInput["rows"][number], "value" | "oldShim"> & { value: NumberInput; oldShim: NumberInput | null })[];
};

/** Reads, judges and stores a set; refuses the whole set (nothing written) on any bad field. */
export async function recordMeasurementSet(actor: Actor, { job }: JobAccess, input: MeasurementSetData) {
  refuseIfCollected(job);
  const style = await shopNumberStyle(job.shopSlug);
  const info = MEASUREMENT_KIND_INFO[input.kind];
  const unit = input.unit ?? info.units[0]!;
  if (!info.units.includes(unit)) throw say("unit", `${info.title} is recorded in ${info.units.join(", ")}.`);
  if (!input.rows.length) throw say(rowField("value", 0), "Enter at least one measurement.");
  const valves = input.kind === "valve_clearance";

  const limits: Record<ValveSide | "all", ItemLimit> = {
    intake: readLimit("min", "max", input, style, valves ? "Intake" : null),
    exhaust: valves ? readLimit("exhaustMin", "exhaustMax", { min: input.exhaustMin, max: input.exhaustMax }, style, "Exhaust") : { min: null, max: null },
    all: { min: null, max: null },
  };
  limits.all = limits.intake;
  if (!valves && !limits.all.min && !limits.all.max) throw say("min", "Type the limit from the maker's manual: a minimum, a maximum or both.");

  const items: JudgedItem[] = [];
  const seen = new Set<string>();
  for (const row of input.rows) {
    const value = readTyped(rowField("value", row.row), row.value, style, "The measurement");
    let item: JudgedItem;
    if (valves) {
      if (row.cylinder == null) throw say(rowField("cyl", row.row), "Say which cylinder this valve is on.");
      if (row.side == null) throw say(rowField("side", row.row), "Choose intake or exhaust.");
      const limit = limits[row.side];
      if (!limit.min || !limit.max) {
        const field = row.side === "intake" ? (limit.min ? "max" : "min") : limit.min ? "exhaustMax" : "exhaustMin";
        throw say(field, `Type the ${row.side} clearance range from the maker's manual (minimum and maximum): the shim arithmetic aims for its middle.`);
      }
      const oldShim = readOptTyped(rowField("shim", row.row), row.oldShim, style, "The old shim");
      item = judgeItem({ label: "", value, limit, unit, valve: { cylinder: row.cylinder, side: row.side, position: row.label, oldShim } });
    } else {
      const label = row.label ?? info.item(row.row + 1);
      item = judgeItem({ label, value, limit: limits.all, unit, valve: null });
    }
    const key = itemKey(item.label, item.valve);
    if (seen.has(key)) throw say(rowField("label", row.row), `“${item.label}” is already in this set: name each ${valves ? "valve's position" : "item"} once.`);
    seen.add(key);
    items.push(item);
  }

  const body: MeasurementSetBody = { measurementSet: { kind: input.kind, title: info.title, unit, source: input.source, note: input.note }, items };
  const made = await insertMeasurementSet({ shopId: job.shopId, jobId: job.id, userId: actor.userId, body });
  return { ...made, job, out: items.filter((i) => isOut(i.verdict)).length };
}

/**
 * A draft finding from a set with an item out of limit (the findings code drafts it, so it is
 * checked and stored like any other). Once per set: a second call answers the finding already drafted.
 */
export async function draftFindingFromSet(actor: Actor, found: JobAccess, setId: number): Promise<{ findingId: number; created: boolean; job: JobAccess["job"] }> {
  const { job } = found;
  const [set] = await listMeasurementSets({ shopId: job.shopId, jobId: job.id, setId });
  if (!set) throw new AppError("not_found", "That measurement set isn't on this job.");
  if (set.findingId != null) return { findingId: set.findingId, created: false, job };
  const items = set.items.map((i) => judgeItem({ label: i.label, value: i.value, limit: i.limit, unit: set.unit, valve: i.valve }));
  if (!items.some((i) => isOut(i.verdict))) throw new AppError("invalid", "Every item of this set is within its limit: there is nothing to draft a finding about.");
  const text = findingFromSet({ measurementSet: { kind: set.kind, title: set.title, unit: set.unit, source: set.source, note: set.note }, items });
  const made = await createFinding(actor, found, { ...text, evidence: [], lines: [] });
  if (await claimSetFinding({ shopId: job.shopId, jobId: job.id, setId, findingId: made.id })) return { findingId: made.id, created: true, job };
  // Someone drafted from this set at the same moment: keep theirs, drop ours.
  await discardUnclaimedDraft({ shopId: job.shopId, jobId: job.id, findingId: made.id });
  const [now] = await listMeasurementSets({ shopId: job.shopId, jobId: job.id, setId });
  return { findingId: now!.findingId!, created: false, job };
}
