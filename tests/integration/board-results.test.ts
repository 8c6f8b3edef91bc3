import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { listJobs } from "@/db/queries/jobs";
import { seedBoardScale } from "@/db/seeds/board-scale";
import { DONE_STATUSES } from "@/lib/jobs-view";
import { type JobListQuery, jobListQuerySchema } from "@/lib/schemas/jobs";
import { testKnex } from "../support/db";

// The indexed board (migration 21) shows the same rows in the same order as the board before it,
// over a shop of 1,500 made-up jobs with ties on every sort key. The reference below is the
// query as it was: three tables joined, `column IS NULL` first, `%q%` over name, make, model and serial.

const TODAY = "2026-12-01";
const SINCE = "COALESCE((SELECT MAX(sc.changed_at) FROM job_status_changes sc WHERE sc.job_id = j.id), j.created_at)";
const LAST_CAUSE = "(SELECT sc.cause FROM job_status_changes sc WHERE sc.job_id = j.id ORDER BY sc.id DESC LIMIT 1)";
const INVOICE_STATE =
  "(SELECT CASE WHEN i.status = 'draft' THEN 'draft' WHEN i.status = 'paid' OR i.balance_minor <= 0 THEN 'paid' ELSE 'issued' END FROM invoices i WHERE i.job_id = j.id AND i.status <> 'void' ORDER BY i.id DESC LIMIT 1)";
const ANSWERED = `j.status = 'in_progress' AND ${LAST_CAUSE} = 'request_answered' AND NOT EXISTS (SELECT 1 FROM journal_entries e WHERE e.job_id = j.id AND e.kind NOT IN ('status', 'approval') AND e.created_at > ${SINCE})`;
const OLD_SORT = { number: "j.number", status: "j.status", promised: "j.promised_on", customer: "c.name", updated: "j.updated_at" } as const;

async function oldBoard(k: Knex, shopId: number, query: JobListQuery) {
  const base = k("jobs as j").join("customers as c", "c.id", "j.customer_id").join("machines as m", "m.id", "j.machine_id").where("j.shop_id", shopId);
  if (query.status.length) base.whereIn("j.status", query.status);
  if (query.attention.length) {
    base.where((w) => {
      if (query.attention.includes("overdue")) w.orWhere((o) => o.where("j.promised_on", "<", TODAY).whereNotIn("j.status", DONE_STATUSES));
      if (query.attention.includes("waiting_parts")) w.orWhere("j.status", "waiting_parts");
      if (query.attention.includes("answered")) w.orWhereRaw(ANSWERED);
      if (query.attention.includes("ready_unpaid")) w.orWhere((o) => o.where("j.status", "ready").whereRaw(`COALESCE(${INVOICE_STATE}, 'none') <> 'paid'`));
      if (query.attention.includes("owner_slow")) {
        w.orWhere((o) => o.where("j.status", "waiting_approval").whereRaw(`${SINCE} <= NOW(3) - INTERVAL (SELECT s.owner_wait_days FROM shops s WHERE s.id = j.shop_id) DAY`));
      }
    });
  }
  if (query.technician) base.where("j.technician_user_id", query.technician);
  if (query.q) {
    const number = /^(?:j-?)?0*(\d{1,9})$/i.exec(query.q)?.[1];
    const like = `%${query.q.replace(/[\\%_]/g, (ch) => `\\${ch}`)}%`;
    base.where((w) => {
      if (number) w.orWhere("j.number", Number(number));
      w.orWhere("c.name", "like", like).orWhere("m.make", "like", like).orWhere("m.model", "like", like).orWhere("m.serial", "like", like);
    });
  }
  const total = Number((await base.clone().count({ n: "j.id" }).first())?.n ?? 0);
  const col = OLD_SORT[query.sort];
  const rows = await base
    .select("j.number")
    .orderByRaw(`${col} IS NULL`)
    .orderBy(col, query.dir)
    .orderBy("j.number", "desc")
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize);
  return { total, numbers: rows.map((r) => Number(r.number)) };
}

