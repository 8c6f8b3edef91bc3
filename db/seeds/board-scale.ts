import crypto from "node:crypto";
import type { Knex } from "knex";
import type { JobStatus } from "../../lib/job-status";

// A busy shop's history, made up, for the board's scale checks (tests/integration/board-explain
// and the bench): thousands of jobs written in multi-row inserts. Most jobs are collected long ago,
// a few hundred are in the shop, as at a real counter; promised dates on about half; a status
// change per job, journal entries per job, an invoice on every finished job.

const FIRST = ["Arlo", "Brin", "Cato", "Della", "Edda", "Fenn", "Greer", "Hale", "Ilse", "Joss", "Kael", "Lark", "Mira", "Nell", "Odo", "Pell", "Quin", "Rook", "Sabe", "Tamsin"];
const LAST = ["Ashgrove", "Birchley", "Copperfield", "Dunmore", "Elmsworth", "Fallowby", "Grisedale", "Hollin", "Ivesmoor", "Junkett", "Kestley", "Lowrie", "Marrable", "Nettlefold", "Orrin", "Pinchbeck"];
const MAKES = ["Korvane", "Valdis", "Brisko", "Tarnwell", "Oxley Motor", "Rudge-Hale"];
const MODELS = ["TR 250", "Ridgeback 450", "Mule XC", "Fieldstar 90", "Sprig 50", "Hauler 700", "Kestrel S"];
// Open statuses and how many jobs in a thousand are in each; the rest are collected.
const OPEN_PER_MILLE: [JobStatus, number][] = [
  ["checked_in", 4],
  ["inspecting", 3],
  ["waiting_approval", 4],
  ["waiting_parts", 4],
  ["in_progress", 5],
  ["ready", 4],
];

const BATCH = 1000;
const DAY = 86_400_000;

async function insertBatches<T extends object>(k: Knex, table: string, rows: T[]) {
  for (let i = 0; i < rows.length; i += BATCH) await k(table).insert(rows.slice(i, i + BATCH));
}

