// Teardown log → reassembly checklist. What came off last goes back on first, so the checklist
// is the removal log played backwards, each step carrying what the technician noted on the way
// out and, where a torque spec was entered for that group, the torque, pattern and passes.
import { AppError } from "@/lib/errors";
import { DEFAULT_PASS_PERCENTS, passSchedule, type PassRow } from "@/lib/tightening-passes";
import { crossPatternOrder, supportsCrossPattern } from "@/lib/tightening-order";
import { allUnits, type TorqueUnit } from "@/lib/torque";
import type { Lubrication } from "@/lib/torque-special";

export type StepId = number | string;

export type TorqueSpec = {
  value: number;
  unit: TorqueUnit;
  boltCount?: number | null;
  passPercents?: readonly number[];
  /** Issue 18 §4: degrees turned after the torque, thread lubrication, one-time (torque-to-yield) fasteners. */
  angleStages?: readonly number[] | null;
  lubrication?: Lubrication | null;
  oneTime?: boolean | null;
  /** Migration 32: what "other" was on the threads, and loosen-and-retorque with its sequence. */
  lubricationOther?: string | null;
  loosenRetorque?: boolean | null;
  retorqueSequence?: string | null;
};

export type TeardownStep = {
  id: StepId;
  /** Removal order as logged; ties keep the order they were given in. */
  seq: number;
  removed: string;
  count?: number | null;
  size?: string | null;
  notes?: string | null;
  storage?: string | null;
  photoIds?: readonly StepId[] | null;
  torqueSpec?: TorqueSpec | null;
};

export type ChecklistTorque = {
  value: number;
  unit: TorqueUnit;
  valueIn: Record<TorqueUnit, number>;
  boltCount: number | null;
  /** Cross-pattern bolt order, or null when no bolt count was given or it has no pattern (e.g. 2). */
  tighteningOrder: number[] | null;
  passes: PassRow[];
  angleStages: number[];
  lubrication: Lubrication | null;
  oneTime: boolean;
  lubricationOther: string | null;
  loosenRetorque: boolean;
  retorqueSequence: string | null;
};

export type ChecklistItem = {
  /** The teardown step's id: ticks are stored against it. */
  id: StepId;
  /** 1-based position in the reassembly checklist. */
  position: number;
  seq: number;
  removed: string;
  count: number | null;
  size: string | null;
  notes: string | null;
  storage: string | null;
  photoIds: readonly StepId[];
  torque: ChecklistTorque | null;
  /** The step's fasteners are one-time (torque-to-yield): "replace with new" on the item. */
  replaceWithNew: boolean;
};

function checklistTorque(step: TeardownStep, spec: TorqueSpec): ChecklistTorque {
  const boltCount = spec.boltCount ?? null;
  if (boltCount !== null && (!Number.isInteger(boltCount) || boltCount < 1)) {
    throw new AppError("invalid", `Step "${step.removed}": the bolt count must be a whole number, at least 1 (got ${boltCount}).`);
  }
  return {
    value: spec.value,
    unit: spec.unit,
    valueIn: allUnits(spec.value, spec.unit),
    boltCount,
    tighteningOrder: boltCount !== null && supportsCrossPattern(boltCount) ? crossPatternOrder(boltCount) : null,
    passes: passSchedule(spec.value, spec.unit, spec.passPercents ?? DEFAULT_PASS_PERCENTS),
    angleStages: [...(spec.angleStages ?? [])],
    lubrication: spec.lubrication ?? null,
    oneTime: spec.oneTime === true,
    lubricationOther: spec.lubricationOther ?? null,
    loosenRetorque: spec.loosenRetorque === true,
    retorqueSequence: spec.retorqueSequence ?? null,
  };
}

export function reassemblyChecklist(steps: readonly TeardownStep[]): ChecklistItem[] {
  const seen = new Set<string>();
  for (const step of steps) {
    if (!Number.isFinite(step.seq)) {
      throw new AppError("invalid", `Step "${step.removed}" has no valid removal order (got ${step.seq}).`);
    }
    if (seen.has(String(step.id))) throw new AppError("invalid", `Teardown step ${String(step.id)} appears twice.`);
    seen.add(String(step.id));
  }
  // Removal order is a stable ascending sort by seq (Array.prototype.sort is stable); the exact
  // reverse of it is the reassembly order, so of two steps logged with the same seq the one
  // listed later goes back first.
  const removalOrder = [...steps].sort((a, b) => a.seq - b.seq);
  return removalOrder.reverse().map((step, i) => ({
    id: step.id,
    position: i + 1,
    seq: step.seq,
    removed: step.removed,
    count: step.count ?? null,
    size: step.size ?? null,
    notes: step.notes ?? null,
    storage: step.storage ?? null,
    photoIds: step.photoIds ?? [],
    torque: step.torqueSpec ? checklistTorque(step, step.torqueSpec) : null,
    replaceWithNew: step.torqueSpec?.oneTime === true,
  }));
}

/** Share of checklist items ticked off. Ticks for ids no longer on the list are ignored. */
export function checklistProgress(
  items: readonly { id: StepId }[],
  doneIds: Iterable<StepId>,
): { done: number; total: number; percent: number } {
  // Compared as text: ids from a form arrive as strings, ids from the database as numbers.
  const ticked = new Set(Array.from(doneIds, String));
  const total = items.length;
  const done = items.filter((item) => ticked.has(String(item.id))).length;
  // Floor, so the owner never sees 100 % while a step is still open.
  return { done, total, percent: total === 0 ? 0 : Math.floor((done * 100) / total) };
}
