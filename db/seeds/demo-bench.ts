import type { Knex } from "knex";
import { decisionTotals } from "../../lib/approvals";
import type { PartStatus } from "../../lib/bench";
import { type MarkupRule, sellFromCost } from "../../lib/parts-pricing";
import { REQUEST_PRICING, line, seedSentRequest } from "./demo-approvals";
import { calendarDay, daysFromNow } from "./demo-time";

// Bench demo data: the shop's own spec library and parts markup for the invented models, and
// J-0002's top end (Jonah Pike's Corvane) part-way apart, with its parts on one supplier order: one
// back-ordered with a new date, one with a core charge. The parts are the priced lines of a finding
// Jonah approved by phone (issue 19), so they hold the job in waiting on parts and his page shows
// the wait. Demo values, invented — not from any maker. Seeded rows get no timeline entries: the
// journal above is already in time order.
type SpecSeed = { make: string; model: string; kind: "torque" | "limit" | "capacity" | "note"; label: string; value?: number; unit?: string; min?: number; max?: number; boltCount?: number; notes?: string; source: string };
type StepSeed = { removed: string; count?: number; size?: string; notes?: string; storage?: string; torque?: { value: number; unit: "nm" | "lbf_ft" | "lbf_in" | "kgf_m"; boltCount?: number } };
/** firstExpectedInDays: a back-ordered part's date before the supplier moved it; coreChargeMinor: refunded when the old part goes back. */
type PartSeed = { description: string; partNumber: string; supplier: string; costMinor: number; status: "ordered" | "back_ordered"; expectedInDays: number; firstExpectedInDays?: number; coreChargeMinor?: number };
/**
 * The finding the parts were priced on and its answer: sent the day the job went to the owner, and
 * answered by phone (recorded by `recordedBy`) the day it went to waiting on parts. The part lines
 * are the parts below, at the markup's price; the labour at the shop's rate.
 */
type WorkSeed = { title: string; found: string; whyItMatters: string; labour: { description: string; hoursTenths: number }; recordedBy: string; note: string };
/** order: the one supplier order (issue 19) the job's parts are on, placed `orderedDaysAgo`. */
type BenchSeed = {
  specs: SpecSeed[];
  markup?: MarkupRule;
  job?: { number: number; day: number; steps: StepSeed[]; order: { supplier: string; reference: string; orderedDaysAgo: number }; parts: PartSeed[]; work?: WorkSeed };
};

type JobTimes = { startedDaysAgo: number; path: readonly unknown[] };
/** When the job took its path's step `i` (db/seeds/demo.ts walks the path a step a day). */
const pathMoment = (seed: JobTimes, i: number) => daysFromNow(-seed.startedDaysAgo + i, 15 + i);
/** Priced on the finding a little before it was sent (the path's third step, to the owner). */
const pricedAt = (seed: JobTimes) => new Date(pathMoment(seed, 2).getTime() - 20 * 60_000);

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
    // Markup on cost by bands: common trade practice, no published source (lib/parts-pricing.ts).
    markup: {
      kind: "bands",
      bands: [
        { upToMinor: 1000, percent: "100" },
        { upToMinor: 5000, percent: "60" },
        { upToMinor: null, percent: "35" },
      ],
    },
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
      order: { supplier: "Ridgeway Parts Supply", reference: "RPS-20418", orderedDaysAgo: 6 },
      parts: [
        { description: "Cam chain", partNumber: "CV-TRN-0112", supplier: "Ridgeway Parts Supply", costMinor: 4850, status: "ordered", expectedInDays: 2 },
        { description: "Cam chain tensioner", partNumber: "CV-TRN-0340", supplier: "Ridgeway Parts Supply", costMinor: 6275, status: "back_ordered", expectedInDays: 6, firstExpectedInDays: 2 },
        { description: "Starter motor, rebuilt exchange", partNumber: "CV-TRN-0907R", supplier: "Ridgeway Parts Supply", costMinor: 9400, status: "ordered", expectedInDays: 2, coreChargeMinor: 3500 },
      ],
      work: {
        title: "Cam chain stretched, tensioner out of travel; starter drags when hot",
        found: "The cam chain measures past the limit over 20 pins and the tensioner plunger is at its last notch: that is the rattle at idle. The starter draws hard and drags once the engine is hot.",
        whyItMatters: "A chain that jumps a tooth can let the valves meet the pistons, which turns a chain job into an engine rebuild.",
        labour: { description: "Replace the cam chain and tensioner, fit the starter", hoursTenths: 35 },
        recordedBy: "priya@coppergulch.test",
        note: "Go ahead with all of it. The old starter goes back to the supplier for the exchange.",
      },
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
  if (bench.markup) await tx("shop_parts_markup").insert({ shop_id: shopId, rule: JSON.stringify(bench.markup) });
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
    // Priced on the finding (needed), then ordered once the owner's answer moved the job to waiting
    // on parts (seedBenchWork); without a finding, both the day the job started waiting.
    const at = bench.job.work ? new Date(pathMoment(seed, 3).getTime() + 30 * 60_000) : daysFromNow(-seed.startedDaysAgo + seed.path.length - 1, 15);
    const created = bench.job.work ? pricedAt(seed) : at;
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
      created_at: created,
      updated_at: at,
    });
    // The notes are the ones the ordering writers leave (lib/server/part-orders.ts).
    const steps: [PartStatus | null, PartStatus, string | null][] = [
      [null, "needed", null],
      ["needed", "ordered", `Ordered from ${o.supplier}, ref. ${o.reference}`],
    ];
    if (part.status === "back_ordered") steps.push(["ordered", "back_ordered", `Back-ordered, now expected ${calendarDay(part.expectedInDays, shop.timezone)}`]);
    for (const [from, to, note] of steps) {
      await tx("job_part_events").insert({ shop_id: shopId, part_id: partId, from_status: from, to_status: to, changed_by_user_id: staffId, changed_at: from === null ? created : at, note });
    }
  }
}

