// Teardown steps change with a trail (issue 18 §7): each edit, torque change or delete keeps the
// step as it was, and the bench page says who changed what, when, and what it was before.
// Pure: no I/O, safe in the browser and on the server.
import { type JobStatus, collectedJobRefusal } from "@/lib/job-status";
import { type TorqueUnit, isTorqueUnit } from "@/lib/torque";
import { type Lubrication, isLubrication, stepTorqueNote } from "@/lib/torque-special";

/** What a teardown step says, as history shows it (the columns a person typed). */
export type StepSnapshot = {
  removed: string;
  count: number | null;
  size: string | null;
  notes: string | null;
  storage: string | null;
  /** note: angle stages, lubrication, one-time (migration 27) in words, or null. */
  torque: { value: number; unit: TorqueUnit; boltCount: number | null; note: string | null } | null;
};

export type StepChangeKind = "edit" | "torque" | "delete";

/** One change: the step as it was before it, who made it and when. */
export type StepRevision = { stepId: number; seq: number; version: number; change: StepChangeKind; previous: StepSnapshot; by: string | null; at: string };

/**
 * Once the owner has collected the machine the job is closed (lib/job-status.ts: a comeback is a
 * new job), so the log they took home with it no longer changes. Null: changes are allowed.
 */
export function teardownLockReason(status: JobStatus): string | null {
  return collectedJobRefusal(status, "its teardown log is closed");
}

/** Angle stages as stored: JSON text of degrees, e.g. "[90,90]". */
function angles(v: unknown): number[] {
  try {
    const list: unknown = typeof v === "string" ? JSON.parse(v) : v;
    return Array.isArray(list) ? list.filter((d): d is number => typeof d === "number") : [];
  } catch {
    return [];
  }
}

const num = (v: unknown) => (v == null || v === "" ? null : Number(v));
const str = (v: unknown) => (v == null ? null : String(v));

/** A stored step row (teardown_steps columns, as kept in teardown_step_revisions.previous). */
export function snapshotOfRow(row: Record<string, unknown>): StepSnapshot {
  const unit = row.torque_unit;
  return {
    removed: String(row.removed ?? ""),
    count: num(row.count),
    size: str(row.size),
    notes: str(row.notes),
    storage: str(row.storage_label),
    torque:
      row.torque_value == null || !isTorqueUnit(unit)
        ? null
        : {
            value: Number(row.torque_value),
            unit,
            boltCount: num(row.torque_bolt_count),
            // Columns a row from before migration 27 / 32 lacks read as "not recorded".
            note: stepTorqueNote({
              angleStages: angles(row.torque_angle_stages),
              lubrication: isLubrication(row.torque_lubrication) ? row.torque_lubrication : null,
              lubricationOther: str(row.torque_lubrication_other),
              loosenRetorque: Boolean(row.torque_loosen_retorque),
              retorqueSequence: str(row.torque_retorque_sequence),
              oneTime: Boolean(row.torque_one_time),
            }),
          },
  };
}

const quoted = (s: string | null) => (s == null ? "empty" : `“${s}”`);
const torqueWords = (t: StepSnapshot["torque"], label: (v: number, u: TorqueUnit) => string) =>
  t ? `${label(t.value, t.unit)}${t.boltCount ? `, ${t.boltCount} bolts` : ""}${t.note ? `, ${t.note}` : ""}` : "none";

/**
 * What a change replaced, field by field: "count was 8 (now 9)". `next` is the step right after
 * the change (the following revision's previous state, or the step as it stands); null for a
 * delete, which lists nothing here (the caller shows the whole step as it was).
 */
export function changedFields(previous: StepSnapshot, next: StepSnapshot | null, torqueLabel: (v: number, u: TorqueUnit) => string): string[] {
  if (!next) return [];
  const out: string[] = [];
  const text = (label: string, a: string | null, b: string | null) => {
    if (a !== b) out.push(`${label} was ${quoted(a)} (now ${quoted(b)})`);
  };
  text("what came off", previous.removed, next.removed);
  if (previous.count !== next.count) out.push(`count was ${previous.count ?? "empty"} (now ${next.count ?? "empty"})`);
  text("size", previous.size, next.size);
  text("notes", previous.notes, next.notes);
  text("kept in", previous.storage, next.storage);
  const [a, b] = [torqueWords(previous.torque, torqueLabel), torqueWords(next.torque, torqueLabel)];
  if (a !== b) out.push(`torque was ${a} (now ${b})`);
  return out;
}

/** Revisions of one step, oldest first, each paired with the state that followed it. */
export function stepTrail(revisions: readonly StepRevision[], current: StepSnapshot | null): { revision: StepRevision; next: StepSnapshot | null }[] {
  const ordered = [...revisions].sort((x, y) => x.version - y.version);
  return ordered.map((revision, i) => ({ revision, next: revision.change === "delete" ? null : (ordered[i + 1]?.previous ?? current) }));
}

type ListedTorque = { value: number; unit: TorqueUnit; boltCount: number | null; angleStages?: readonly number[] | null; lubrication?: Lubrication | null; oneTime?: boolean | null };
/** A listed step (db/queries/bench.ts TeardownRow) as history compares it. */
export function snapshotOfStep(s: Omit<StepSnapshot, "torque"> & { torque: ListedTorque | null }): StepSnapshot {
  const t = s.torque;
  return { removed: s.removed, count: s.count, size: s.size, notes: s.notes, storage: s.storage, torque: t ? { value: t.value, unit: t.unit, boltCount: t.boltCount, note: stepTorqueNote(t) } : null };
}

/** The number the next logged step gets: one past the highest ever logged, deleted steps included. */
export function nextStepSeq(steps: readonly { seq: number }[], revisions: readonly { seq: number }[]): number {
  return Math.max(0, ...steps.map((s) => s.seq), ...revisions.map((r) => r.seq)) + 1;
}
