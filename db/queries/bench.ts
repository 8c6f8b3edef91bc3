import "server-only";
import type { Knex } from "knex";
import { insertEntry } from "@/db/queries/entries";
import { type BenchSettings, DEFAULT_BENCH_SETTINGS, type StepTorque, type ChainSnapshot, type ReadingBody, type TeardownBody, type TorqueBody } from "@/lib/bench";
import type { EntryVisibility } from "@/lib/journal";
import { checklistProgress } from "@/lib/reassembly";
import { db } from "@/db/client";
import type { JournalEntriesTable, Nullable, PhotosTable, ReadingsTable, TeardownStepsTable, TorqueRecordsTable, UsersTable } from "@/db/tables";
import { transaction } from "@/db/transaction";
import type { TorqueUnit } from "@/lib/torque";
import { isWrenchClass } from "@/lib/torque-check";
import { isLubrication } from "@/lib/torque-special";
import { torqueExtraColumns, torqueExtrasOf } from "./torque-special";
import { reviseTeardownStep } from "./teardown-history";

// Torque records, readings and the teardown log. Every record that reaches the timeline is
// written together with its entry in one transaction: both or neither.

type JobKey = { shopId: number; jobId: number };
const num = (v: unknown) => (v == null ? null : Number(v));
const str = (v: unknown) => (v == null ? null : String(v));
const iso = (v: unknown) => (v == null ? null : (v as Date).toISOString());
const json = (v: unknown): unknown => (typeof v === "string" ? JSON.parse(v) : (v ?? null));

export async function getBenchSettings({ shopId }: { shopId: number }, k: Knex = db()): Promise<BenchSettings> {
  const row = await k("shop_bench_settings").where({ shop_id: shopId }).first();
  if (!row) return { ...DEFAULT_BENCH_SETTINGS, passPercents: [...DEFAULT_BENCH_SETTINGS.passPercents] };
  return {
    torqueUnit: row.torque_unit,
    passPercents: json(row.pass_percents) as number[],
    chainLimitPct: Number(row.chain_limit_pct),
    wrenchClass: isWrenchClass(row.wrench_class) ? row.wrench_class : DEFAULT_BENCH_SETTINGS.wrenchClass,
  };
}

export async function saveBenchSettings({ shopId, settings }: { shopId: number; settings: BenchSettings }, k: Knex = db()): Promise<void> {
  const row = { torque_unit: settings.torqueUnit, pass_percents: JSON.stringify(settings.passPercents), chain_limit_pct: settings.chainLimitPct, wrench_class: settings.wrenchClass, updated_at: k.fn.now() };
  await k("shop_bench_settings").insert({ shop_id: shopId, ...row }).onConflict("shop_id").merge(row);
}

/**
 * Writes a timeline entry and then its record row (which points at it), in the caller's
 * transaction: `insertRecord` gets the row's job and entry columns and inserts the rest.
 */
async function withEntry(
  tx: Knex.Transaction,
  e: JobKey & { kind: "torque" | "reading" | "teardown"; userId: number; visibility: EntryVisibility; body: unknown },
  insertRecord: (keys: { shop_id: number; job_id: number; entry_id: number }) => Promise<number[]>,
) {
  const entryId = await insertEntry(tx, { shopId: e.shopId, jobId: e.jobId, kind: e.kind, authorId: e.userId, visibility: e.visibility, body: e.body });
  const [id] = await insertRecord({ shop_id: e.shopId, job_id: e.jobId, entry_id: entryId });
  return { id: Number(id), entryId };
}

export async function insertTorqueRecord(p: JobKey & { userId: number; visibility: EntryVisibility; body: TorqueBody }) {
  const b = p.body;
  return transaction((tx) =>
    withEntry(tx, { ...p, kind: "torque" }, (keys) =>
      tx("torque_records").insert({
        ...keys,
        fastener: b.fastener,
        spec_value: b.specValue,
        unit: b.unit,
        applied_value: b.appliedValue,
        tool: b.tool,
        pass_percents: JSON.stringify(b.passPercents),
        bolt_count: b.boltCount,
        note: b.note,
        tolerance_pct: b.tolerancePct ?? null,
        wrench_class: b.wrenchClass ?? null,
        passes_done: b.passesDone ?? null,
        check_pass_done: b.checkPass ?? null,
        ...torqueExtraColumns(b),
        recorded_by_user_id: p.userId,
      }),
    ),
  );
}

export type TorqueRecordRow = TorqueBody & {
  id: number;
  entry: { id: number; visibility: EntryVisibility; version: number } | null;
  byUserId: number | null;
  by: string | null;
  at: string;
};

