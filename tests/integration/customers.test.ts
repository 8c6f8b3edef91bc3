import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { CUSTOMER_REFERENCES, mergeCustomers } from "@/db/queries/customer-merge";
import { getCustomerDetail, listCustomers } from "@/db/queries/customers";
import { getMachineHistory } from "@/db/queries/machines";
import type { Actor } from "@/lib/permissions";
import { access } from "@/lib/server/access";
import { mergeDuplicate, saveContact } from "@/lib/server/customers";
import { contactFormSchema, customerListQuerySchema } from "@/lib/schemas/customers";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";

type Shop = Awaited<ReturnType<typeof makeShop>>;
const actorOf = (shop: Shop, role: "owner" | "technician" | "service_writer"): Actor => ({
  userId: shop.staff[role]!.id,
  email: shop.staff[role]!.email,
  name: role,
  memberships: [{ shopId: shop.id, shopSlug: shop.slug, shopName: shop.slug, role }],
});

let k: Knex;
let shop: Shop;
let other: Shop;

beforeAll(async () => {
  k = testKnex();
  shop = await makeShop(k, {
    label: "customers",
    roles: ["owner", "service_writer", "technician"],
  });
  other = await makeShop(k, { label: "customers-other", roles: ["owner"] });
});
afterAll(async () => k?.destroy());

describe("customer list", () => {
  let listShop: Shop;
  const page = (raw: Record<string, string>, pageSize = 10) =>
    listCustomers({
      shopId: listShop.id,
      query: customerListQuerySchema.parse(raw),
      pageSize,
    });

  beforeAll(async () => {
    listShop = await makeShop(k, { label: "customer-list" });
    // 23 customers "Cust 01" … "Cust 23", one machine and one job each; a few with findable details.
    for (let i = 1; i <= 23; i++) {
      await makeCustomerWithJobs(k, listShop.id, {
        name: `Cust ${String(i).padStart(2, "0")}`,
        statuses: i % 2 ? ["picked_up"] : ["in_progress", "picked_up"],
      });
    }
    const made = await makeCustomerWithJobs(k, listShop.id, {
      name: "Ilse Rowan",
      email: "ilse.rowan@mail.test",
      serial: "QX7-ROWAN-5521",
      statuses: [],
    });
    await k("customers").where({ id: made.customerId }).update({ phone: "+1 (555) 013-2290" });
    await k("machines").where({ id: made.machineId }).update({ make: "Brindle", model: "Trailmoth 450" });
  });

  it("pages on the server: 24 customers in pages of 10 are 10 + 10 + 4, by name, none twice", async () => {
    const pages = await Promise.all(["1", "2", "3"].map((p) => page({ page: p })));
    expect(pages.map((p) => p.rows.length)).toEqual([10, 10, 4]);
    expect(pages.every((p) => p.total === 24 && p.pageCount === 3)).toBe(true);
    const names = pages.flatMap((p) => p.rows.map((r) => r.name));
    expect(new Set(names).size).toBe(24);
    expect(names.slice(0, 2)).toEqual(["Cust 01", "Cust 02"]);
    expect(names.at(-1)).toBe("Ilse Rowan");
    expect((await page({ page: "4" })).rows).toEqual([]);
  });

  it("shows each customer's machines and job counts", async () => {
    const [c2] = (await page({ q: "Cust 02" })).rows;
    expect(c2).toMatchObject({ name: "Cust 02", jobCount: 2, openJobCount: 1 });
    expect(c2!.machines).toHaveLength(1);
    expect(c2!.machines[0]!.make).toBe("Testmake");
  });

  it("searches name, e-mail, phone digits and machine make, model and serial", async () => {
    for (const q of ["rowan", "ilse.rowan@", "0132290", "555 013", "Brindle", "trailmoth", "QX7-ROWAN"]) {
      const found = await page({ q });
      expect(
        found.rows.map((r) => r.name),
        q,
      ).toEqual(["Ilse Rowan"]);
      expect(found.total, q).toBe(1);
    }
    // LIKE wildcards typed by someone are literal characters.
    expect((await page({ q: "%" })).total).toBe(0);
    expect((await page({ q: "Cust 1" })).total).toBe(10);
  });

  it("a page costs the same number of queries whatever its size", async () => {
    const count = async (pageSize: number) => {
      let n = 0;
      const on = () => n++;
      const client = (await import("@/db/client")).db();
      client.on("query", on);
      try {
        await page({}, pageSize);
        await page({ q: "testmake" }, pageSize);
      } finally {
        client.off("query", on);
      }
      return n;
    };
    expect(await count(3)).toBe(await count(25));
    expect(await count(3)).toBeLessThanOrEqual(6);
  });

  it("never lists another shop's customers", async () => {
    await makeCustomerWithJobs(k, other.id, {
      name: "Cust 99 elsewhere",
      statuses: [],
    });
    expect((await page({ q: "Cust 99" })).total).toBe(0);
  });
});

