import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { db as appDb } from "@/db/client";
import { listParts } from "@/db/queries/bench-parts";
import { listPartsOnOrder } from "@/db/queries/part-orders";
import { jobFacts } from "@/db/queries/workflow";
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
import { authorisedWork } from "@/lib/server/authorised-work";
import { OWNER_WITHDRAWN_REASON, invoiceView } from "@/lib/server/invoice-views";
import { createInvoice } from "@/lib/server/invoices";
import { authorise, ownerWithJobs, staffActor } from "../support/authorised-work";
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

  // Issue 19 audit: a part the owner approved on a priced line, received for one job, then moved to
  // another job. Whether the first job is billed for it follows where the part went.
  describe("an approved line's part moved to another job", () => {
    let owner: Actor;
    let mine: { id: number; publicId: string }[];
    const cable = { kind: "part" as const, description: "Clutch cable", qty: "1", unitPrice: "16.00" };
    const fit = { kind: "labour" as const, description: "Fit the part", hours: "0.5", rate: "100.00" };
    const label = async (jobId: number) => `J-${String((await k("jobs").where({ id: jobId }).first("number"))!.number).padStart(4, "0")}`;
    const partOf = async (jobId: number, description: string) => (await listParts({ shopId: shop.id, jobId })).find((r) => r.description === description)!;
    const work = (jobId: number) => authorisedWork({ shopId: shop.id, jobId });
    const billed = (w: Awaited<ReturnType<typeof work>>) => w.lines.map((l) => [l.kind, l.description, l.kind === "part" ? l.unitPriceMinor : null]);
    /** The owner approves the part and its fitting; the part arrives, not fitted yet. */
    const approvedAndArrived = async (job: { id: number; publicId: string }, part = cable) => {
      const { requestPublicId } = await authorise({ writer, owner, jobPublicId: job.publicId, title: `${part.description} worn`, lines: [part, fit], fitParts: false });
      const id = (await partOf(job.id, part.description)).id;
      await changeJobPartStatus(writer, await on(writer, job.publicId, "parts:manage"), { part: id, from: "needed", to: "received", expectedOn: null });
      return { requestPublicId, partId: id };
    };

    beforeAll(async () => {
      ({ owner, jobs: mine } = await ownerWithJobs(k, shop, 6, "Bo Lindqvist"));
    });

    it("“no longer needs it”: the line is withdrawn with who, when and why; never billed nor waited on, and the draft says so", async () => {
      const [a, b] = [mine[0]!, mine[1]!];
      const { requestPublicId, partId } = await approvedAndArrived(a);
      const before = await work(a.id);
      expect(before.partsNotFitted).toEqual([{ description: "Clutch cable", status: "received" }]);
      expect(billed(before)).toEqual([["labour", "Fit the part", null]]);

      await movePart(tech, await on(tech, a.publicId, "parts:manage"), await on(tech, b.publicId, "parts:manage"), { part: partId, forWork: BOOKED, thisJob: "done" });
      // The part is the other job's now, for its booked work, tied to no line of either job.
      expect(await row(partId)).toMatchObject({ job_id: b.id, finding_line_id: null, owner_answer: null, no_ok_needed: 1, status: "received" });
      const line = (await k("finding_lines as l").join("findings as f", "f.id", "l.finding_id").where({ "f.job_id": a.id, "l.kind": "part" }).first("l.*"))!;
      expect(line).toMatchObject({ withdrawn_by_user_id: tech.userId, withdrawn_reason: `Its part went to job ${await label(b.id)}; this job no longer needs it.` });
      expect(line.withdrawn_at).toBeInstanceOf(Date);

      const after = await work(a.id);
      // Not billed straight away (the part has no line any more), nor listed as waiting to be fitted.
      expect(billed(after)).toEqual([["labour", "Fit the part", null]]);
      expect(after.partsNotFitted).toEqual([]);
      expect(after.linesWithdrawn).toEqual([
        { request: requestPublicId, no: 1, description: "Clutch cable", netMinor: 1600, reason: line.withdrawn_reason, at: (line.withdrawn_at as Date).toISOString(), by: (await k("users").where({ id: tech.userId }).first("name"))!.name },
      ]);
      // The owner's answer stays on record; what they authorised no longer counts the cable.
      expect(after.record[0]).toMatchObject({ approved: [{ no: 1, description: "Clutch cable" }, { no: 2, description: "Fit the part" }], withdrawn: [{ no: 1, description: "Clutch cable" }] });
      expect(before.authorisedPreTaxMinor - after.authorisedPreTaxMinor).toBe(1600);
      // Nothing holds the first job, and its owner's page shows no wait for the cable.
      expect((await jobFacts({ shopId: shop.id, jobId: a.id })).outstandingParts).toBe(0);
      expect(await ownerPartWaitLines({ shopId: shop.id, jobId: a.id })).toEqual([]);

      // The draft invoice: the labour only, and the withdrawn line said beside it, for the desk.
      const { publicId } = await createInvoice(writer, await access(writer, "jobMoney", a.publicId, "invoice:create"));
      const invoice = (await k("invoices").where({ public_id: publicId }).first("id"))!;
      expect((await k("invoice_lines").where({ invoice_id: invoice.id }).orderBy("position")).map((l) => l.description)).toEqual(["Fit the part"]);
      const desk = await invoiceView(a.id, "shop");
      expect(desk.missingAuthorised).toBe(0);
      expect(desk.linesWithdrawn.map((w) => [w.description, w.reason])).toEqual([["Clutch cable", line.withdrawn_reason]]);
      // The owner reads why in their own words: not the other job, nor who.
      const theirs = await invoiceView(a.id, "owner");
      expect(theirs.linesWithdrawn).toEqual([]);
      expect(theirs.record[0]!.withdrawn).toEqual([expect.objectContaining({ description: "Clutch cable", reason: OWNER_WITHDRAWN_REASON, by: null })]);
      expect(JSON.stringify(theirs.record)).not.toContain(await label(b.id));
    });

    it("“still needs one” and “swap”: the line stays with the first job's new or swapped part, billed once that one is fitted", async () => {
      const [c, d, other] = [mine[2]!, mine[3]!, mine[4]!];
      // The other job awaits its own drive belt, on order.
      const belt = { kind: "part" as const, description: "Drive belt", qty: "1", unitPrice: "42.00" };
      const theirs = await part(other.publicId, "Drive belt");
      await orderParts(tech, { shopId: shop.id, jobId: null }, { supplier: "Northgate Supply", reference: "PO-9", orderedOn: "2026-12-01", expectedOn: "2026-12-12", parts: [theirs] });

      const needs = await approvedAndArrived(c);
      const moved = await movePart(tech, await on(tech, c.publicId, "parts:manage"), await on(tech, other.publicId, "parts:manage"), { part: needs.partId, forWork: BOOKED, thisJob: "needs" });
      expect(await row(moved.newPartId!)).toMatchObject({ job_id: c.id, status: "needed", owner_answer: "approved", sell_minor: 1600 });
      const c1 = await work(c.id);
      expect([c1.partsNotFitted, c1.linesWithdrawn, billed(c1)]).toEqual([[{ description: "Clutch cable", status: "needed" }], [], [["labour", "Fit the part", null]]]);
      expect((await jobFacts({ shopId: shop.id, jobId: c.id })).outstandingParts).toBe(1);
      await changeJobPartStatus(writer, await on(writer, c.publicId, "parts:manage"), { part: moved.newPartId!, from: "needed", to: "fitted", expectedOn: null });
      expect(billed(await work(c.id))).toEqual([
        ["part", "Clutch cable", 1600],
        ["labour", "Fit the part", null],
      ]);

      const swap = await approvedAndArrived(d, belt);
      const swapped = await movePart(tech, await on(tech, d.publicId, "parts:manage"), await on(tech, other.publicId, "parts:manage"), { part: swap.partId, forWork: BOOKED, thisJob: "swap" });
      expect(swapped.swappedPartId).toBe(theirs);
      expect(await row(theirs)).toMatchObject({ job_id: d.id, status: "ordered", owner_answer: "approved", sell_minor: 4200 });
      const d1 = await work(d.id);
      expect([d1.partsNotFitted, d1.linesWithdrawn, billed(d1)]).toEqual([[{ description: "Drive belt", status: "ordered" }], [], [["labour", "Fit the part", null]]]);
      expect(await ownerPartWaitLines({ shopId: shop.id, jobId: d.id })).toEqual(["Part on order: Drive belt, expected 2026-12-12."]);
    });

    it("a fitted part whose old one went back to the owner (“Returned to owner”) is still billed: the new part is in the machine", async () => {
      // "Returned" is the step after "fitted" (lib/bench.ts): the replaced part handed back. The owner
      // pays for the new part that is in their machine whether or not they kept the old one:
      // common trade practice, no published source.
      const e = mine[5]!;
      const lever = { kind: "part" as const, description: "Brake lever", qty: "1", unitPrice: "30.00" };
      const { partId } = await approvedAndArrived(e, lever);
      const managing = await on(writer, e.publicId, "parts:manage");
      await changeJobPartStatus(writer, managing, { part: partId, from: "received", to: "fitted", expectedOn: null });
      await changeJobPartStatus(writer, managing, { part: partId, from: "fitted", to: "returned", expectedOn: null });
      const w = await work(e.id);
      expect(w.partsNotFitted).toEqual([]);
      expect(w.linesWithdrawn).toEqual([]);
      expect(billed(w)).toEqual([
        ["part", "Brake lever", 3000],
        ["labour", "Fit the part", null],
      ]);
      const { publicId } = await createInvoice(writer, await access(writer, "jobMoney", e.publicId, "invoice:create"));
      const invoice = (await k("invoices").where({ public_id: publicId }).first("id"))!;
      expect((await k("invoice_lines").where({ invoice_id: invoice.id }).orderBy("position")).map((l) => [l.description, l.unit_price_minor == null ? null : Number(l.unit_price_minor)])).toEqual([
        ["Brake lever", 3000],
        ["Fit the part", null],
      ]);
    });
  });
});
