import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { listJobs } from "@/db/queries/jobs";
import { jobAttention, toBoardRow } from "@/lib/jobs-view";
import { jobListQuerySchema } from "@/lib/schemas/jobs";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";

describe("job board query", () => {
  let db: Knex;
  let shopId: number;

  beforeAll(async () => {
    db = testKnex();
    const shop = await makeShop(db, { label: "board" });
    shopId = shop.id;
    await makeCustomerWithJobs(db, shopId, { name: "Zed Acker", statuses: Array.from({ length: 15 }, () => "in_progress" as const) });
    await makeCustomerWithJobs(db, shopId, { name: "Bea Quill", statuses: Array.from({ length: 8 }, () => "waiting_parts" as const) });
    // Promised dates on a few jobs only, to see where undated ones sort.
    await db("jobs").where({ shop_id: shopId }).whereIn("number", [3, 7, 20]).update({ promised_on: "2026-12-10" });
    await db("jobs").where({ shop_id: shopId, number: 7 }).update({ promised_on: "2026-12-05" });
  });
  afterAll(async () => db?.destroy());

  const page = (raw: Record<string, string>) => listJobs({ shopId, query: jobListQuerySchema.parse(raw) });

  it("pages on the server: 23 jobs in pages of 10 are 10 + 10 + 3, none twice", async () => {
    const pages = await Promise.all(["1", "2", "3"].map((p) => page({ page: p, pageSize: "10", sort: "number", dir: "asc" })));
    expect(pages.map((p) => p.rows.length)).toEqual([10, 10, 3]);
    expect(pages.every((p) => p.total === 23 && p.pageCount === 3)).toBe(true);
    const numbers = pages.flatMap((p) => p.rows.map((r) => r.number));
    expect(numbers).toEqual(Array.from({ length: 23 }, (_, i) => i + 1));
    expect((await page({ page: "4", pageSize: "10" })).rows).toEqual([]);
  });

  it("sorts by owner name either way", async () => {
    const asc = await page({ sort: "customer", dir: "asc", pageSize: "100" });
    expect(asc.rows[0]!.customerName).toBe("Bea Quill");
    expect(asc.rows.at(-1)!.customerName).toBe("Zed Acker");
    const desc = await page({ sort: "customer", dir: "desc", pageSize: "100" });
    expect(desc.rows[0]!.customerName).toBe("Zed Acker");
  });

  it("sorts by promised date with undated jobs last, both ways", async () => {
    const asc = await page({ sort: "promised", dir: "asc", pageSize: "100" });
    expect(asc.rows.slice(0, 3).map((r) => r.number)).toEqual([7, 20, 3]);
    expect(asc.rows[3]!.promisedOn).toBeNull();
    const desc = await page({ sort: "promised", dir: "desc", pageSize: "100" });
    expect(desc.rows.slice(0, 3).map((r) => r.promisedOn)).toEqual(["2026-12-10", "2026-12-10", "2026-12-05"]);
    expect(desc.rows.at(-1)!.promisedOn).toBeNull();
  });

  it("filters by several statuses and combines filters with search", async () => {
    expect((await page({ status: "waiting_parts" })).total).toBe(8);
    expect((await page({ status: "waiting_parts,in_progress" })).total).toBe(23);
    expect((await page({ status: "waiting_parts", q: "Acker" })).total).toBe(0);
    expect((await page({ status: "in_progress", q: "acker" })).total).toBe(15);
  });
});

