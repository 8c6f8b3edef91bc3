import "server-only";
import type { ReadingDecimals, SpecKind } from "@/lib/bench";
import { db } from "@/db/client";
import type { SpecEntriesTable } from "@/db/tables";

// The shop's own spec library, per machine make and model. Entered by the shop from its manuals;
// we ship no maker's data.

export type SpecRow = {
  id: number;
  make: string;
  model: string;
  kind: SpecKind;
  label: string;
  value: number | null;
  unit: string | null;
  min: number | null;
  max: number | null;
  boltCount: number | null;
  notes: string | null;
  source: string | null;
  /** Decimals typed for value, min and max ("0.10" → 2); null on entries written before (migration 32). */
  decimals: ReadingDecimals;
};

export type NewSpec = Omit<SpecRow, "id">;

const n = (v: unknown) => (v == null ? null : Number(v));
const s = (v: unknown) => (v == null ? null : String(v));

function toSpec(r: SpecEntriesTable): SpecRow {
  return {
    id: Number(r.id),
    make: String(r.make),
    model: String(r.model),
    kind: r.kind,
    label: String(r.label),
    value: n(r.value),
    unit: s(r.unit),
    min: n(r.min_value),
    max: n(r.max_value),
    boltCount: n(r.bolt_count),
    notes: s(r.notes),
    source: s(r.source),
    decimals: { value: n(r.value_decimals), min: n(r.min_decimals), max: n(r.max_decimals) },
  };
}

/** Every entry of the shop, or only one make and model (matched without regard to case). */
export async function listSpecs({ shopId, make, model }: { shopId: number; make?: string; model?: string }): Promise<SpecRow[]> {
  const q = db()("spec_entries").where({ shop_id: shopId });
  if (make !== undefined && model !== undefined) q.where({ make, model });
  const rows = await q.orderBy(["make", "model", "kind", "label", "id"]).limit(2000);
  return rows.map(toSpec);
}

export async function insertSpec({ shopId, userId, spec }: { shopId: number; userId: number; spec: NewSpec }): Promise<number> {
  const [id] = await db()("spec_entries").insert({
    shop_id: shopId,
    make: spec.make,
    model: spec.model,
    kind: spec.kind,
    label: spec.label,
    value: spec.value,
    unit: spec.unit,
    min_value: spec.min,
    max_value: spec.max,
    bolt_count: spec.boltCount,
    notes: spec.notes,
    source: spec.source,
    value_decimals: spec.decimals.value,
    min_decimals: spec.decimals.min,
    max_decimals: spec.decimals.max,
    created_by_user_id: userId,
  });
  return Number(id);
}

/** True when the entry existed in this shop and is now gone. */
export async function deleteSpec({ shopId, id }: { shopId: number; id: number }): Promise<boolean> {
  return (await db()("spec_entries").where({ shop_id: shopId, id }).delete()) === 1;
}

/** The makes and models of the shop's machines, to suggest while typing a spec. */
export async function listShopMachineModels({ shopId }: { shopId: number }): Promise<{ make: string; model: string }[]> {
  const rows = await db()("machines").where({ shop_id: shopId }).distinct("make", "model").orderBy(["make", "model"]).limit(500);
  return rows.map((r) => ({ make: String(r.make), model: String(r.model) }));
}