export async function listTorqueRecords({ shopId, jobId }: JobKey): Promise<TorqueRecordRow[]> {
  // The entry's columns are null when it was deleted (left join).
  type Row = TorqueRecordsTable & Nullable<Pick<JournalEntriesTable, "visibility" | "version" | "body">> & { by_name: UsersTable["name"] | null };
  const rows: Row[] = await db()("torque_records as r")
    .leftJoin("journal_entries as e", (j) => j.on("e.id", "r.entry_id").andOnNull("e.deleted_at"))
    .leftJoin("users as u", "u.id", "r.recorded_by_user_id")
    .where({ "r.shop_id": shopId, "r.job_id": jobId })
    .orderBy("r.id", "desc")
    .select("r.*", "e.visibility", "e.version", "e.body", "u.name as by_name");
  return rows.map((r) => {
    const body = json(r.body) as Partial<TorqueBody> | null;
    return {
      id: Number(r.id),
      fastener: String(r.fastener),
      specValue: Number(r.spec_value),
      unit: r.unit,
      appliedValue: num(r.applied_value),
      tool: str(r.tool),
      passPercents: json(r.pass_percents) as number[],
      boltCount: num(r.bolt_count),
      pattern: body?.pattern ?? null,
      note: str(r.note),
      displayUnit: body?.displayUnit ?? r.unit,
      tolerancePct: r.tolerance_pct == null ? undefined : Number(r.tolerance_pct),
      wrenchClass: isWrenchClass(r.wrench_class) ? r.wrench_class : null,
      passesDone: r.passes_done == null ? null : Boolean(r.passes_done),
      checkPass: r.check_pass_done == null ? null : Boolean(r.check_pass_done),
      warning: body?.warning ?? null,
      ...torqueExtrasOf(r),
      entry: r.version == null || r.visibility == null ? null : { id: Number(r.entry_id), visibility: r.visibility, version: Number(r.version) },
      byUserId: num(r.recorded_by_user_id),
      by: str(r.by_name),
      at: iso(r.created_at)!,
    };
  });
}

export async function insertReading(p: JobKey & { userId: number; body: ReadingBody }) {
  const b = p.body;
  return transaction((tx) =>
    withEntry(tx, { ...p, kind: "reading", visibility: "shop" }, (keys) =>
      tx("readings").insert({
        ...keys,
        label: b.label,
        value: b.value,
        unit: b.unit,
        min_value: b.min,
        max_value: b.max,
        source: b.source,
        verdict: b.verdict,
        chain: b.chain ? JSON.stringify(b.chain) : null,
        value_decimals: b.decimals?.value ?? null,
        min_decimals: b.decimals?.min ?? null,
        max_decimals: b.decimals?.max ?? null,
        recorded_by_user_id: p.userId,
      }),
    ),
  );
}

export type ReadingRow = Omit<ReadingBody, "marginText"> & { id: number; by: string | null; at: string };

function toReading(r: ReadingsTable & { by_name: string | null }): ReadingRow {
  return {
    id: Number(r.id),
    label: String(r.label),
    value: Number(r.value),
    unit: str(r.unit),
    min: num(r.min_value),
    max: num(r.max_value),
    source: str(r.source),
    verdict: r.verdict,
    chain: json(r.chain) as ChainSnapshot | null,
    decimals: { value: num(r.value_decimals), min: num(r.min_decimals), max: num(r.max_decimals) },
    by: str(r.by_name),
    at: iso(r.created_at)!,
  };
}

export async function listReadings({ shopId, jobId }: JobKey): Promise<ReadingRow[]> {
  const rows: (ReadingsTable & { by_name: string | null })[] = await db()("readings as r")
    .leftJoin("users as u", "u.id", "r.recorded_by_user_id")
    .where({ "r.shop_id": shopId, "r.job_id": jobId })
    .orderBy("r.id", "desc")
    .select("r.*", "u.name as by_name");
  return rows.map(toReading);
}

/** A posted photo of this job, so a teardown step can't point at another job's picture. */
export async function jobHasPhoto({ shopId, jobId, publicId }: JobKey & { publicId: string }): Promise<boolean> {
  const row = await db()("photos").where({ shop_id: shopId, job_id: jobId, public_id: publicId }).whereNotNull("entry_id").first("id");
  return !!row;
}

export async function listJobPhotos({ shopId, jobId }: JobKey): Promise<{ id: string; caption: string | null }[]> {
  const rows: (Pick<PhotosTable, "public_id"> & Pick<JournalEntriesTable, "caption">)[] = await db()("photos as p")
    .join("journal_entries as e", "e.id", "p.entry_id")
    .where({ "p.shop_id": shopId, "p.job_id": jobId })
    .whereNull("e.deleted_at")
    .orderBy("p.id", "desc")
    .limit(60)
    .select("p.public_id", "e.caption");
  return rows.map((r) => ({ id: String(r.public_id), caption: str(r.caption) }));
}