describe("customer page and machine history", () => {
  let made: Awaited<ReturnType<typeof makeCustomerWithJobs>>;

  beforeAll(async () => {
    made = await makeCustomerWithJobs(k, shop.id, {
      name: "Orla Penhale",
      email: "orla.penhale@mail.test",
      statuses: ["picked_up", "in_progress"],
    });
    const [first, second] = made.jobIds as [number, number];
    await k("jobs")
      .where({ id: first })
      .update({ created_at: new Date("2026-05-02T10:00:00Z") });
    await k("jobs")
      .where({ id: second })
      .update({ created_at: new Date("2026-11-20T10:00:00Z") });
    // Chain wear on each visit, and a reading of another kind on the second.
    const reading = (jobId: number, label: string, value: number, at: string) =>
      k("readings").insert({
        shop_id: shop.id,
        job_id: jobId,
        label,
        value,
        unit: "%",
        verdict: "within",
        created_at: new Date(at),
      });
    await reading(first, "Chain wear", 1.2, "2026-05-02T11:00:00Z");
    await reading(second, "Chain wear", 2.6, "2026-11-20T11:00:00Z");
    await reading(second, "Rear brake pad", 3.1, "2026-11-20T11:30:00Z");
    await k("job_parts").insert([
      {
        shop_id: shop.id,
        job_id: first,
        description: "Chain 520 x 114",
        qty_thousandths: 1000,
        cost_minor: 8950,
        status: "fitted",
      },
      {
        shop_id: shop.id,
        job_id: second,
        description: "Brake pads, rear",
        qty_thousandths: 1000,
        cost_minor: 3400,
        status: "received",
      },
      {
        shop_id: shop.id,
        job_id: second,
        description: "Clutch cable",
        qty_thousandths: 1000,
        cost_minor: 2100,
        status: "ordered",
      },
    ]);
    await k("torque_records").insert({
      shop_id: shop.id,
      job_id: first,
      fastener: "Rear axle nut",
      spec_value: 98,
      unit: "nm",
      applied_value: 98,
      pass_percents: "[]",
    });
  });

  it("the customer page lists their machine and both jobs, newest first", async () => {
    const detail = await getCustomerDetail({
      shopId: shop.id,
      customerId: made.customerId,
    });
    expect(detail.machines.map((m) => [m.id, m.jobCount])).toEqual([[made.machineId, 2]]);
    expect(detail.jobs.map((j) => j.id)).toEqual([made.jobIds[1], made.jobIds[0]]);
    expect(detail.jobs[0]).toMatchObject({
      status: "in_progress",
      machineId: made.machineId,
    });
  });

  it("the machine's history spans both jobs: readings by date, parts that arrived, torque, newest first", async () => {
    const h = await getMachineHistory({
      shopId: shop.id,
      machineId: made.machineId,
    });
    const numbers = (await k("jobs").whereIn("id", made.jobIds).orderBy("id").select("number")).map((r) => Number(r.number));
    expect(h.jobs.map((j) => j.number)).toEqual([numbers[1], numbers[0]]);
    const chain = h.readings.filter((r) => r.label === "Chain wear");
    expect(chain.map((r) => [r.at.toISOString().slice(0, 10), r.value, r.jobNumber])).toEqual([
      ["2026-11-20", 2.6, numbers[1]],
      ["2026-05-02", 1.2, numbers[0]],
    ]);
    expect(h.readings).toHaveLength(3);
    // The ordered cable hasn't reached the machine: not history.
    expect(h.parts.map((p) => [p.description, p.status]).sort()).toEqual([
      ["Brake pads, rear", "received"],
      ["Chain 520 x 114", "fitted"],
    ]);
    expect(h.torque).toEqual([
      expect.objectContaining({
        fastener: "Rear axle nut",
        specValue: 98,
        unit: "nm",
        jobNumber: numbers[0],
      }),
    ]);
  });

  it("customers and machines resolve only for staff of their own shop (404 otherwise)", async () => {
    const tech = actorOf(shop, "technician");
    const found = await access(tech, "customer", made.customerId, "customer:view", { shop: shop.slug });
    expect(found.customer.name).toBe("Orla Penhale");
    expect(
      (
        await access(tech, "machine", made.machineId, "customer:view", {
          shop: shop.slug,
        })
      ).machine.customerId,
    ).toBe(made.customerId);
    const outsider = actorOf(other, "owner");
    // Asked through the other shop's address: not a customer there.
    await expect(
      access(outsider, "customer", made.customerId, "customer:view", {
        shop: other.slug,
      }),
    ).rejects.toMatchObject({ code: "not_found" });
    await expect(
      access(outsider, "machine", made.machineId, "customer:view", {
        shop: other.slug,
      }),
    ).rejects.toMatchObject({ code: "not_found" });
    // Asked through this shop's address: not their shop.
    await expect(
      access(outsider, "customer", made.customerId, "customer:view", {
        shop: shop.slug,
      }),
    ).rejects.toMatchObject({ code: "forbidden" });
    await expect(
      access(tech, "customer", made.customerId, "customer:merge", {
        shop: shop.slug,
      }),
    ).rejects.toMatchObject({ code: "forbidden" });
  });

  it("contact details save with the preferred way, and a taken e-mail is refused beside its field", async () => {
    const tech = actorOf(shop, "technician");
    const found = await access(tech, "customer", made.customerId, "customer:edit", { shop: shop.slug });
    const form = (fields: Record<string, string>) =>
      contactFormSchema.parse({
        shop: shop.slug,
        customer: String(made.customerId),
        ...fields,
      }).contact;
    await saveContact(
      found,
      form({
        name: "Orla Penhale",
        email: "orla.penhale@mail.test",
        phone: "555 0100",
        contactPreference: "text",
      }),
    );
    expect(await k("customers").where({ id: made.customerId }).first("phone", "contact_preference")).toEqual({ phone: "555 0100", contact_preference: "text" });

    const bad = contactFormSchema.safeParse({
      shop: shop.slug,
      customer: String(made.customerId),
      name: "Orla",
      email: "",
      phone: "",
      contactPreference: "email",
    });
    expect(bad.success).toBe(false);
    expect(bad.error!.issues.map((i) => i.path.join("."))).toEqual(expect.arrayContaining(["email", "contactPreference"]));

    await makeCustomerWithJobs(k, shop.id, {
      name: "Someone Else",
      email: "taken@mail.test",
      statuses: [],
    });
    await expect(saveContact(found, form({ name: "Orla Penhale", email: "taken@mail.test" }))).rejects.toMatchObject({
      code: "conflict",
      fields: { email: [expect.any(String)] },
    });
    expect((await k("customers").where({ id: made.customerId }).first("email"))!.email).toBe("orla.penhale@mail.test");

    // A new address links the account that has it (and only that one); the old link goes with the old address.
    const [userId] = await k("users").insert({ email: `orla.${shop.slug}@mail.test`, name: "Orla Penhale" });
    await saveContact(found, form({ name: "Orla Penhale", email: `orla.${shop.slug}@mail.test` }));
    expect((await k("customers").where({ id: made.customerId }).first("user_id"))!.user_id).toBe(Number(userId));
    await saveContact(found, form({ name: "Orla Penhale", email: `orla.new.${shop.slug}@mail.test`, phone: "555 0100" }));
    expect((await k("customers").where({ id: made.customerId }).first("user_id"))!.user_id).toBeNull();
  });
});

