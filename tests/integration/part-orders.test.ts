import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { db as appDb } from "@/db/client";
import { listPartsOnOrder } from "@/db/queries/part-orders";
import type { Action, Actor } from "@/lib/permissions";
import { access, resolve } from "@/lib/server/access";
import { addJobPart, changeJobPartStatus } from "@/lib/server/bench-parts";
import { createFinding } from "@/lib/server/findings";
import {
  askPartDeposit,
  backOrder,
  chargeCore,
  coreReturned,
  markSpecialOrder,
  movePart,
  orderParts,
  ownerPartWaitLines,
  receiveOrder,
} from "@/lib/server/part-orders";
import { coreLinesOf } from "@/lib/server/core-lines";
import { ownerWithJobs, staffActor } from "../support/authorised-work";
import { testKnex } from "../support/db";
import { makeShop } from "../support/fixtures";

// Issue 19, ordering: every change goes through the real writers on MariaDB; the test reads the
// parts, their history, the jobs' statuses and what the owner's page would say.

type Shop = Awaited<ReturnType<typeof makeShop>>;
const on = (actor: Actor, job: string, permission: Action) => access(actor, "job", job, permission);
const BOOKED = { findingId: null, noOkNeeded: true };

describe("ordering parts", () => {
  let k: Knex;
  let shop: Shop;
  let tech: Actor;
  let writer: Actor;
  let jobs: { id: number; publicId: string }[];

  const status = async (jobId: number) => (await k("jobs").where({ id: jobId }).first("status"))!.status;
  const part = async (jobPublicId: string, description: string, forWork: { findingId: number | null; noOkNeeded: boolean } = BOOKED) =>
    (await addJobPart(tech, await on(tech, jobPublicId, "parts:manage"), { job: jobPublicId, description, partNumber: null, supplier: null, qty: "1", cost: null, status: "needed", expectedOn: null, forWork })).id;
  const row = async (id: number) => (await k("job_parts").where({ id }).first())!;
  const shopAccess = () => resolve(tech, "shop", { shop: shop.slug }, "parts:manage");

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "partorders", roles: ["owner", "service_writer", "technician"] });
    tech = staffActor(shop, "technician");
    writer = staffActor(shop, "service_writer");
    ({ jobs } = await ownerWithJobs(k, shop, 5));
  });
  afterAll(async () => k?.destroy());

  it("one order with parts of two jobs: received together, both jobs back to work", async () => {
    const [a, b] = [jobs[0]!, jobs[1]!];
    const pa = await part(a.publicId, "Clutch cable");
    const pb = await part(b.publicId, "Brake pads");
    expect(await status(a.id)).toBe("waiting_parts");
    const order = await orderParts(tech, { shopId: shop.id, jobId: null }, { supplier: "Northgate Supply", reference: "PO-4411", orderedOn: "2026-12-01", expectedOn: "2026-12-03", parts: [pa, pb] });
    expect(await row(pa)).toMatchObject({ status: "ordered", order_id: order.id, supplier: "Northgate Supply", expected_on: "2026-12-03" });
    // A part already on order can't go on a second order.
    await expect(orderParts(tech, { shopId: shop.id, jobId: null }, { supplier: "Other", reference: null, orderedOn: "2026-12-01", expectedOn: null, parts: [pa] })).rejects.toMatchObject({ code: "conflict" });

    const got = await receiveOrder(tech, await shopAccess(), { order: order.id });
    expect(got).toMatchObject({ received: 2, stillAwaited: 0 });
    expect((await row(pa)).status).toBe("received");
    expect((await row(pb)).status).toBe("received");
    expect(await status(a.id)).toBe("in_progress");
    expect(await status(b.id)).toBe("in_progress");
    expect((await k("part_orders").where({ id: order.id }).first())!.received_at).not.toBeNull();
    const notes = (await k("job_part_events").where({ part_id: pa }).orderBy("id")).map((e) => [e.to_status, e.note]);
    expect(notes).toEqual([
      ["needed", null],
      ["ordered", "Ordered from Northgate Supply, ref. PO-4411"],
      ["received", "Received with its order"],
    ]);
    await expect(receiveOrder(tech, await shopAccess(), { order: order.id })).rejects.toMatchObject({ code: "conflict" });

    // A part whose priced line the owner declined (migration 30's column, set here as the answer
    // writer would) never goes on an order.
    const declined = await part(a.publicId, "Mirror");
    await k("job_parts").where({ id: declined }).update({ owner_answer: "declined" });
    await expect(orderParts(tech, { shopId: shop.id, jobId: null }, { supplier: "Northgate Supply", reference: null, orderedOn: "2026-12-01", expectedOn: null, parts: [declined] })).rejects.toMatchObject({ code: "conflict" });
    expect((await row(declined)).status).toBe("needed");
  });

  it("back-ordered with a new date: the owner's page says so, only for cleared work", async () => {
    const c = jobs[2]!;
    const pump = await part(c.publicId, "Fuel pump");
    const finding = await createFinding(writer, await on(writer, c.publicId, "approvals:draft"), {
      title: "Seat torn",
      found: "Seat cover torn at the seam.",
      whyItMatters: null,
      safety: "none",
      evidence: [],
      lines: [{ kind: "part", description: "Seat cover", qty: "1", unitPrice: "80.00", partNumber: null }],
    });
    // For a finding the owner hasn't been asked about: never on the owner's page.
    const seat = await part(c.publicId, "Seat cover", { findingId: finding.id, noOkNeeded: false });
    const order = await orderParts(tech, { shopId: shop.id, jobId: null }, { supplier: "Northgate Supply", reference: null, orderedOn: "2026-12-01", expectedOn: "2026-12-04", parts: [pump, seat] });
    await backOrder(tech, await on(tech, c.publicId, "parts:manage"), { part: pump, expectedOn: "2026-12-20" });
    expect(await row(pump)).toMatchObject({ status: "back_ordered", expected_on: "2026-12-20" });
    expect(await ownerPartWaitLines({ shopId: shop.id, jobId: c.id })).toEqual(["Part on back-order: Fuel pump, expected 2026-12-20."]);

    // The order comes in without the back-ordered pump: it stays awaited and the job keeps waiting.
    const got = await receiveOrder(tech, await shopAccess(), { order: order.id });
    expect(got).toMatchObject({ received: 1, stillAwaited: 1 });
    expect((await k("part_orders").where({ id: order.id }).first())!.received_at).toBeNull();
    expect(await status(c.id)).toBe("waiting_parts");
    await backOrder(tech, await on(tech, c.publicId, "parts:manage"), { part: pump, expectedOn: "2027-01-05" });
    expect(await ownerPartWaitLines({ shopId: shop.id, jobId: c.id })).toEqual(["Part on back-order: Fuel pump, expected 2027-01-05."]);
    const last = await k("job_part_events").where({ part_id: pump }).orderBy("id", "desc").first();
    expect(last).toMatchObject({ from_status: "back_ordered", to_status: "back_ordered", note: "Back-ordered, now expected 2027-01-05" });
  });

  it("a part that arrived goes to another job: history on both, and both jobs' waits follow", async () => {
    const [from, to] = [jobs[3]!, jobs[4]!];
    const chain = await part(from.publicId, "Drive chain");
    const order = await orderParts(tech, { shopId: shop.id, jobId: null }, { supplier: "Northgate Supply", reference: "PO-5", orderedOn: "2026-12-01", expectedOn: null, parts: [chain] });
    // The other job waits on its own chain, still on order.
    const theirs = await part(to.publicId, "drive chain");
    await orderParts(tech, { shopId: shop.id, jobId: null }, { supplier: "Northgate Supply", reference: "PO-6", orderedOn: "2026-12-01", expectedOn: "2026-12-09", parts: [theirs] });
    await receiveOrder(tech, await shopAccess(), { order: order.id });
    expect(await status(from.id)).toBe("in_progress");
    expect(await status(to.id)).toBe("waiting_parts");

    const fromAccess = await on(tech, from.publicId, "parts:manage");
    const toAccess = await on(tech, to.publicId, "parts:manage");
    // Only a part that has arrived can move.
    await expect(movePart(tech, toAccess, fromAccess, { part: theirs, forWork: BOOKED, thisJob: "done" })).rejects.toMatchObject({ code: "conflict" });

    // Swap: the chain that arrived goes to the other job in place of its awaited one, whose order
    // now comes for the first job. The other job stops waiting; the first waits.
    // The other job's chain was priced on its finding: the price and answer go with the need (set
    // here as migration 30's writers would).
    await k("job_parts").where({ id: theirs }).update({ owner_answer: "approved", sell_minor: 8_900 });
    const moved = await movePart(tech, fromAccess, toAccess, { part: chain, forWork: BOOKED, thisJob: "swap" });
    expect(await row(chain)).toMatchObject({ owner_answer: "approved", sell_minor: 8_900 });
    expect(await row(theirs)).toMatchObject({ owner_answer: null, sell_minor: null, no_ok_needed: 1 });
    expect(moved.swappedPartId).toBe(theirs);
    expect(await row(chain)).toMatchObject({ job_id: to.id, status: "received" });
    expect(await row(theirs)).toMatchObject({ job_id: from.id, status: "ordered", expected_on: "2026-12-09" });
    expect(moved.jobMoves).toEqual([
      { jobId: from.id, movedTo: "waiting_parts" },
      { jobId: to.id, movedTo: "in_progress" },
    ]);
    expect(await status(from.id)).toBe("waiting_parts");
    expect(await status(to.id)).toBe("in_progress");
    expect((await k("job_part_events").where({ part_id: chain }).orderBy("id", "desc").first())!.note).toMatch(/^Moved from job J-\d{4} to job J-\d{4}$/);
    expect((await k("job_part_events").where({ part_id: theirs }).orderBy("id", "desc").first())!.note).toMatch(/^Swapped: now for job J-\d{4}/);
    const entries = async (jobId: number) => (await k("journal_entries").where({ job_id: jobId, kind: "part" }).select("body")).map((e) => (typeof e.body === "string" ? JSON.parse(e.body) : e.body));
    expect((await entries(from.id)).some((b) => b.movedTo && b.description === "Drive chain")).toBe(true);
    expect((await entries(to.id)).some((b) => b.movedFrom && b.description === "Drive chain")).toBe(true);

    // Back again, the first job asking for another one: it keeps waiting (its swapped order and
    // the new needed chain); the other job needs nothing more, so it stays on the bench.
    // A swap needs an awaited part like it on the other job: job 3 awaits no chain.
    const third = await on(tech, jobs[2]!.publicId, "parts:manage");
    await expect(movePart(tech, toAccess, third, { part: chain, forWork: BOOKED, thisJob: "swap" })).rejects.toMatchObject({ code: "invalid" });
    expect(await row(chain)).toMatchObject({ job_id: to.id });
    const back = await movePart(tech, toAccess, fromAccess, { part: chain, forWork: BOOKED, thisJob: "needs" });
    expect(await row(back.newPartId!)).toMatchObject({ job_id: to.id, status: "needed", description: "Drive chain" });
    expect(await status(to.id)).toBe("waiting_parts");
    expect(await status(from.id)).toBe("waiting_parts");
  });

  it("a core charge, refunded as a credit once the old part goes back", async () => {
    // The whole core charge comes back when the old part is returned: common trade practice, no published source.
    const a = jobs[0]!;
    const starter = await part(a.publicId, "Starter motor");
    const acc = await on(writer, a.publicId, "parts:manage");
    await chargeCore(writer, acc, { part: starter, charge: "25.00" });
    const cores = async () => (await coreLinesOf({ shopId: shop.id, jobId: a.id }, true)).map((l) => [l.source, l.partId, l.description, l.amountMinor, l.taxable]);
    // Billed like the part: not before it is in the machine.
    expect(await cores()).toEqual([]);
    await changeJobPartStatus(writer, acc, { part: starter, from: "needed", to: "fitted", expectedOn: null });
    expect(await cores()).toEqual([["core_charge", starter, "Core charge: Starter motor", 2500, true]]);
    await expect(chargeCore(writer, acc, { part: starter, charge: "-3" })).rejects.toMatchObject({ code: "invalid" });
    await coreReturned(writer, acc, { part: starter });
    // The credit is the same positive amount on a line of its own; lib/invoices.ts prices it negative.
    expect(await cores()).toEqual([
      ["core_charge", starter, "Core charge: Starter motor", 2500, true],
      ["core_credit", starter, "Core returned: Starter motor", 2500, true],
    ]);
    await expect(coreReturned(writer, acc, { part: starter })).rejects.toMatchObject({ code: "conflict" });
    await expect(chargeCore(writer, acc, { part: starter, charge: "30.00" })).rejects.toMatchObject({ code: "conflict" });
  });

  it("a deposit for a special-order part, through the job's deposit requests", async () => {
    const b = jobs[1]!;
    const tank = await part(b.publicId, "Fuel tank");
    const acc = await on(writer, b.publicId, "invoice:create");
    const before = await k("deposit_requests").where({ job_id: b.id }).count({ n: "*" }).first();
    await expect(askPartDeposit(writer, acc, { part: tank, amount: "120.00", note: null })).rejects.toMatchObject({ code: "invalid" });
    // Refused: nothing half-written.
    expect(await k("deposit_requests").where({ job_id: b.id }).count({ n: "*" }).first()).toEqual(before);

    await markSpecialOrder(writer, acc, { part: tank, special: true });
    const made = await askPartDeposit(writer, acc, { part: tank, amount: "120.00", note: "Made to order" });
    expect(made.deposit).toMatchObject({ amountMinor: 12_000, status: "open" });
    expect((await row(tank)).deposit_id).toBe(made.deposit.id);
    await expect(askPartDeposit(writer, acc, { part: tank, amount: "120.00", note: null })).rejects.toMatchObject({ code: "conflict" });
    expect(await k("deposit_requests").where({ job_id: b.id, status: "open" })).toHaveLength(1);

    // Left blank: the sell price (migration 30's column, set as its writer would) × the quantity.
    const seat = await part(b.publicId, "Seat, made to order");
    await markSpecialOrder(writer, acc, { part: seat, special: true });
    await expect(askPartDeposit(writer, acc, { part: seat, amount: null, note: null })).rejects.toMatchObject({ code: "invalid" });
    await k("job_parts").where({ id: seat }).update({ sell_minor: 4_550, qty_thousandths: 2_000 });
    const bySell = await askPartDeposit(writer, acc, { part: seat, amount: null, note: null });
    expect(bySell.deposit.amountMinor).toBe(9_100);
  });

  it("lists parts on order late first, one query per page whatever its size", async () => {
    const filter = await part(jobs[3]!.publicId, "Oil filter");
    await orderParts(tech, { shopId: shop.id, jobId: null }, { supplier: "Northgate Supply", reference: "PO-7", orderedOn: "2026-12-01", expectedOn: "2026-12-05", parts: [filter] });
    const plug = await part(jobs[2]!.publicId, "Spark plug");
    await orderParts(tech, { shopId: shop.id, jobId: null }, { supplier: "Northgate Supply", reference: null, orderedOn: "2026-12-01", expectedOn: null, parts: [plug] });
    const list = (page: number, pageSize: number) => listPartsOnOrder({ shopId: shop.id, today: "2026-12-10", page, pageSize });
    const all = (await list(1, 100)).rows;
    // Late (expected before the 10th) first, then by date, undated last; with the job it is for.
    expect(all.map((r) => [r.description, r.expectedOn, r.late, r.status])).toEqual([
      ["Oil filter", "2026-12-05", true, "ordered"],
      ["drive chain", "2026-12-09", true, "ordered"],
      ["Fuel pump", "2027-01-05", false, "back_ordered"],
      ["Spark plug", null, false, "ordered"],
    ]);
    expect(all[0]).toMatchObject({ jobPublicId: jobs[3]!.publicId, reference: "PO-7" });
    const pages = [await list(1, 2), await list(2, 2)];
    expect(pages.map((p) => p.hasMore)).toEqual([true, false]);
    expect(pages.flatMap((p) => p.rows.map((r) => r.description))).toEqual(all.map((r) => r.description));
    let n = 0;
    const count = () => n++;
    appDb().on("query", count);
    try {
      await list(1, 1);
      const small = n;
      n = 0;
      await list(1, 100);
      expect(n).toBe(small);
      expect(small).toBe(1);
    } finally {
      appDb().off("query", count);
    }
  });
});
