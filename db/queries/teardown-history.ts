import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import type { TeardownStepRevisionsTable, TeardownStepsTable } from "@/db/tables";
import { transaction } from "@/db/transaction";
import { isTeardownBody } from "@/lib/bench";
import { AppError } from "@/lib/errors";
import { type StepRevision, snapshotOfRow, teardownLockReason } from "@/lib/teardown-history";
import { recordEvent } from "./shop-events";
import { lockJobRow } from "./workflow";

// Edits, torque changes and deletes of teardown steps (issue 18 §7), each in one transaction with
// the job row locked: the step as it was goes into teardown_step_revisions, the step changes (a
// delete only marks it), and its timeline entry follows — a revision of the entry and a fresh
// snapshot (marked edited), or the entry deleted with the step. Refused: nothing is written.

type JobKey = { shopId: number; jobId: number };
export type StepFields = { removed: string; count: number | null; size: string | null; notes: string | null; storage: string | null };
/** A torque change names the torque columns it sets (torque_value, torque_unit, torque_bolt_count and any added later). */
export type StepTorqueColumns = Knex.DbRecord<TeardownStepsTable>;
export type StepChange = { kind: "edit"; set: StepFields } | { kind: "torque"; set: StepTorqueColumns } | { kind: "delete" };

const parse = (v: unknown): unknown => (typeof v === "string" ? JSON.parse(v) : (v ?? null));

/** Column values as text, the way MariaDB hands them back (DECIMAL as a number, BOOLEAN as 0/1). */
const asText = (v: unknown) => (v == null ? "" : typeof v === "boolean" ? (v ? "1" : "0") : typeof v === "number" ? String(Number(v)) : String(v));
const sameAs = (row: TeardownStepsTable, columns: Record<string, unknown>) => Object.entries(columns).every(([k, v]) => asText((row as Record<string, unknown>)[k]) === asText(v));

export async function reviseTeardownStep(p: JobKey & { stepId: number; userId: number; expectedVersion: number | null; change: StepChange }): Promise<{ version: number }> {
  return transaction(async (tx) => {
    const reason = teardownLockReason(await lockJobRow(tx, p));
    if (reason) throw new AppError("conflict", reason);
    const row: TeardownStepsTable | undefined = await tx("teardown_steps").where({ id: p.stepId, shop_id: p.shopId, job_id: p.jobId }).whereNull("deleted_at").forUpdate().first();
    if (!row) throw new AppError("not_found", "That teardown step isn't on this job: it may have been deleted. Reload the bench page.");
    if (p.expectedVersion != null && Number(row.version) !== p.expectedVersion) {
      throw new AppError("conflict", "Someone changed this step since you opened it. Reload the bench page to see the latest version.");
    }
    const c = p.change;
    const columns: Knex.DbRecord<TeardownStepsTable> =
      c.kind === "delete" ? {} : c.kind === "edit" ? { removed: c.set.removed, count: c.set.count, size: c.set.size, notes: c.set.notes, storage_label: c.set.storage } : c.set;
    // Saving what is already there changes nothing: no revision, no "edited" on the timeline.
    if (c.kind !== "delete" && sameAs(row, columns)) return { version: Number(row.version) };
    await tx("teardown_step_revisions").insert({
      shop_id: p.shopId,
      job_id: p.jobId,
      step_id: p.stepId,
      version: row.version,
      change: p.change.kind,
      previous: JSON.stringify(row),
      changed_by_user_id: p.userId,
    });
    const version = Number(row.version) + 1;
    const update: Knex.DbRecord<TeardownStepsTable> = c.kind === "delete" ? { version, deleted_at: tx.fn.now(3), deleted_by_user_id: p.userId } : { ...columns, version };
    await tx("teardown_steps").where({ id: p.stepId }).update(update);
    if (row.entry_id != null) await followEntry(tx, { ...p, entryId: Number(row.entry_id) });
    return { version };
  });
}

