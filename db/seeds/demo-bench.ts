import type { Knex } from "knex";
import type { PartStatus } from "../../lib/bench";
import { calendarDay, daysFromNow } from "./demo-time";

// Bench demo data: the shop's own spec library for the invented models, and J-0002's top end
// (Jonah Pike's Corvane) part-way apart, with its parts on one supplier order: one back-ordered
// with a new date, one with a core charge. Demo values, invented — not
// from any maker. Seeded rows get no timeline entries: the journal above is already in time order.
type SpecSeed = { make: string; model: string; kind: "torque" | "limit" | "capacity" | "note"; label: string; value?: number; unit?: string; min?: number; max?: number; boltCount?: number; notes?: string; source: string };
type StepSeed = { removed: string; count?: number; size?: string; notes?: string; storage?: string; torque?: { value: number; unit: "nm" | "lbf_ft" | "lbf_in" | "kgf_m"; boltCount?: number } };
/** firstExpectedInDays: a back-ordered part's date before the supplier moved it; coreChargeMinor: refunded when the old part goes back. */
type PartSeed = { description: string; partNumber: string; supplier: string; costMinor: number; status: "ordered" | "back_ordered"; expectedInDays: number; firstExpectedInDays?: number; coreChargeMinor?: number };
/** order: the one supplier order (issue 19) the job's parts are on, placed `orderedDaysAgo`. */
type BenchSeed = { specs: SpecSeed[]; job?: { number: number; day: number; steps: StepSeed[]; order: { supplier: string; reference: string; orderedDaysAgo: number }; parts: PartSeed[] } };

const BENCH: Record<string, BenchSeed> = {
  "copper-gulch": {
    specs: [
      { make: "Corvane", model: "Tarn 450", kind: "limit", label: "Cam chain length over 20 pins", unit: "mm", max: 129.4, source: "Tarn 450 shop manual p. 3-18 (demo, invented)" },
      { make: "Corvane", model: "Tarn 450", kind: "torque", label: "Valve cover bolts", value: 10, unit: "nm", boltCount: 4, source: "Tarn 450 shop manual p. 3-9 (demo, invented)" },
      { make: "Corvane", model: "Tarn 450", kind: "torque", label: "Clutch cover bolts", value: 88, unit: "lbf_in", boltCount: 8, source: "Tarn 450 shop manual p. 5-4 (demo, invented)" },
      { make: "Corvane", model: "Tarn 450", kind: "capacity", label: "Engine oil with filter", value: 1.2, unit: "L", source: "Tarn 450 owner's card (demo, invented)" },
      { make: "Tessaro", model: "Ridgeline 570", kind: "limit", label: "Front brake disc thickness", unit: "mm", min: 3.4, source: "Ridgeline service sheet 7 (demo, invented)" },
      { make: "Tessaro", model: "Ridgeline 570", kind: "torque", label: "Front axle nut", value: 70, unit: "lbf_ft", source: "Ridgeline service sheet 4 (demo, invented)" },
      { make: "Gravik", model: "Hauler 800", kind: "note", label: "Radiator fan relay", notes: "Behind the left dash panel; two clips, no screws.", source: "Shop's own note" },
    ],
    job: {
      number: 2,
      day: 1,
      steps: [
        { removed: "Seat and side panels", count: 4, size: "10 mm head", storage: "Bin 2-A" },
        { removed: "Fuel tank", notes: "Quick-connect clip faces forward. Tank drained into the red can.", storage: "Shelf by the door" },
        { removed: "Valve cover bolts", count: 4, size: "M6, 8 mm head", notes: "Two long bolts on the intake side.", storage: "Bag 2-B", torque: { value: 10, unit: "nm", boltCount: 4 } },
        { removed: "Valve cover and gasket", notes: "Half-moon plugs face out; gasket re-usable.", storage: "Bin 2-A" },
        { removed: "Cam chain tensioner", count: 2, size: "M6", notes: "Plunger at its last notch.", storage: "Bag 2-C" },
      ],
      // Invented order, parts and prices. The starter is a rebuilt exchange unit: its core charge
      // comes back when the old starter goes to the supplier.
      order: { supplier: "Ridgeway Parts Supply", reference: "RPS-20418", orderedDaysAgo: 1 },
      parts: [
        { description: "Cam chain", partNumber: "CV-TRN-0112", supplier: "Ridgeway Parts Supply", costMinor: 4850, status: "ordered", expectedInDays: 2 },
        { description: "Cam chain tensioner", partNumber: "CV-TRN-0340", supplier: "Ridgeway Parts Supply", costMinor: 6275, status: "back_ordered", expectedInDays: 6, firstExpectedInDays: 2 },
        { description: "Starter motor, rebuilt exchange", partNumber: "CV-TRN-0907R", supplier: "Ridgeway Parts Supply", costMinor: 9400, status: "ordered", expectedInDays: 2, coreChargeMinor: 3500 },
      ],
    },
  },
};