/** Deterministic pseudo-random numbers (mulberry32), so two seeds of the same size look alike. */
function random(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export type BoardScaleOptions = { jobs: number; entriesPerJob?: number; label?: string; now?: Date; seed?: number };

/**
 * A new shop with `jobs` jobs (2–3 per customer, one machine each), technicians, a status change
 * and `entriesPerJob` shop notes per job, and invoices on finished jobs. Returns the shop's id and
 * slug. Ids are read back by range, so run it on a database nobody else writes to at that moment.
 */
export async function seedBoardScale(k: Knex, opts: BoardScaleOptions): Promise<{ shopId: number; slug: string; technicianIds: number[] }> {
  const rnd = random(opts.seed ?? 17);
  const pick = <T>(list: readonly T[]) => list[Math.floor(rnd() * list.length)]!;
  const now = (opts.now ?? new Date()).getTime();
  const slug = `${opts.label ?? "scale"}-${crypto.randomBytes(4).toString("hex")}`;
  const [shopId] = await k("shops").insert({ slug, name: `Scale shop ${slug}` });
  const shop = Number(shopId);

  const technicianIds: number[] = [];
  for (let i = 0; i < 4; i++) {
    const [userId] = await k("users").insert({ email: `tech${i}.${slug}@shop.test`, name: `${pick(FIRST)} ${pick(LAST)}` });
    await k("memberships").insert({ shop_id: shop, user_id: userId, role: "technician" });
    technicianIds.push(Number(userId));
  }

  const customerCount = Math.max(1, Math.ceil(opts.jobs / 2.5));
  await insertBatches(
    k,
    "customers",
    Array.from({ length: customerCount }, (_, i) => ({ shop_id: shop, name: `${pick(FIRST)} ${pick(LAST)} ${i}`, email: `c${i}.${slug}@mail.test` })),
  );
  const customerIds = (await k("customers").where({ shop_id: shop }).orderBy("id").select("id")).map((r) => Number(r.id));
  await insertBatches(
    k,
    "machines",
    customerIds.map((customerId, i) => ({
      shop_id: shop,
      customer_id: customerId,
      kind: "atv" as const,
      make: pick(MAKES),
      model: pick(MODELS),
      serial: `SC${String(i).padStart(6, "0")}-${crypto.randomBytes(3).toString("hex").toUpperCase()}`,
    })),
  );
  const machineIds = (await k("machines").where({ shop_id: shop }).orderBy("id").select("id")).map((r) => Number(r.id));

  // Job n was taken in n "slots" ago, newest last; open jobs are the newest ones.
  const span = 5 * 365 * DAY;
  let openLeft = OPEN_PER_MILLE.flatMap(([status, perMille]) => Array.from({ length: Math.max(1, Math.round((opts.jobs * perMille) / 1000)) }, () => status));
  openLeft = openLeft.slice(0, Math.floor(opts.jobs / 2));
  const firstOpen = opts.jobs - openLeft.length;
  const jobs = Array.from({ length: opts.jobs }, (_, i) => {
    const created = now - span + Math.floor((span * i) / opts.jobs);
    const status: JobStatus = i >= firstOpen ? openLeft[i - firstOpen]! : "picked_up";
    const owner = Math.min(customerIds.length - 1, Math.floor(i / 2.5));
    const promised = rnd() < 0.5 ? new Date(created + Math.floor(rnd() * 20) * DAY).toISOString().slice(0, 10) : null;
    return {
      shop_id: shop,
      number: i + 1,
      public_id: crypto.randomBytes(12).toString("base64url"),
      customer_id: customerIds[owner]!,
      machine_id: machineIds[owner]!,
      status,
      concern: `Runs rough when warm, job ${i + 1}`,
      promised_on: promised,
      technician_user_id: rnd() < 0.8 ? pick(technicianIds) : null,
      created_at: new Date(created),
      updated_at: new Date(Math.min(now, created + Math.floor(rnd() * 10) * DAY)),
    };
  });
  await insertBatches(k, "jobs", jobs);
  await k("shops").where({ id: shop }).update({ next_job_number: opts.jobs + 1 });
  const jobRows = (await k("jobs").where({ shop_id: shop }).orderBy("number").select("id", "status", "created_at", "updated_at")) as {
    id: number;
    status: JobStatus;
    created_at: Date;
    updated_at: Date;
  }[];

  await insertBatches(
    k,
    "job_status_changes",
    jobRows
      .filter((j) => j.status !== "checked_in")
      .map((j) => ({ shop_id: shop, job_id: j.id, from_status: "checked_in" as const, to_status: j.status, cause: "manual", changed_at: j.updated_at })),
  );
  const entriesPerJob = opts.entriesPerJob ?? 0;
  if (entriesPerJob > 0) {
    const entries: { shop_id: number; job_id: number; kind: string; visibility: "shop"; body: string; created_at: Date }[] = [];
    const flush = async () => {
      await insertBatches(k, "journal_entries", entries.splice(0));
    };
    for (const j of jobRows) {
      for (let e = 0; e < entriesPerJob; e++) {
        const at = new Date(j.created_at.getTime() + Math.floor(((j.updated_at.getTime() - j.created_at.getTime()) * e) / entriesPerJob));
        entries.push({ shop_id: shop, job_id: j.id, kind: "note", visibility: "shop", body: JSON.stringify({ text: `Note ${e + 1}` }), created_at: at });
      }
      if (entries.length >= 20 * BATCH) await flush();
    }
    await flush();
  }
  let invoiceNumber = 0;
  await insertBatches(
    k,
    "invoices",
    jobRows
      .filter((j) => j.status === "ready" || j.status === "picked_up")
      .map((j) => {
        const paid = j.status === "picked_up" || rnd() < 0.5;
        invoiceNumber += 1;
        return {
          shop_id: shop,
          job_id: j.id,
          live_job_id: j.id,
          public_id: crypto.randomBytes(12).toString("base64url").slice(0, 16),
          number: invoiceNumber,
          status: paid ? ("paid" as const) : ("issued" as const),
          currency: "USD",
          totals: "{}",
          total_minor: 25_000,
          paid_minor: paid ? 25_000 : 0,
          balance_minor: paid ? 0 : 25_000,
        };
      }),
  );
  return { shopId: shop, slug, technicianIds };
}