/** The step's timeline entry, kept from showing stale data as if current. A deleted entry stays deleted. */
async function followEntry(tx: Knex.Transaction, p: JobKey & { stepId: number; userId: number; entryId: number; change: StepChange }) {
  const entry = await tx("journal_entries").where({ id: p.entryId, shop_id: p.shopId, job_id: p.jobId }).whereNull("deleted_at").forUpdate().first("kind", "visibility", "body", "caption", "version");
  if (!entry) return;
  const deleting = p.change.kind === "delete";
  await tx("journal_entry_revisions").insert({
    shop_id: p.shopId,
    entry_id: p.entryId,
    version: entry.version,
    change: deleting ? "delete" : "edit",
    visibility: entry.visibility,
    body: entry.body == null ? null : typeof entry.body === "string" ? entry.body : JSON.stringify(entry.body),
    caption: entry.caption ?? null,
    changed_by_user_id: p.userId,
  });
  const version = Number(entry.version) + 1;
  if (deleting) {
    await tx("journal_entries").where({ id: p.entryId }).update({ version, deleted_at: tx.fn.now(3) });
  } else {
    const step = (await tx("teardown_steps").where({ id: p.stepId }).first())!;
    const old = parse(entry.body);
    const now = snapshotOfRow(step as unknown as Record<string, unknown>);
    // The torque's special fields (migration 27) as the step now has them; other fields the
    // snapshot doesn't know are kept as they were.
    const special = {
      angleStages: parse(step.torque_angle_stages) ?? undefined,
      lubrication: step.torque_lubrication ?? undefined,
      oneTime: step.torque_one_time == null ? undefined : Boolean(step.torque_one_time),
      // Migration 32.
      lubricationOther: step.torque_lubrication_other ?? undefined,
      loosenRetorque: step.torque_loosen_retorque == null ? undefined : Boolean(step.torque_loosen_retorque),
      retorqueSequence: step.torque_retorque_sequence ?? undefined,
    };
    const t = now.torque;
    const torque = t ? { ...(isTeardownBody(old) && old.torque ? old.torque : {}), value: t.value, unit: t.unit, boltCount: t.boltCount, ...special } : null;
    const body = { ...(isTeardownBody(old) ? old : {}), seq: Number(step.seq), ...now, torque };
    await tx("journal_entries").where({ id: p.entryId }).update({ version, body: JSON.stringify(body), edited_at: tx.fn.now(3) });
  }
  await recordEvent(tx, { shopId: p.shopId, jobId: p.jobId, kind: "entry_changed", actorUserId: p.userId, ownerVisible: entry.visibility === "shared", payload: { entry: p.entryId, change: deleting ? "delete" : "edit" } });
}

/** Every change to this job's teardown steps, oldest first, with the step's removal number. */
export async function listTeardownRevisions({ shopId, jobId }: JobKey, k: Knex = db()): Promise<StepRevision[]> {
  type Row = Pick<TeardownStepRevisionsTable, "step_id" | "version" | "change" | "previous" | "changed_at"> & { seq: number; by_name: string | null };
  const rows: Row[] = await k("teardown_step_revisions as r")
    .join("teardown_steps as s", "s.id", "r.step_id")
    .leftJoin("users as u", "u.id", "r.changed_by_user_id")
    .where({ "r.shop_id": shopId, "r.job_id": jobId })
    .orderBy("r.id", "asc")
    .select("r.step_id", "r.version", "r.change", "r.previous", "r.changed_at", "s.seq", "u.name as by_name");
  return rows.map((r) => ({
    stepId: Number(r.step_id),
    seq: Number(r.seq),
    version: Number(r.version),
    change: r.change,
    previous: snapshotOfRow((parse(r.previous) ?? {}) as Record<string, unknown>),
    by: r.by_name ?? null,
    at: new Date(r.changed_at).toISOString(),
  }));
}