describe("merging two records of one customer", () => {
  const snapshot = async (shopId: number) => ({
    jobs: await k("jobs").where({ shop_id: shopId }).orderBy("id").select("id", "customer_id", "machine_id"),
    machines: await k("machines").where({ shop_id: shopId }).orderBy("id").select("id", "customer_id"),
    customers: await k("customers").where({ shop_id: shopId }).orderBy("id").select("id", "email", "phone", "user_id"),
    merges: await k("customer_merges").where({ shop_id: shopId }).count({ n: "*" }).first(),
  });

  it("knows every column that points at a customer", async () => {
    const fks = await k("information_schema.KEY_COLUMN_USAGE")
      .where({
        TABLE_SCHEMA: k.client.database(),
        REFERENCED_TABLE_NAME: "customers",
        REFERENCED_COLUMN_NAME: "id",
      })
      .select("TABLE_NAME as table", "COLUMN_NAME as column");
    const key = (r: { table: string; column: string }) => `${r.table}.${r.column}`;
    expect(fks.map(key).sort()).toEqual(CUSTOMER_REFERENCES.map(key).sort());
  });

  it("moves every job, machine and follower link to the kept record, fills its gaps and records the merge", async () => {
    const s = await makeShop(k, { label: "merge", roles: ["service_writer"] });
    const [userId] = await k("users").insert({
      email: `dup.${s.slug}@mail.test`,
      name: "Tam Okafor",
    });
    const kept = await makeCustomerWithJobs(k, s.id, {
      name: "Tam Okafor",
      statuses: ["picked_up"],
    });
    await k("customers").where({ id: kept.customerId }).update({ phone: "555 0199" });
    const dup = await makeCustomerWithJobs(k, s.id, {
      name: "Tam Okafor (web)",
      email: `dup.${s.slug}@mail.test`,
      userId: Number(userId),
      statuses: ["in_progress", "ready"],
    });
    await k("job_subscribers").insert({
      shop_id: s.id,
      job_id: dup.jobIds[0]!,
      email: "friend@mail.test",
      role: "follower",
    });
    const before = await snapshot(s.id);

    const writer = actorOf(s, "service_writer");
    const found = await access(writer, "customer", kept.customerId, "customer:merge", { shop: s.slug });
    const { moved } = await mergeDuplicate(writer, found, dup.customerId);

    const after = await snapshot(s.id);
    expect(after.jobs.map((j) => j.id)).toEqual(before.jobs.map((j) => j.id));
    expect(after.jobs.every((j) => Number(j.customer_id) === kept.customerId)).toBe(true);
    expect(after.machines.map((m) => [m.id, Number(m.customer_id)])).toEqual([
      [kept.machineId, kept.customerId],
      [dup.machineId, kept.customerId],
    ]);
    // The kept record keeps its phone and takes the e-mail and sign-in it lacked.
    expect(after.customers).toEqual([
      {
        id: kept.customerId,
        email: `dup.${s.slug}@mail.test`,
        phone: "555 0199",
        user_id: Number(userId),
      },
    ]);
    expect(moved).toEqual({
      jobIds: dup.jobIds,
      machineIds: [dup.machineId],
      took: ["email", "user_id"],
    });
    expect(await k("job_subscribers").where({ job_id: dup.jobIds[0]! }).first("email")).toEqual({ email: "friend@mail.test" });
    const record = await k("customer_merges").where({ shop_id: s.id }).first();
    expect(record).toMatchObject({
      kept_customer_id: kept.customerId,
      removed_customer_id: dup.customerId,
      merged_by_user_id: writer.userId,
    });
    const removed: unknown = typeof record!.removed === "string" ? JSON.parse(record!.removed) : record!.removed;
    expect(removed).toMatchObject({
      name: "Tam Okafor (web)",
      email: `dup.${s.slug}@mail.test`,
      userId: Number(userId),
    });
    const detail = await getCustomerDetail({
      shopId: s.id,
      customerId: kept.customerId,
    });
    expect(detail.jobs).toHaveLength(3);
    expect(detail.merges).toEqual([
      expect.objectContaining({
        removedName: "Tam Okafor (web)",
        jobs: 2,
        machines: 1,
        by: `service_writer ${s.slug}`,
      }),
    ]);
  });

  it("refuses a duplicate of another shop, the record itself and two different sign-ins, changing nothing", async () => {
    const s = await makeShop(k, { label: "merge-refuse", roles: ["owner"] });
    const kept = await makeCustomerWithJobs(k, s.id, {
      name: "Uma Brisk",
      statuses: ["in_progress"],
    });
    const foreign = await makeCustomerWithJobs(k, other.id, {
      name: "Uma Brisk",
      statuses: ["in_progress"],
    });
    const owner = actorOf(s, "owner");
    const found = await access(owner, "customer", kept.customerId, "customer:merge", { shop: s.slug });
    const beforeHere = await snapshot(s.id);
    const beforeThere = await snapshot(other.id);
    await expect(mergeDuplicate(owner, found, foreign.customerId)).rejects.toMatchObject({
      code: "not_found",
      fields: { duplicate: [expect.any(String)] },
    });
    await expect(mergeDuplicate(owner, found, kept.customerId)).rejects.toMatchObject({ code: "invalid" });

    const [u1] = await k("users").insert({
      email: `a.${s.slug}@mail.test`,
      name: "A",
    });
    const [u2] = await k("users").insert({
      email: `b.${s.slug}@mail.test`,
      name: "B",
    });
    const a = await makeCustomerWithJobs(k, s.id, {
      name: "Vic Harrow",
      userId: Number(u1),
      statuses: ["in_progress"],
    });
    const b = await makeCustomerWithJobs(k, s.id, {
      name: "Vic Harrow",
      userId: Number(u2),
      statuses: ["in_progress"],
    });
    const beforeLinked = await snapshot(s.id);
    const foundA = await access(owner, "customer", a.customerId, "customer:merge", { shop: s.slug });
    await expect(mergeDuplicate(owner, foundA, b.customerId)).rejects.toMatchObject({ code: "conflict" });
    expect(await snapshot(s.id)).toEqual(beforeLinked);
    expect((await snapshot(s.id)).jobs.slice(0, 1)).toEqual(beforeHere.jobs);
    expect(await snapshot(other.id)).toEqual(beforeThere);
  });

  it("is atomic: a failure after the moves leaves both records as they were", async () => {
    const s = await makeShop(k, { label: "merge-atomic" });
    const kept = await makeCustomerWithJobs(k, s.id, {
      name: "Wren Adeyemi",
      statuses: ["picked_up"],
    });
    const dup = await makeCustomerWithJobs(k, s.id, {
      name: "Wren Adeyemi",
      statuses: ["in_progress", "ready"],
    });
    const before = await snapshot(s.id);
    // A row the merge knows nothing of (a stand-in for a table added later without updating
    // CUSTOMER_REFERENCES) makes the delete of the removed record fail, after jobs and machines moved.
    await k.schema.createTable("merge_probe", (t) => {
      t.increments("id");
      t.integer("shop_id").unsigned().notNullable();
      t.integer("customer_id").unsigned().notNullable();
      t.foreign(["shop_id", "customer_id"]).references(["shop_id", "id"]).inTable("customers");
    });
    try {
      await k("merge_probe").insert({
        shop_id: s.id,
        customer_id: dup.customerId,
      });
      await expect(
        k.transaction((tx) =>
          mergeCustomers(tx, {
            shopId: s.id,
            keptId: kept.customerId,
            removedId: dup.customerId,
            userId: s.staff.owner!.id,
          }),
        ),
      ).rejects.toThrow(/foreign key/i);
    } finally {
      await k.schema.dropTable("merge_probe");
    }
    expect(await snapshot(s.id)).toEqual(before);
  });
});