export async function seedBench(
  tx: Knex.Transaction,
  shop: { slug: string; timezone: string; deskEmail: string; jobs: readonly { technician: string | null; startedDaysAgo: number; path: readonly unknown[] }[] },
  shopId: number,
  byEmail: (email: string) => number | undefined,
) {
  const bench = BENCH[shop.slug];
  if (!bench) return;
  const staffId = byEmail(shop.deskEmail)!;
  for (const spec of bench.specs) {
    await tx("spec_entries").insert({
      shop_id: shopId,
      make: spec.make,
      model: spec.model,
      kind: spec.kind,
      label: spec.label,
      value: spec.value ?? null,
      unit: spec.unit ?? null,
      min_value: spec.min ?? null,
      max_value: spec.max ?? null,
      bolt_count: spec.boltCount ?? null,
      notes: spec.notes ?? null,
      source: spec.source,
      created_by_user_id: staffId,
    });
  }
  if (!bench.job) return;
  const seed = shop.jobs[bench.job.number - 1]!;
  // The demo's own job, inserted by the seed just before.
  const job = (await tx("jobs").where({ shop_id: shopId, number: bench.job.number }).first("id"))!;
  const techId = (seed.technician && byEmail(seed.technician)) || staffId;
  for (const [i, step] of bench.job.steps.entries()) {
    await tx("teardown_steps").insert({
      shop_id: shopId,
      job_id: job.id,
      seq: i + 1,
      removed: step.removed,
      count: step.count ?? null,
      size: step.size ?? null,
      notes: step.notes ?? null,
      storage_label: step.storage ?? null,
      torque_value: step.torque?.value ?? null,
      torque_unit: step.torque?.unit ?? null,
      torque_bolt_count: step.torque?.boltCount ?? null,
      created_by_user_id: techId,
      created_at: new Date(daysFromNow(-seed.startedDaysAgo + bench.job.day, 15).getTime() + i * 10 * 60_000),
    });
  }
  const o = bench.job.order;
  const [orderId] = await tx("part_orders").insert({
    shop_id: shopId,
    supplier: o.supplier,
    reference: o.reference,
    ordered_on: calendarDay(-o.orderedDaysAgo, shop.timezone),
    expected_on: calendarDay(Math.min(...bench.job.parts.map((p) => p.firstExpectedInDays ?? p.expectedInDays)), shop.timezone),
    created_by_user_id: staffId,
  });
  for (const part of bench.job.parts) {
    const at = daysFromNow(-seed.startedDaysAgo + seed.path.length - 1, 15);
    const [partId] = await tx("job_parts").insert({
      shop_id: shopId,
      job_id: job.id,
      part_number: part.partNumber,
      description: part.description,
      supplier: part.supplier,
      qty_thousandths: 1000,
      cost_minor: part.costMinor,
      status: part.status,
      expected_on: calendarDay(part.expectedInDays, shop.timezone),
      order_id: Number(orderId),
      core_charge_minor: part.coreChargeMinor ?? null,
      created_by_user_id: staffId,
      created_at: at,
      updated_at: at,
    });
    // The notes are the ones the ordering writers leave (lib/server/part-orders.ts).
    const steps: [PartStatus | null, PartStatus, string | null][] = [
      [null, "needed", null],
      ["needed", "ordered", `Ordered from ${o.supplier}, ref. ${o.reference}`],
    ];
    if (part.status === "back_ordered") steps.push(["ordered", "back_ordered", `Back-ordered, now expected ${calendarDay(part.expectedInDays, shop.timezone)}`]);
    for (const [from, to, note] of steps) {
      await tx("job_part_events").insert({ shop_id: shopId, part_id: partId, from_status: from, to_status: to, changed_by_user_id: staffId, changed_at: at, note });
    }
  }
}
