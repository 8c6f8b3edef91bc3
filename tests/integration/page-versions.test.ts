import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { jobPageVersions } from "@/db/queries/page-versions";
import { PAGE_VERSION_SKIP, addPageVersionTriggers, dropPageVersionTriggers, pageVersionRules, tablesWithoutPageVersions } from "@/db/page-versions";
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
    expect(byTable.get("users")).toBe("all");
    for (const [table, why] of Object.entries(PAGE_VERSION_SKIP)) expect(why.length, table).toBeGreaterThan(10);
  });

  it("finds a table whose triggers are missing or no longer match its columns", async () => {
    await k.raw("CREATE TABLE pv_probe (id INT UNSIGNED AUTO_INCREMENT PRIMARY KEY, job_id INT UNSIGNED NULL)");
    try {
      expect(await tablesWithoutPageVersions(k)).toEqual(["pv_probe"]);
      await addPageVersionTriggers(k, "pv_probe");
      expect(await tablesWithoutPageVersions(k)).toEqual([]);
      // A job column given later: its old triggers would move nothing for it.
      await k.raw("ALTER TABLE pv_probe CHANGE job_id shop_id INT UNSIGNED NULL");
      expect(await tablesWithoutPageVersions(k)).toEqual(["pv_probe"]);
      await dropPageVersionTriggers(k, "pv_probe");
      await addPageVersionTriggers(k, "pv_probe");
      expect(await tablesWithoutPageVersions(k)).toEqual([]);
    } finally {
      await k.raw("DROP TABLE pv_probe");
    }
  });

  it("names the job by either address, and is null for an unknown one", async () => {
    const a = await versions();
    expect(a).toEqual({ shopId: shop.id, versions: expect.stringMatching(new RegExp(`^job:${jobId}:\\d+:shop:${shop.id}:\\d+:all:\\d+$`)) });
    expect(await jobPageVersions({ area: "staff", shopSlug: shop.slug, number })).toEqual(a);
    expect(await jobPageVersions({ area: "owner", publicId: "nosuchjob0000000" })).toBeNull();
    expect(await jobPageVersions({ area: "staff", shopSlug: other.slug, number })).toBeNull();
  });

  it("a note on the job moves it; a note on another job of the shop doesn't", async () => {
    const before = await versions();
    await k("journal_entries").insert({ shop_id: shop.id, job_id: otherJobId, kind: "note", visibility: "shared", caption: "Other job" });
    expect(await versions()).toEqual(before);
    const [entryId] = await k("journal_entries").insert({ shop_id: shop.id, job_id: jobId, kind: "note", visibility: "shared", caption: "Oil drained" });
    const afterInsert = await versions();
    expect(afterInsert).not.toBe(before);
    await k("journal_entries").where({ id: entryId }).update({ caption: "Oil drained, metal on the plug" });
    const afterUpdate = await versions();
    expect(afterUpdate).not.toBe(afterInsert);
    await k("journal_entries").where({ id: entryId }).delete();
    expect(await versions()).not.toEqual(afterUpdate);
  });

  it("a row that belongs to the job through its parent (a measurement set's item) moves that job only", async () => {
    const [setId] = await k("measurement_sets").insert({ shop_id: shop.id, job_id: jobId, kind: "custom", title: "Valve clearances", unit: "mm", source: "manual" });
    const before = await versions();
    const [otherSetId] = await k("measurement_sets").insert({ shop_id: shop.id, job_id: otherJobId, kind: "custom", title: "Other job", unit: "mm", source: "manual" });
    const otherBefore = await versions();
    expect(otherBefore).toEqual(before);
    const item = { shop_id: shop.id, position: 1, item_key: "in-1", label: "Intake 1", value: 0.12, value_decimals: 2, limit_decimals: 2, verdict: "within" as const };
    await k("measurement_items").insert({ ...item, set_id: otherSetId });
    expect(await versions()).toEqual(before);
    await k("measurement_items").insert({ ...item, set_id: setId });
    expect(await versions()).not.toEqual(before);
  });

  it("the shop's own settings move its counter; a person's name the instance's, a sign-in nothing", async () => {
    const before = await versions();
    await k("shops").where({ id: shop.id }).update({ name: `Renamed ${shop.slug}` });
    const afterShop = await versions();
    expect(afterShop).not.toEqual(before);
    await k("users").where({ id: shop.staff.technician!.id }).update({ last_sign_in_at: k.fn.now() });
    expect(await versions()).toEqual(afterShop);
    await k("users").where({ id: shop.staff.technician!.id }).update({ name: "Wendell Ashgrove" });
    expect(await versions()).not.toEqual(afterShop);
  });

  it("events in the shop move only their own job's counter, and one for no job moves none", async () => {
    const before = await versions();
    await k("shop_events").insert({ shop_id: shop.id, job_id: otherJobId, kind: "owner_question", inbox: true, owner_visible: false, payload: "{}" });
    await k("shop_events").insert({ shop_id: shop.id, job_id: null, kind: "booking_request", inbox: true, owner_visible: false, payload: "{}" });
    expect(await versions()).toEqual(before);
    expect(await k("page_versions").where({ scope: "job", ref: 0 }).first()).toBeUndefined();
    await k("shop_events").insert({ shop_id: shop.id, job_id: jobId, kind: "job_changed", inbox: false, owner_visible: true, payload: "{}" });
    expect(await versions()).not.toEqual(before);
  });

  it("writers on two jobs of one shop never wait for each other's commit", async () => {
    // A slow transaction on one job holds that job's counter row only: an event on another job commits at once.
    let release!: () => void;
    const held = new Promise<void>((r) => (release = r));
    const slow = k.transaction(async (tx) => {
      await tx("shop_events").insert({ shop_id: shop.id, job_id: jobId, kind: "entry_added", inbox: false, owner_visible: false, payload: "{}" });
      await held;
    });
    await new Promise((r) => setTimeout(r, 100));
    const started = Date.now();
    await k("shop_events").insert({ shop_id: shop.id, job_id: otherJobId, kind: "entry_added", inbox: false, owner_visible: false, payload: "{}" });
    expect(Date.now() - started).toBeLessThan(1000);
    release();
    await slow;
  });
});