/** The next step in removal order; the job row lock makes two phones logging at once take turns. */
export async function insertTeardownStep(p: JobKey & { userId: number; step: Omit<TeardownBody, "seq" | "torque">; photoId: string | null }) {
  return transaction(async (tx) => {
    await tx("jobs").where({ id: p.jobId, shop_id: p.shopId }).forUpdate().first("id");
    const last = await tx("teardown_steps").where({ shop_id: p.shopId, job_id: p.jobId }).max({ seq: "seq" }).first();
    const seq = Number(last?.seq ?? 0) + 1;
    const body: TeardownBody = { seq, ...p.step, torque: null };
    const s = p.step;
    const made = await withEntry(tx, { ...p, kind: "teardown", visibility: "shop", body }, (keys) =>
      tx("teardown_steps").insert({
        ...keys,
        seq,
        removed: s.removed,
        count: s.count,
        size: s.size,
        notes: s.notes,
        storage_label: s.storage,
        photo_public_id: p.photoId,
        created_by_user_id: p.userId,
      }),
    );
    return { ...made, seq };
  });
}

export type TeardownRow = {
  id: number;
  seq: number;
  removed: string;
  count: number | null;
  size: string | null;
  notes: string | null;
  storage: string | null;
  photoId: string | null;
  torque: StepTorque | null;
  replacedNew: boolean;
  checked: { by: string | null; at: string } | null;
  /** Bumped by each edit (migration 28): an edit form sends the version it showed. */
  version: number;
};

export async function listTeardownSteps({ shopId, jobId }: JobKey, k: Knex = db()): Promise<TeardownRow[]> {
  const rows: (TeardownStepsTable & { checked_by_name: string | null })[] = await k("teardown_steps as s")
    .leftJoin("users as u", "u.id", "s.checked_by_user_id")
    .where({ "s.shop_id": shopId, "s.job_id": jobId })
    .whereNull("s.deleted_at")
    .orderBy("s.seq", "asc")
    .select("s.*", "u.name as checked_by_name");
  return rows.map((r) => ({
    id: Number(r.id),
    seq: Number(r.seq),
    removed: String(r.removed),
    count: num(r.count),
    size: str(r.size),
    notes: str(r.notes),
    storage: str(r.storage_label),
    photoId: str(r.photo_public_id),
    torque:
      r.torque_value == null
        ? null
        : {
            value: Number(r.torque_value),
            unit: r.torque_unit as TorqueUnit,
            boltCount: num(r.torque_bolt_count),
            // Migration 27: none / false on steps written before it.
            angleStages: (json(r.torque_angle_stages) as number[] | null) ?? [],
            lubrication: isLubrication(r.torque_lubrication) ? r.torque_lubrication : null,
            oneTime: Boolean(r.torque_one_time),
            // Migration 32: null on steps written before it.
            lubricationOther: str(r.torque_lubrication_other),
            loosenRetorque: Boolean(r.torque_loosen_retorque),
            retorqueSequence: str(r.torque_retorque_sequence),
          },
    replacedNew: Boolean(r.replaced_new),
    checked: r.checked_at == null ? null : { by: str(r.checked_by_name), at: iso(r.checked_at)! },
    version: Number(r.version),
  }));
}

/** In a transaction of its own, so a replayed request's key (lib/server/idempotency.ts) commits with the change. */
async function updateStep({ shopId, jobId, stepId }: JobKey & { stepId: number }, change: Knex.DbRecord<TeardownStepsTable>): Promise<boolean> {
  const n = await transaction((tx) => tx("teardown_steps").where({ id: stepId, shop_id: shopId, job_id: jobId }).whereNull("deleted_at").update(change));
  return n === 1;
}

/** A torque change keeps the step as it was and refreshes its timeline entry (db/queries/teardown-history.ts). */
export async function setStepTorque(p: JobKey & { stepId: number; userId: number; torque: StepTorque }) {
  const t = p.torque;
  const set = {
    torque_value: t.value,
    torque_unit: t.unit,
    torque_bolt_count: t.boltCount,
    torque_angle_stages: t.angleStages?.length ? JSON.stringify(t.angleStages) : null,
    torque_lubrication: t.lubrication ?? null,
    torque_one_time: t.oneTime === true,
    torque_lubrication_other: t.lubricationOther ?? null,
    torque_loosen_retorque: t.loosenRetorque === true,
    torque_retorque_sequence: t.retorqueSequence ?? null,
  };
  await reviseTeardownStep({ ...p, expectedVersion: null, change: { kind: "torque", set } });
  return true;
}

/** The reassembly tick: who and when, or cleared again. */
export function setStepChecked(p: JobKey & { stepId: number; userId: number; done: boolean }) {
  return updateStep(p, p.done ? { checked_by_user_id: p.userId, checked_at: db().fn.now(3) } : { checked_by_user_id: null, checked_at: null });
}

export function setStepReplaced(p: JobKey & { stepId: number; replaced: boolean }) {
  return updateStep(p, { replaced_new: p.replaced });
}

/** Reassembly progress for the owner's page; null when nothing was logged coming apart. */
export async function getReassemblyProgress({ shopId, jobId }: JobKey): Promise<{ done: number; total: number; percent: number } | null> {
  const rows = await db()("teardown_steps").where({ shop_id: shopId, job_id: jobId }).whereNull("deleted_at").select("id", "checked_at");
  if (!rows.length) return null;
  return checklistProgress(
    rows.map((r) => ({ id: Number(r.id) })),
    rows.filter((r) => r.checked_at != null).map((r) => Number(r.id)),
  );
}
