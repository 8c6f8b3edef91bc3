import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { checkInJob, searchCustomers } from "@/db/queries/check-in";
import { checkInSchema } from "@/lib/schemas/check-in";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";

type Shop = Awaited<ReturnType<typeof makeShop>>;

/** The form as a writer fills it for a new owner and a new machine; `over` changes fields. */
const newOwnerForm = (over: Record<string, string> = {}) =>
  checkInSchema.parse({
    customerMode: "new",
    customerName: "Hollis Varga",
    customerEmail: "hollis.varga@mail.test",
    customerPhone: "+1 555 010 2233",
    machineKind: "dirt_bike",
    machineYear: "2020",
    machineMake: "Corvane",
    machineModel: "Tarn 250",
    machineEngineCc: "249",
    machineSerial: "CVT250-20-55120",
    machineHours: "41.5",
    machineOdometer: "",
    machineOdometerUnit: "mi",
    concern: "Stalls when the throttle snaps shut.",
    intakeNotes: "Left shroud cracked.",
    promisedOn: "",
    technicianId: "",
    ...over,
  });

describe("checking a machine in", () => {
  let db: Knex;
  let shop: Shop;
  let other: Shop;

  /** Rows of every kind check-in writes, in the given shops, plus their next job numbers. */
  const snapshot = async (shopIds: number[]) => {
    const count = async (table: string) => Number((await db(table).whereIn("shop_id", shopIds).count({ n: "*" }).first())?.n);
    return {
      customers: await count("customers"),
      machines: await count("machines"),
      jobs: await count("jobs"),
      statusChanges: await count("job_status_changes"),
      nextNumbers: (await db("shops").whereIn("id", shopIds).orderBy("id").pluck("next_job_number")).map(Number),
    };
  };

  beforeAll(async () => {
    db = testKnex();
    shop = await makeShop(db, { label: "checkin", roles: ["owner", "service_writer", "technician"] });
    other = await makeShop(db, { label: "checkin-other", roles: ["owner", "technician"] });
  });
  afterAll(async () => db?.destroy());

  it("creates the owner, the machine, the job and its first status row in one go", async () => {
    const writer = shop.staff.service_writer!.id;
    const tech = shop.staff.technician!.id;
    const job = await checkInJob({ shopId: shop.id, userId: writer, input: newOwnerForm({ technicianId: String(tech), promisedOn: "2099-01-15" }) });

    const row = await db("jobs").where({ id: job.id }).first();
    expect(row).toMatchObject({
      shop_id: shop.id,
      number: job.number,
      public_id: job.publicId,
      status: "checked_in",
      concern: "Stalls when the throttle snaps shut.",
      intake_notes: "Left shroud cracked.",
      promised_on: "2099-01-15",
      technician_user_id: tech,
      created_by_user_id: writer,
    });
    expect(job.publicId).toMatch(/^[A-Za-z0-9_-]{16}$/);
    expect(await db("customers").where({ id: row!.customer_id }).first()).toMatchObject({
      shop_id: shop.id,
      name: "Hollis Varga",
      email: "hollis.varga@mail.test",
      phone: "+1 555 010 2233",
      user_id: null,
    });
    expect(await db("machines").where({ id: row!.machine_id }).first()).toMatchObject({
      shop_id: shop.id,
      customer_id: row!.customer_id,
      kind: "dirt_bike",
      year: 2020,
      make: "Corvane",
      model: "Tarn 250",
      engine_cc: 249,
      serial: "CVT250-20-55120",
      hours: 41.5,
      odometer: null,
      // No odometer reading, so no unit either.
      odometer_unit: null,
    });
    const history = await db("job_status_changes").where({ job_id: job.id });
    expect(history).toHaveLength(1);
    expect(history[0]).toMatchObject({ shop_id: shop.id, from_status: null, to_status: "checked_in", changed_by_user_id: writer });
    // The journal opens with the check-in, shared with the owner like every status change.
    const entries = await db("journal_entries").where({ job_id: job.id });
    expect(entries).toHaveLength(1);
    expect(entries[0]).toMatchObject({ kind: "status", visibility: "shared", author_user_id: writer });
  });

  it("reuses an owner and a machine on file, writing only the job", async () => {
    const onFile = await makeCustomerWithJobs(db, shop.id, { name: "Odile Marsh", email: "odile.marsh@mail.test", statuses: [] });
    const before = await snapshot([shop.id]);
    const job = await checkInJob({
      shopId: shop.id,
      userId: shop.staff.technician!.id,
      input: checkInSchema.parse({ customerMode: "existing", customerId: String(onFile.customerId), machineMode: "existing", machineId: String(onFile.machineId), concern: "Brakes squeal." }),
    });
    expect(job).toMatchObject({ customerId: onFile.customerId, machineId: onFile.machineId, number: before.nextNumbers[0] });
    const after = await snapshot([shop.id]);
    expect(after).toMatchObject({ customers: before.customers, machines: before.machines, jobs: before.jobs + 1, statusChanges: before.statusChanges + 1 });
  });

  it("gives 20 check-ins at the same moment 20 different, consecutive numbers", async () => {
    const busy = await makeShop(db, { label: "checkin-rush" });
    const jobs = await Promise.all(
      Array.from({ length: 20 }, (_, i) =>
        checkInJob({ shopId: busy.id, userId: busy.staff.owner!.id, input: newOwnerForm({ customerName: `Rush ${i}`, customerEmail: `rush.${i}@mail.test` }) }),
      ),
    );
    expect(jobs.map((j) => j.number).sort((a, b) => a - b)).toEqual(Array.from({ length: 20 }, (_, i) => i + 1));
    expect(await snapshot([busy.id])).toEqual({ customers: 20, machines: 20, jobs: 20, statusChanges: 20, nextNumbers: [21] });
  });

  describe("refuses ids from another shop and writes nothing", () => {
    let theirs: Awaited<ReturnType<typeof makeCustomerWithJobs>>;
    let ours: Awaited<ReturnType<typeof makeCustomerWithJobs>>;
    let neighbour: Awaited<ReturnType<typeof makeCustomerWithJobs>>;
    beforeAll(async () => {
      theirs = await makeCustomerWithJobs(db, other.id, { name: "Theo Other", statuses: [] });
      ours = await makeCustomerWithJobs(db, shop.id, { name: "Una Ours", statuses: [] });
      neighbour = await makeCustomerWithJobs(db, shop.id, { name: "Nell Next", statuses: [] });
    });

    const refused = async (input: ReturnType<typeof newOwnerForm>, expected: { code: string; field: string }) => {
      const before = await snapshot([shop.id, other.id]);
      const attempt = checkInJob({ shopId: shop.id, userId: shop.staff.owner!.id, input });
      await expect(attempt).rejects.toMatchObject({ code: expected.code, fields: { [expected.field]: [expect.any(String)] } });
      expect(await snapshot([shop.id, other.id])).toEqual(before);
    };

    it("another shop's owner", async () => {
      await refused(checkInSchema.parse({ customerMode: "existing", customerId: String(theirs.customerId), machineMode: "new", machineKind: "atv", machineMake: "X", machineModel: "Y", concern: "c" }), {
        code: "not_found",
        field: "customerId",
      });
    });

    it("another shop's machine, even with our own owner", async () => {
      await refused(checkInSchema.parse({ customerMode: "existing", customerId: String(ours.customerId), machineMode: "existing", machineId: String(theirs.machineId), concern: "c" }), {
        code: "not_found",
        field: "machineId",
      });
    });

    it("another owner's machine in the same shop", async () => {
      await refused(checkInSchema.parse({ customerMode: "existing", customerId: String(ours.customerId), machineMode: "existing", machineId: String(neighbour.machineId), concern: "c" }), {
        code: "invalid",
        field: "machineId",
      });
    });

    it("another shop's technician", async () => {
      await refused(newOwnerForm({ customerEmail: "never.written@mail.test", technicianId: String(other.staff.technician!.id) }), { code: "not_found", field: "technicianId" });
      expect(await db("customers").where({ email: "never.written@mail.test" }).first()).toBeUndefined();
    });
  });

  it("refuses a promised date before today on the shop's calendar, and accepts today", async () => {
    const before = await snapshot([shop.id]);
    const input = newOwnerForm({ customerEmail: "late.date@mail.test", promisedOn: "2026-11-30" });
    await expect(checkInJob({ shopId: shop.id, userId: shop.staff.owner!.id, input, today: "2026-12-01" })).rejects.toMatchObject({
      code: "invalid",
      fields: { promisedOn: ["The promised date can't be in the past: pick 2026-12-01 (today) or later"] },
    });
    expect(await snapshot([shop.id])).toEqual(before);
    const job = await checkInJob({ shopId: shop.id, userId: shop.staff.owner!.id, input: { ...input, promisedOn: "2026-12-01" }, today: "2026-12-01" });
    expect((await db("jobs").where({ id: job.id }).first())!.promised_on).toBe("2026-12-01");
  });

  it("refuses a new owner whose e-mail this shop already has, and writes nothing", async () => {
    await makeCustomerWithJobs(db, shop.id, { name: "Pia Twice", email: "pia.twice@mail.test", statuses: [] });
    const before = await snapshot([shop.id]);
    await expect(checkInJob({ shopId: shop.id, userId: shop.staff.owner!.id, input: newOwnerForm({ customerEmail: "pia.twice@mail.test" }) })).rejects.toMatchObject({
      code: "conflict",
      fields: { customerEmail: [expect.stringContaining("already on file")] },
    });
    expect(await snapshot([shop.id])).toEqual(before);
    // The same address at another shop is a different customer record, and is fine.
    await expect(checkInJob({ shopId: other.id, userId: other.staff.owner!.id, input: newOwnerForm({ customerEmail: "pia.twice@mail.test" }) })).resolves.toMatchObject({ number: 1 });
  });

  it("links the owner to an existing sign-in account with that e-mail, new or on file", async () => {
    const [userId] = await db("users").insert({ email: "greta.lund@mail.test", name: "Greta Lund" });
    const job = await checkInJob({ shopId: shop.id, userId: shop.staff.owner!.id, input: newOwnerForm({ customerName: "Greta Lund", customerEmail: "Greta.Lund@Mail.test" }) });
    expect(await db("customers").where({ id: job.customerId }).first()).toMatchObject({ email: "greta.lund@mail.test", user_id: Number(userId) });

    // An owner on file from before the account existed is linked at their next check-in.
    const [laterUser] = await db("users").insert({ email: "odd.later@mail.test", name: "Odd Later" });
    const onFile = await makeCustomerWithJobs(db, shop.id, { name: "Odd Later", email: "odd.later@mail.test", statuses: [] });
    await checkInJob({
      shopId: shop.id,
      userId: shop.staff.owner!.id,
      input: checkInSchema.parse({ customerMode: "existing", customerId: String(onFile.customerId), machineMode: "existing", machineId: String(onFile.machineId), concern: "c" }),
    });
    expect((await db("customers").where({ id: onFile.customerId }).first())!.user_id).toBe(Number(laterUser));
  });
});

