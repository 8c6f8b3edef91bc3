import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { listNeededParts } from "@/db/queries/parts-needed";
import type { Action, Actor } from "@/lib/permissions";
import { orderShopPartsSchema } from "@/lib/schemas/part-orders";
import { access, resolve } from "@/lib/server/access";
import { addJobPart } from "@/lib/server/bench-parts";
import { neededPartsToOrder, orderParts, receiveOrder } from "@/lib/server/part-orders";
import { ownerWithJobs, staffActor } from "../support/authorised-work";
import { testKnex } from "../support/db";
import { makeShop } from "../support/fixtures";

// Issue 19: the parts page puts needed parts of several of the shop's jobs on one supplier order,
// in one transaction (all or nothing), and each job's wait follows the parts.

type Shop = Awaited<ReturnType<typeof makeShop>>;
const on = (actor: Actor, job: string, permission: Action) => access(actor, "job", job, permission);
const BOOKED = { findingId: null, noOkNeeded: true };

describe("one supplier order for parts of several jobs", () => {
  let k: Knex;
  let shop: Shop;
  let other: Shop;
  let tech: Actor;
  let jobs: { id: number; publicId: string }[];
  let elsewhere: { id: number; publicId: string }[];
  const status = async (jobId: number) => (await k("jobs").where({ id: jobId }).first("status"))!.status;
  const part = async (actor: Actor, jobPublicId: string, description: string) =>
    (await addJobPart(actor, await on(actor, jobPublicId, "parts:manage"), { job: jobPublicId, description, partNumber: null, supplier: null, qty: "1", cost: null, status: "needed", expectedOn: null, forWork: BOOKED })).id;
  const form = (parts: number[]) => orderShopPartsSchema.parse({ shop: shop.slug, supplier: "Northgate Supply", reference: "PO-7781", orderedOn: "2026-12-04", expectedOn: "2026-12-09", parts: parts.join(",") });

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "shop-order", roles: ["owner", "service_writer", "technician"] });
    other = await makeShop(k, { label: "shop-order-b", roles: ["owner", "technician"] });
    tech = staffActor(shop, "technician");
    ({ jobs } = await ownerWithJobs(k, shop, 2));
    ({ jobs: elsewhere } = await ownerWithJobs(k, other, 1, "Bo Lindqvist"));
  });
  afterAll(async () => k?.destroy());

  it("lists needed parts across jobs, orders two jobs' parts at once, and each job's wait follows", async () => {
    const [a, b] = [jobs[0]!, jobs[1]!];
    const pa = await part(tech, a.publicId, "Clutch cable");
    const pb = await part(tech, b.publicId, "Brake pads");
    const pb2 = await part(tech, b.publicId, "Brake fluid");
    const foreign = await part(staffActor(other, "technician"), elsewhere[0]!.publicId, "Air filter");
    expect([await status(a.id), await status(b.id)]).toEqual(["waiting_parts", "waiting_parts"]);

    const offered = await neededPartsToOrder({ id: shop.id, timezone: "UTC" });
    expect(offered.rows.map((r) => [r.description, r.jobNumber > 0, r.proposed])).toEqual([
      ["Clutch cable", true, false],
      ["Brake pads", true, false],
      ["Brake fluid", true, false],
    ]);
    expect(offered.more).toBe(false);
    expect((await listNeededParts({ shopId: shop.id, limit: 2 })).more).toBe(true);

    // All or nothing: another shop's part, or one already past "needed", refuses the whole order.
    await expect(orderParts(tech, { shopId: shop.id, jobId: null }, form([pa, foreign]))).rejects.toMatchObject({ code: "invalid", fields: { parts: [expect.any(String)] } });
    await k("job_parts").where({ id: pb2 }).update({ status: "ordered" });
    await expect(orderParts(tech, { shopId: shop.id, jobId: null }, form([pa, pb, pb2]))).rejects.toMatchObject({ code: "conflict" });
    await k("job_parts").where({ id: pb2 }).update({ status: "needed" });
    expect(await k("part_orders").where({ shop_id: shop.id })).toHaveLength(0);
    expect((await k("job_parts").whereIn("id", [pa, pb, pb2, foreign]).orderBy("id")).map((r) => r.status)).toEqual(["needed", "needed", "needed", "needed"]);

    const made = await orderParts(tech, { shopId: shop.id, jobId: null }, form([pa, pb]));
    const order = (await k("part_orders").where({ id: made.id }).first())!;
    expect(order).toMatchObject({ shop_id: shop.id, supplier: "Northgate Supply", reference: "PO-7781", ordered_on: "2026-12-04", expected_on: "2026-12-09" });
    const rows = await k("job_parts").whereIn("id", [pa, pb]).orderBy("id");
    expect(rows.map((r) => [r.status, Number(r.order_id), r.expected_on])).toEqual([
      ["ordered", made.id, "2026-12-09"],
      ["ordered", made.id, "2026-12-09"],
    ]);
    // Each part's history and its job's timeline say where it was ordered.
    expect((await k("job_part_events").whereIn("part_id", [pa, pb]).where("to_status", "ordered")).map((e) => e.note)).toEqual(["Ordered from Northgate Supply, ref. PO-7781", "Ordered from Northgate Supply, ref. PO-7781"]);
    expect((await listNeededParts({ shopId: shop.id, limit: 100 })).rows.map((r) => r.description)).toEqual(["Brake fluid"]);

    // The order comes in: job A has everything and goes back to work; job B still needs its fluid.
    const received = await receiveOrder(tech, await resolve(tech, "shop", { shop: shop.slug }, "parts:manage"), { order: made.id });
    expect(received).toMatchObject({ received: 2, stillAwaited: 0 });
    expect(await status(a.id)).toBe("in_progress");
    expect(await status(b.id)).toBe("waiting_parts");
    expect(await k("part_orders").where({ shop_id: other.id })).toHaveLength(0);
  });

  it("the form refuses an order with no parts ticked, beside the parts", () => {
    const parsed = orderShopPartsSchema.safeParse({ shop: shop.slug, supplier: "Northgate Supply", orderedOn: "2026-12-04", parts: "" });
    expect(parsed.success).toBe(false);
    expect(parsed.error!.issues.map((i) => i.path.join("."))).toEqual(["parts"]);
  });
});
