import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { listJobs } from "@/db/queries/jobs";
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
