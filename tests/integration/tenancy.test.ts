import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { getJobByNumber, listJobs, listJobsForCustomerUser } from "@/db/queries/jobs";
import { jobListQuerySchema } from "@/lib/schemas/jobs";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";

describe("a shop's queries never return another shop's rows", () => {
  let db: Knex;
  let shopA: Awaited<ReturnType<typeof makeShop>>;
  let shopB: Awaited<ReturnType<typeof makeShop>>;
  let bJobIds: number[];
  let customerUserId: number;

  beforeAll(async () => {
    db = testKnex();
    shopA = await makeShop(db, { label: "tenancy-a" });
    shopB = await makeShop(db, { label: "tenancy-b" });
    await makeCustomerWithJobs(db, shopA.id, { name: "Alma Vey", serial: "SHARED-SERIAL-1", statuses: ["checked_in", "in_progress", "ready"] });
    // Shop B has the same customer name, serial and job numbers on purpose: only shop_id tells them apart.
    const b = await makeCustomerWithJobs(db, shopB.id, { name: "Alma Vey", serial: "SHARED-SERIAL-1", statuses: ["checked_in", "in_progress", "ready", "picked_up"] });
    bJobIds = b.jobIds;
    const [userId] = await db("users").insert({ email: `alma.${shopB.slug}@mail.test`, name: "Alma Vey" });
    customerUserId = Number(userId);
    await db("customers").where({ id: b.customerId }).update({ user_id: customerUserId });
  });
  afterAll(async () => db?.destroy());

  const queries = [
    {},
    { q: "Alma" },
    { q: "SHARED-SERIAL" },
    { q: "J-0002" },
    { q: "2" },
    { status: "ready,picked_up" },
    { sort: "customer", dir: "asc" },
    { page: "2", pageSize: "10" },
  ];

  for (const raw of queries) {
    it(`listJobs ${JSON.stringify(raw)} stays in shop A`, async () => {
      const page = await listJobs({ shopId: shopA.id, query: jobListQuerySchema.parse(raw) });
      for (const row of page.rows) {
        expect(row.shopId).toBe(shopA.id);
        expect(bJobIds).not.toContain(row.id);
      }
      expect(page.total).toBeLessThanOrEqual(3);
    });
  }

  it("finds the right rows, not just none", async () => {
    expect((await listJobs({ shopId: shopA.id, query: jobListQuerySchema.parse({ q: "Alma" }) })).total).toBe(3);
    expect((await listJobs({ shopId: shopB.id, query: jobListQuerySchema.parse({ q: "Alma" }) })).total).toBe(4);
    const ready = await listJobs({ shopId: shopA.id, query: jobListQuerySchema.parse({ status: "ready" }) });
    expect(ready.rows.map((r) => r.status)).toEqual(["ready"]);
    const byNumber = await listJobs({ shopId: shopA.id, query: jobListQuerySchema.parse({ q: "J-0002" }) });
    expect(byNumber.rows.map((r) => r.number)).toEqual([2]);
  });

  it("a job number looked up in shop A is shop A's job", async () => {
    const job = await getJobByNumber({ shopId: shopA.id, number: 4 });
    expect(job).toBeNull(); // shop B has a job 4; shop A does not
    const two = await getJobByNumber({ shopId: shopA.id, number: 2 });
    expect(two?.shopId).toBe(shopA.id);
  });

  it("a signed-in customer sees only jobs linked to them", async () => {
    const mine = await listJobsForCustomerUser({ userId: customerUserId });
    expect(mine.map((j) => j.id).sort()).toEqual([...bJobIds].sort());
  });

  it("treats LIKE wildcards in a search as plain text", async () => {
    const page = await listJobs({ shopId: shopA.id, query: jobListQuerySchema.parse({ q: "%" }) });
    expect(page.total).toBe(0);
  });
});
