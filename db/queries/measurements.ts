import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import { insertEntry } from "@/db/queries/entries";
import type { JobsTable, MeasurementItemsTable, MeasurementSetsTable } from "@/db/tables";
import { transaction } from "@/db/transaction";
import { type ItemLimit, type JudgedItem, type MeasurementKind, type MeasurementSetBody, type Typed, type ValveDetail, isMeasurementKind } from "@/lib/measurements";

// Measurement sets (issue 18 §5): the set, its items and its timeline entry are written in one
// transaction, so a set is whole or absent. Reads for the bench page (a job's sets) and the
// machine's history (the same item across jobs).

type JobKey = { shopId: number; jobId: number };
const json = (v: unknown): unknown => (typeof v === "string" ? JSON.parse(v) : (v ?? null));
const typed = (value: number | null, decimals: number): Typed | null => (value == null ? null : { value: Number(value), decimals: Number(decimals) });

export async function insertMeasurementSet(p: JobKey & { userId: number; body: MeasurementSetBody }): Promise<{ id: number; entryId: number }> {
  const { measurementSet: set, items } = p.body;
  return transaction(async (tx) => {
    const entryId = await insertEntry(tx, { shopId: p.shopId, jobId: p.jobId, kind: "reading", authorId: p.userId, visibility: "shop", body: p.body });
    const [id] = await tx("measurement_sets").insert({
      shop_id: p.shopId,
      job_id: p.jobId,
      entry_id: entryId,
      kind: set.kind,
      title: set.title,
      unit: set.unit,
      source: set.source,
      note: set.note,
      recorded_by_user_id: p.userId,
    });
    await tx("measurement_items").insert(
      items.map((item, position) => ({
        shop_id: p.shopId,
        set_id: Number(id),
        position,
        item_key: item.key,
        label: item.label,
        value: item.value.value,
        value_decimals: item.value.decimals,
        min_value: item.limit.min?.value ?? null,
        max_value: item.limit.max?.value ?? null,
        limit_decimals: Math.max(item.limit.min?.decimals ?? 0, item.limit.max?.decimals ?? 0),
        verdict: item.verdict,
        detail: item.valve ? JSON.stringify(item.valve) : null,
      })),
    );
    return { id: Number(id), entryId };
  });
}

export type StoredItem = { key: string; label: string; value: Typed; limit: ItemLimit; verdict: JudgedItem["verdict"]; valve: ValveDetail | null };
export type StoredSet = {
  id: number;
  kind: MeasurementKind;
  title: string;
  unit: string;
  source: string;
  note: string | null;
  findingId: number | null;
  by: string | null;
  at: string;
  items: StoredItem[];
};

function toItem(r: MeasurementItemsTable): StoredItem {
  return {
    key: r.item_key,
    label: r.label,
    value: { value: Number(r.value), decimals: Number(r.value_decimals) },
    limit: { min: typed(r.min_value, r.limit_decimals), max: typed(r.max_value, r.limit_decimals) },
    verdict: r.verdict,
    valve: json(r.detail) as ValveDetail | null,
  };
}

/** A job's sets, newest first, with their items (two queries whatever the count). */
export async function listMeasurementSets({ shopId, jobId, setId }: JobKey & { setId?: number }, k: Knex = db()): Promise<StoredSet[]> {
  const q = k("measurement_sets as s").leftJoin("users as u", "u.id", "s.recorded_by_user_id").where({ "s.shop_id": shopId, "s.job_id": jobId });
  if (setId != null) q.andWhere("s.id", setId);
  const sets: (MeasurementSetsTable & { by_name: string | null })[] = await q.orderBy("s.id", "desc").select("s.*", "u.name as by_name");
  if (!sets.length) return [];
  const items: MeasurementItemsTable[] = await k("measurement_items")
    .where({ shop_id: shopId })
    .whereIn(
      "set_id",
      sets.map((s) => s.id),
    )
    .orderBy(["set_id", "position"]);
  return sets.flatMap((s) =>
    isMeasurementKind(s.kind)
      ? [
          {
            id: Number(s.id),
            kind: s.kind,
            title: s.title,
            unit: s.unit,
            source: s.source,
            note: s.note ?? null,
            findingId: s.finding_id == null ? null : Number(s.finding_id),
            by: s.by_name ?? null,
            at: (s.created_at as Date).toISOString(),
            items: items.filter((i) => Number(i.set_id) === Number(s.id)).map(toItem),
          },
        ]
      : [],
  );
}

/** Links the draft finding to the set unless another was linked meanwhile; false then. */
export async function claimSetFinding({ shopId, jobId, setId, findingId }: JobKey & { setId: number; findingId: number }): Promise<boolean> {
  const n = await db()("measurement_sets").where({ shop_id: shopId, job_id: jobId, id: setId }).whereNull("finding_id").update({ finding_id: findingId });
  return n === 1;
}

/** Removes a draft this request made a moment ago when a concurrent "draft a finding" won (untouched: version 1). */
export async function discardUnclaimedDraft({ shopId, jobId, findingId }: JobKey & { findingId: number }): Promise<void> {
  await db()("findings").where({ shop_id: shopId, job_id: jobId, id: findingId, version: 1 }).del();
}

export type TrendRow = {
  kind: MeasurementKind;
  key: string;
  label: string;
  unit: string;
  jobNumber: number;
  at: string;
  value: Typed;
  verdict: JudgedItem["verdict"];
  limit: ItemLimit;
};

/** Every measured item of one machine across its jobs, oldest first: one query (the trends on the machine's page). */
export async function listMachineMeasurements({ shopId, machineId }: { shopId: number; machineId: number }, k: Knex = db()): Promise<TrendRow[]> {
  type Row = Pick<MeasurementItemsTable, "item_key" | "label" | "value" | "value_decimals" | "min_value" | "max_value" | "limit_decimals" | "verdict"> &
    Pick<MeasurementSetsTable, "kind" | "unit" | "created_at"> & { job_number: JobsTable["number"] };
  const rows: Row[] = await k("measurement_items as i")
    .join("measurement_sets as s", (j) => j.on("s.shop_id", "i.shop_id").andOn("s.id", "i.set_id"))
    .join("jobs as j", (j) => j.on("j.shop_id", "s.shop_id").andOn("j.id", "s.job_id"))
    .where({ "s.shop_id": shopId, "j.machine_id": machineId })
    .orderBy([{ column: "s.created_at" }, { column: "s.id" }, { column: "i.position" }])
    .limit(5000)
    .select("i.item_key", "i.label", "i.value", "i.value_decimals", "i.min_value", "i.max_value", "i.limit_decimals", "i.verdict", "s.kind", "s.unit", "s.created_at", "j.number as job_number");
  return rows.flatMap((r) =>
    isMeasurementKind(r.kind)
      ? [
          {
            kind: r.kind,
            key: r.item_key,
            label: r.label,
            unit: r.unit,
            jobNumber: Number(r.job_number),
            at: (r.created_at as Date).toISOString(),
            value: { value: Number(r.value), decimals: Number(r.value_decimals) },
            verdict: r.verdict,
            limit: { min: typed(r.min_value, r.limit_decimals), max: typed(r.max_value, r.limit_decimals) },
          },
        ]
      : [],
  );
}