describe("owner search for check-in", () => {
  let db: Knex;
  let shop: Shop;
  let other: Shop;
  beforeAll(async () => {
    db = testKnex();
    shop = await makeShop(db, { label: "owner-search" });
    other = await makeShop(db, { label: "owner-search-other" });
    const [id] = await db("customers").insert({ shop_id: shop.id, name: "Marta Quince", email: "marta.q@mail.test", phone: "+1 555 013 7781" });
    await db("machines").insert([
      { shop_id: shop.id, customer_id: id, kind: "atv", make: "Tessaro", model: "Ridgeline 570", serial: "TSR-1" },
      { shop_id: shop.id, customer_id: id, kind: "snowmobile", make: "Brumal", model: "Drift 600", serial: "BRD-2" },
    ]);
    await db("customers").insert({ shop_id: other.id, name: "Marta Elsewhere", email: "marta.e@mail.test", phone: "+1 555 013 7781" });
  });
  afterAll(async () => db?.destroy());

  it("finds an owner of this shop by name, e-mail or phone digits, with their machines", async () => {
    for (const q of ["quince", "marta.q@", "013 7781", "5550137781"]) {
      const found = await searchCustomers({ shopId: shop.id, q });
      expect(found.map((c) => c.name), q).toEqual(["Marta Quince"]);
    }
    const [marta] = await searchCustomers({ shopId: shop.id, q: "Marta" });
    expect(marta!.machines.map((m) => m.model).sort()).toEqual(["Drift 600", "Ridgeline 570"]);
  });

  it("never lists another shop's owners, and treats % and _ as plain characters", async () => {
    expect((await searchCustomers({ shopId: other.id, q: "Marta" })).map((c) => c.name)).toEqual(["Marta Elsewhere"]);
    expect(await searchCustomers({ shopId: shop.id, q: "%" })).toEqual([]);
    expect(await searchCustomers({ shopId: shop.id, q: "_" })).toEqual([]);
  });

  it("lists the newest owners when nothing is typed", async () => {
    expect((await searchCustomers({ shopId: shop.id, q: "" })).map((c) => c.name)).toEqual(["Marta Quince"]);
  });
});