describe("the indexed board shows what the board showed before", () => {
  let db: Knex;
  let shopId: number;
  let tech: number;

  beforeAll(async () => {
    db = testKnex();
    const seeded = await seedBoardScale(db, { jobs: 1500, entriesPerJob: 1, label: "results", seed: 5 });
    shopId = seeded.shopId;
    tech = seeded.technicianIds[1]!;
    const jobs = (await db("jobs").where({ shop_id: shopId }).orderBy("number").select("id", "status")) as { id: number; status: string }[];
    // Ties on the last-change time, so the tie-break shows.
    await db("jobs").whereIn("id", jobs.slice(100, 140).map((j) => j.id)).update({ updated_at: new Date("2026-11-20T10:00:00Z") });
    // Owners who answered long ago with nothing done since, and owners slow to answer.
    const inProgress = jobs.filter((j) => j.status === "in_progress").slice(0, 3);
    const waiting = jobs.filter((j) => j.status === "waiting_approval").slice(0, 2);
    const old = new Date(Date.now() - 20 * 86_400_000);
    for (const j of inProgress) await db("job_status_changes").insert({ shop_id: shopId, job_id: j.id, from_status: "waiting_approval", to_status: "in_progress", cause: "request_answered", changed_at: new Date() });
    for (const j of waiting) await db("job_status_changes").insert({ shop_id: shopId, job_id: j.id, from_status: "inspecting", to_status: "waiting_approval", cause: "request_sent", changed_at: old });
  }, 120_000);
  afterAll(async () => db?.destroy());

  const same = async (raw: Record<string, string>) => {
    const query = jobListQuerySchema.parse(raw);
    const now = await listJobs({ shopId, query, today: TODAY });
    const before = await oldBoard(db, shopId, query);
    expect(now.rows.map((r) => r.number), JSON.stringify(raw)).toEqual(before.numbers);
    expect(now.total, JSON.stringify(raw)).toBe(before.total);
    return now;
  };

  for (const sort of ["updated", "number", "status", "promised", "customer"]) {
    for (const dir of ["asc", "desc"]) {
      it(`sort ${sort} ${dir}: the same pages (first, second, middle, last)`, async () => {
        for (const page of ["1", "2", "15", "30"]) await same({ sort, dir, page, pageSize: "50" });
      });
    }
  }

  it("undated jobs last, whichever way", async () => {
    for (const dir of ["asc", "desc"]) {
      const all = (await same({ sort: "promised", dir, pageSize: "100", page: "8" })).rows.map((r) => r.promisedOn);
      const firstUndated = all.indexOf(null);
      expect(firstUndated).toBeGreaterThan(0); // page 8 of 15 holds the seam between dated and undated
      expect(all.slice(firstUndated).every((d) => d === null)).toBe(true);
    }
  });

  it("filters: statuses, technician, each quick filter and all of them, with sorts", async () => {
    const filters: Record<string, string>[] = [
      { status: "in_progress" },
      { status: "waiting_parts,ready" },
      { status: "picked_up" },
      { technician: String(tech) },
      ...["overdue", "waiting_parts", "answered", "ready_unpaid", "owner_slow"].map((attention) => ({ attention })),
      { attention: "overdue,waiting_parts,answered,ready_unpaid,owner_slow" },
    ];
    for (const f of filters) for (const sort of ["updated", "customer", "promised"]) await same({ ...f, sort, pageSize: "100" });
    // The seed has jobs in each quick filter, so these compare rows, not empty lists.
    for (const attention of ["overdue", "answered", "ready_unpaid", "owner_slow"]) expect((await same({ attention })).total, attention).toBeGreaterThan(0);
  });

  it("search by owner name, serial prefix and job number finds the same jobs", async () => {
    const [someone] = await db("customers").where({ shop_id: shopId }).orderBy("id").limit(1).offset(40).select("name");
    const surname = String(someone!.name).split(" ")[1]!;
    for (const q of [surname, surname.toLowerCase(), String(someone!.name), "SC00012", "sc0001", "J-0042", "j42"]) {
      const page = await same({ q, pageSize: "100", sort: "number" });
      expect(page.total, q).toBeGreaterThan(0);
    }
    await same({ q: surname, status: "picked_up", sort: "customer" });
    expect((await same({ q: "%" })).total).toBe(0);
    // A search counts its hits on the page it reads; a page past its end still says how many there are.
    const wide = await same({ q: "sc000", pageSize: "10" });
    expect(wide.total).toBeGreaterThan(10);
    const beyond = await same({ q: "sc000", pageSize: "10", page: "200" });
    expect([beyond.rows.length, beyond.total]).toEqual([0, wide.total]);
  });

  it("follows an owner's new name and a job moved to another owner (the triggers keep jobs.customer_name)", async () => {
    const job = await db("jobs").where({ shop_id: shopId, number: 77 }).first("id", "customer_id");
    await db("customers").where({ id: job!.customer_id }).update({ name: "Aalto Will" });
    const first = await same({ sort: "customer", dir: "asc", pageSize: "10" });
    expect(first.rows[0]!.customerName).toBe("Aalto Will");
    // "Will" is a stopword of InnoDB's default list; the index is built without one.
    expect((await same({ q: "will", sort: "number" })).rows.map((r) => r.number)).toContain(77);
    const other = await db("customers").where({ shop_id: shopId }).whereNot({ id: job!.customer_id }).orderBy("name").first("id", "name");
    await db("jobs").where({ id: job!.id }).update({ customer_id: other!.id });
    const moved = await same({ q: "aalto", sort: "number" });
    expect(moved.rows.map((r) => r.number)).not.toContain(77);
    await same({ sort: "customer", dir: "asc", pageSize: "25" });
  });

  it("follows a machine's new make, model and serial and a job moved to another machine (the triggers keep jobs.machine_*)", async () => {
    const job = await db("jobs").where({ shop_id: shopId, number: 88 }).first("id", "machine_id", "customer_name");
    // Every job of that machine (the made-up shop brings some machines back more than once).
    const ofMachine = ((await db("jobs").where({ machine_id: job!.machine_id }).orderBy("number", "desc").pluck("number")) as number[]).map(Number);
    expect(ofMachine).toContain(88);
    await db("machines").where({ id: job!.machine_id }).update({ make: "Quellmark", model: "Fjord 90", serial: "QZ-88-0001" });
    for (const q of ["quellmark", "Fjord", "QZ-88", "qz-88-0001"]) {
      expect((await same({ q, sort: "number" })).rows.map((r) => r.number), q).toEqual(ofMachine);
    }
    // A machine without a serial: the copy is '' (not NULL), and a serial search passes it by.
    await db("machines").where({ id: job!.machine_id }).update({ serial: null });
    expect((await db("jobs").where({ id: job!.id }).first("machine_serial"))!.machine_serial).toBe("");
    expect((await same({ q: "QZ-88", sort: "number" })).total).toBe(0);
    // The owner's name and the make in one search: words are looked for across the job's four columns.
    const surname = String(job!.customer_name).split(" ")[1]!;
    const both = await listJobs({ shopId, query: jobListQuerySchema.parse({ q: `${surname} Quellmark`, pageSize: "100" }), today: TODAY });
    expect(both.rows.map((r) => r.number)).toContain(88);
    expect(both.rows.every((r) => r.machine.make === "Quellmark" && r.customerName.includes(surname))).toBe(true);
    // The job moved to another machine reads that machine's words, at once.
    const other = await db("machines").where({ shop_id: shopId }).whereNot({ id: job!.machine_id }).orderBy("id").first("id", "make");
    await db("jobs").where({ id: job!.id }).update({ machine_id: other!.id });
    const left = await same({ q: "quellmark", sort: "number" });
    expect(left.rows.map((r) => r.number)).toEqual(ofMachine.filter((n) => n !== 88));
    expect((await db("jobs").where({ id: job!.id }).first("machine_make"))!.machine_make).toBe(other!.make);
    await same({ q: String(other!.make), sort: "number", pageSize: "100" });
  });
});