/**
 * J-0002's parts as the priced lines of a finding its owner approved (issue 19): the finding, its
 * lines at the markup's sell price, the request sealed as the app seals one, the owner's answer by
 * phone, and each part tied to its line, approved. Runs after the approvals demo, so that demo's
 * finding and request keep the first ids (tests/e2e/accessibility.spec.ts opens finding 1).
 */
export async function seedBenchWork(tx: Knex.Transaction, shop: { slug: string; jobs: readonly { technician: string | null; startedDaysAgo: number; path: readonly unknown[] }[] }, shopId: number, byEmail: (email: string) => number | undefined) {
  const bench = BENCH[shop.slug];
  const work = bench?.job?.work;
  if (!bench?.job || !work) return;
  const seed = shop.jobs[bench.job.number - 1]!;
  const job = (await tx("jobs as j").join("customers as c", "c.id", "j.customer_id").where({ "j.shop_id": shopId, "j.number": bench.job.number }).first("j.id", "j.public_id", "j.technician_user_id", "c.name", "c.email", "c.phone")) as {
    id: number;
    public_id: string;
    technician_user_id: number | null;
    name: string;
    email: string;
    phone: string | null;
  };
  const rates = (await tx("shop_money_settings").where({ shop_id: shopId }).first("labour_rate_minor")) as { labour_rate_minor: number };
  const pricing = REQUEST_PRICING[shop.slug]!;
  const writer = byEmail(work.recordedBy)!;
  // The request went out with the move to the owner (the path's third step) and the answer came
  // with the move to waiting on parts (the fourth).
  const sentAt = pathMoment(seed, 2);
  const answeredAt = pathMoment(seed, 3);
  const drafted = pricedAt(seed);
  const lines = [
    ...bench.job.parts.map((p) =>
      line({ kind: "part", description: p.description, partNumber: p.partNumber, qtyThousandths: 1000, unitPriceMinor: bench.markup ? sellFromCost(p.costMinor, bench.markup) : p.costMinor, taxable: true }),
    ),
    line({ kind: "labour", description: work.labour.description, hoursTenths: work.labour.hoursTenths, rateMinor: Number(rates.labour_rate_minor), taxable: false }),
  ];
  const { findingId, lineIds, requestId, snapshot, hash } = await seedSentRequest(tx, {
    shopId,
    job,
    finding: { title: work.title, found: work.found, whyItMatters: work.whyItMatters, lines },
    pricing,
    sentTo: job.email,
    writer,
    drafted,
    sentAt,
    answeredAt,
    linkLines: true,
  });
  // Every line approved, by phone, as the desk records a call (lib/server/approvals.ts decide).
  const t = decisionTotals(snapshot, Object.fromEntries(snapshot.lines.map((l) => [l.no, "approved" as const])));
  const [decisionId] = await tx("approval_decisions").insert({
    shop_id: shopId,
    job_id: job.id,
    request_id: requestId,
    method: "phone",
    person_name: job.name,
    signature_name: null,
    phone_called: job.phone,
    note: work.note,
    wants_parts_back: false,
    decided_at: answeredAt,
    recorded_at: answeredAt,
    recorded_by_user_id: writer,
    shown_hash: hash,
    estimate_pre_tax_minor: t.estimate.preTaxTotalMinor,
    estimate_total_minor: t.estimate.totalMinor,
    authorised_pre_tax_minor: t.authorised.preTaxTotalMinor,
    authorised_tax_minor: t.authorised.taxMinor,
    authorised_total_minor: t.authorised.totalMinor,
  });
  await tx("approval_decision_lines").insert(
    snapshot.lines.map((l) => ({
      shop_id: shopId,
      job_id: job.id,
      decision_id: decisionId,
      line_no: l.no,
      answer: "approved",
      kind: l.kind,
      description: l.description,
      part_number: l.partNumber,
      qty_thousandths: l.qtyThousandths,
      hours_tenths: l.hoursTenths,
      net_minor: l.netMinor,
      taxable: l.taxable,
    })),
  );
  // Each part is its line's part, approved: it now holds the job in waiting on parts.
  for (const [i, p] of bench.job.parts.entries()) {
    await tx("job_parts")
      .where({ shop_id: shopId, job_id: job.id, part_number: p.partNumber })
      .update({ finding_id: findingId, finding_line_id: lineIds[i], owner_answer: "approved", sell_minor: lines[i]!.unitPriceMinor, no_ok_needed: false });
  }
}