describe("job board quick filters: overdue and waiting on parts", () => {
  let db: Knex;
  let shopId: number;
  const TODAY = "2026-12-01";
  // Job number → status and promised date. Numbers count from 1 in this shop, in this order.
  const JOBS = [
    { status: "in_progress", promised: "2026-11-28" }, // 1: overdue
    { status: "waiting_parts", promised: "2026-11-30" }, // 2: overdue and waiting on parts
    { status: "waiting_parts", promised: null }, // 3: waiting on parts, no date
    { status: "ready", promised: "2026-11-01" }, // 4: ready: a passed date no longer counts
    { status: "picked_up", promised: "2026-10-01" }, // 5: collected
    { status: "in_progress", promised: TODAY }, // 6: due today, not yet late
    { status: "checked_in", promised: "2026-12-05" }, // 7: due later
    { status: "inspecting", promised: null }, // 8: no date
  ] as const;

  beforeAll(async () => {
    db = testKnex();
    shopId = (await makeShop(db, { label: "board-attention" })).id;
    const { jobIds } = await makeCustomerWithJobs(db, shopId, { name: "Lio Fairweather", serial: "GVH8-17-99001", statuses: JOBS.map((j) => j.status) });
    for (const [i, job] of JOBS.entries()) await db("jobs").where({ id: jobIds[i] }).update({ promised_on: job.promised });
  });
  afterAll(async () => db?.destroy());

  const numbers = async (raw: Record<string, string>, today = TODAY) => {
    const page = await listJobs({ shopId, query: jobListQuerySchema.parse({ sort: "number", dir: "asc", ...raw }), today });
    return page.rows.map((r) => r.number);
  };

  // common trade practice, no published source: late means past the promised day and not yet
  // ready or collected; a job due today is not late yet.
  it("overdue: past the promised date and still being worked on", async () => {
    expect(await numbers({ attention: "overdue" })).toEqual([1, 2]);
    // A day later, the job due today has become late too.
    expect(await numbers({ attention: "overdue" }, "2026-12-02")).toEqual([1, 2, 6]);
  });

  it("waiting on parts, alone, with overdue (either), and with a status filter (both)", async () => {
    expect(await numbers({ attention: "waiting_parts" })).toEqual([2, 3]);
    expect(await numbers({ attention: "overdue,waiting_parts" })).toEqual([1, 2, 3]);
    expect(await numbers({ attention: "overdue", status: "waiting_parts" })).toEqual([2]);
    expect(await numbers({ attention: "overdue", q: "nobody-by-this-name" })).toEqual([]);
  });

  it("marks the same rows in the browser as the filter finds on the server", async () => {
    const all = await listJobs({ shopId, query: jobListQuerySchema.parse({ sort: "number", dir: "asc" }), today: TODAY });
    const flagged = (flag: "overdue" | "waiting_parts") => all.rows.filter((r) => jobAttention(toBoardRow(r), TODAY).includes(flag)).map((r) => r.number);
    expect(flagged("overdue")).toEqual(await numbers({ attention: "overdue" }));
    expect(flagged("waiting_parts")).toEqual(await numbers({ attention: "waiting_parts" }));
  });

  it("finds jobs by part of the machine's serial", async () => {
    expect(await numbers({ q: "99001" })).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
    expect(await numbers({ q: "gvh8-17" })).toHaveLength(8);
    expect(await numbers({ q: "GVH9" })).toEqual([]);
  });

  describe("whom a job waits on, and the quick filters that follow from it", () => {
    let own: number;
    const at = (daysAgo: number) => new Date(Date.now() - daysAgo * 86_400_000);
    const board = async (raw: Record<string, string>) => (await listJobs({ shopId: own, query: jobListQuerySchema.parse({ sort: "number", dir: "asc", ...raw }) })).rows;

    beforeAll(async () => {
      const shop = await makeShop(db, { label: "waits" });
      own = shop.id;
      await db("shops").where({ id: own }).update({ owner_wait_days: 3 });
      // 1: waiting on the owner 5 days; 2: waiting on the owner 1 day; 3: owner answered, nothing done
      // since; 4: owner answered, a note posted after; 5: ready, invoice issued and unpaid; 6: ready, paid.
      const { jobIds } = await makeCustomerWithJobs(db, own, { name: "Ivo Brand", statuses: ["waiting_approval", "waiting_approval", "in_progress", "in_progress", "ready", "ready"] });
      const change = (i: number, to: string, cause: string, when: Date) =>
        db("job_status_changes").insert({ shop_id: own, job_id: jobIds[i]!, from_status: "inspecting", to_status: to as "ready", cause, changed_at: when });
      await change(0, "waiting_approval", "request_sent", at(5));
      await change(1, "waiting_approval", "request_sent", at(1));
      await change(2, "in_progress", "request_answered", at(2));
      await change(3, "in_progress", "request_answered", at(2));
      await db("journal_entries").insert({ shop_id: own, job_id: jobIds[3]!, kind: "note", visibility: "shop", created_at: at(1) });
      const invoice = (i: number, status: "issued" | "paid", balance: number) =>
        db("invoices").insert({ shop_id: own, job_id: jobIds[i]!, public_id: `inv${i}${own}`.padEnd(16, "x").slice(0, 16), number: i + 1, status, currency: "USD", totals: "{}", balance_minor: balance });
      await invoice(4, "issued", 5000);
      await invoice(5, "paid", 0);
    });

    it("each row says whom it waits on and what comes next", async () => {
      const rows = (await board({})).map((r) => toBoardRow(r));
      expect(rows.map((r) => r.waitingOn)).toEqual(["owner", "owner", "shop", "shop", "payment", "owner"]);
      expect(rows[4]!.next).toBe("Take payment");
      expect(rows[2]!.answeredNotStarted).toBe(true);
      expect(rows[3]!.answeredNotStarted).toBe(false);
    });

    it("filters: owner slow past the shop's N days, answered but not started, ready but unpaid", async () => {
      expect((await board({ attention: "owner_slow" })).map((r) => r.number)).toEqual([1]);
      expect((await board({ attention: "answered" })).map((r) => r.number)).toEqual([3]);
      expect((await board({ attention: "ready_unpaid" })).map((r) => r.number)).toEqual([5]);
      // The browser marks the same rows the server finds.
      const all = (await board({})).map((r) => toBoardRow(r));
      for (const flag of ["owner_slow", "answered", "ready_unpaid"] as const) {
        expect(all.filter((r) => jobAttention(r, "2026-12-01").includes(flag)).map((r) => r.number)).toEqual((await board({ attention: flag })).map((r) => r.number));
      }
      await db("shops").where({ id: own }).update({ owner_wait_days: 1 });
      expect((await board({ attention: "owner_slow" })).map((r) => r.number)).toEqual([1, 2]);
      await db("shops").where({ id: own }).update({ owner_wait_days: 3 });
    });

    it("a page costs the same number of queries whatever its size", async () => {
      const count = async (pageSize: string) => {
        let n = 0;
        const on = () => n++;
        const k = (await import("@/db/client")).db();
        k.on("query", on);
        try {
          await board({ pageSize, attention: "owner_slow,answered,ready_unpaid,overdue" });
          await board({ pageSize });
        } finally {
          k.off("query", on);
        }
        return n;
      };
      expect(await count("10")).toBe(await count("100"));
      expect(await count("10")).toBeLessThanOrEqual(4);
    });
  });
});

