import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { jobPageVersions } from "@/db/queries/page-versions";
import { PAGE_VERSION_SKIP, pageVersionRules, tablesWithoutPageVersions } from "@/db/page-versions";
import { testKnex } from "../support/db";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";

// The counters the page cache keys job pages on (db/page-versions.ts, lib/server/page-cache.ts):
// every table a page can show moves one, by triggers, whoever writes, so a page served again from
// memory is never older than the data. A new table without the triggers (or a reason to skip) fails here.

describe("page versions", () => {
  let k: Knex;
  let shop: Awaited<ReturnType<typeof makeShop>>;
  let other: Awaited<ReturnType<typeof makeShop>>;
  let jobId: number;
  let otherJobId: number;
  let publicId: string;
  let number: number;

  const versions = (ref = { area: "owner" as const, publicId }) => jobPageVersions(ref);

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "page-versions", roles: ["owner", "technician"] });
    other = await makeShop(k, { label: "page-versions-other" });
    const made = await makeCustomerWithJobs(k, shop.id, { name: "Tamsin Orrell", statuses: ["inspecting", "waiting_parts"] });
    [jobId, otherJobId] = made.jobIds as [number, number];
    const row = (await k("jobs").where({ id: jobId }).first("public_id", "number"))!;
    publicId = String(row.public_id);
    number = Number(row.number);
  });
  afterAll(async () => {
    await k.destroy();
  });

  it("every table is either versioned by triggers or skipped with a reason", async () => {
    expect(await tablesWithoutPageVersions(k)).toEqual([]);
    const rules = await pageVersionRules(k);
    const byTable = new Map(rules.map((r) => [r.table, r.scope]));
    // What a job page shows moves that job's counter; shop-wide records their shop's; people the instance's.
    expect(byTable.get("jobs")).toBe("job");
    expect(byTable.get("journal_entries")).toBe("job");
    expect(byTable.get("invoice_lines")).toBe("job");
    expect(byTable.get("finding_lines")).toBe("job");
    expect(byTable.get("shops")).toBe("shop");
    expect(byTable.get("customers")).toBe("shop");
    expect(byTable.get("memberships")).toBe("shop");
    expect(byTable.get("inbox_reads")).toBe("activity");
    expect(byTable.get("users")).toBe("all");
    for (const [table, why] of Object.entries(PAGE_VERSION_SKIP)) expect(why.length, table).toBeGreaterThan(10);
  });

  it("names the job by either address, and is null for an unknown one", async () => {
    const a = await versions();
    expect(a).toMatch(new RegExp(`^job:${jobId}:\\d+:shop:${shop.id}:\\d+:\\d+:\\d+$`));
    expect(await jobPageVersions({ area: "staff", shopSlug: shop.slug, number })).toBe(a);
    expect(await jobPageVersions({ area: "owner", publicId: "nosuchjob0000000" })).toBeNull();
    expect(await jobPageVersions({ area: "staff", shopSlug: other.slug, number })).toBeNull();
  });

  it("a note on the job moves it; a note on another job of the shop doesn't", async () => {
    const before = await versions();
    await k("journal_entries").insert({ shop_id: shop.id, job_id: otherJobId, kind: "note", visibility: "shared", caption: "Other job" });
    expect(await versions()).toBe(before);
    const [entryId] = await k("journal_entries").insert({ shop_id: shop.id, job_id: jobId, kind: "note", visibility: "shared", caption: "Oil drained" });
    const afterInsert = await versions();
    expect(afterInsert).not.toBe(before);
    await k("journal_entries").where({ id: entryId }).update({ caption: "Oil drained, metal on the plug" });
    const afterUpdate = await versions();
    expect(afterUpdate).not.toBe(afterInsert);
    await k("journal_entries").where({ id: entryId }).delete();
    expect(await versions()).not.toBe(afterUpdate);
  });

  it("a row that belongs to the job through its parent (a measurement set's item) moves that job only", async () => {
    const [setId] = await k("measurement_sets").insert({ shop_id: shop.id, job_id: jobId, kind: "custom", title: "Valve clearances", unit: "mm", source: "manual" });
    const before = await versions();
    const [otherSetId] = await k("measurement_sets").insert({ shop_id: shop.id, job_id: otherJobId, kind: "custom", title: "Other job", unit: "mm", source: "manual" });
    const otherBefore = await versions();
    expect(otherBefore).toBe(before);
    const item = { shop_id: shop.id, position: 1, item_key: "in-1", label: "Intake 1", value: 0.12, value_decimals: 2, limit_decimals: 2, verdict: "within" as const };
    await k("measurement_items").insert({ ...item, set_id: otherSetId });
    expect(await versions()).toBe(before);
    await k("measurement_items").insert({ ...item, set_id: setId });
    expect(await versions()).not.toBe(before);
  });

  it("the shop's own settings move its counter, people's names the instance's", async () => {
    const before = await versions();
    await k("shops").where({ id: shop.id }).update({ name: `Renamed ${shop.slug}` });
    const afterShop = await versions();
    expect(afterShop).not.toBe(before);
    await k("users").where({ id: shop.staff.technician!.id }).update({ name: "Wendell Ashgrove" });
    expect(await versions()).not.toBe(afterShop);
  });

  it("an event in the shop (the staff pages' inbox count and live cursor) moves its activity counter", async () => {
    const before = (await versions())!.split(":");
    await k("shop_events").insert({ shop_id: shop.id, job_id: otherJobId, kind: "owner_question", inbox: true, owner_visible: false, payload: "{}" });
    const after = (await versions())!.split(":");
    expect(after.slice(0, 3)).toEqual(before.slice(0, 3)); // not this job's counter
    expect(after[6]).not.toBe(before[6]); // the shop's activity
  });
});
