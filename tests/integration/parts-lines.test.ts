import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { listParts } from "@/db/queries/bench-parts";
import { saveMoneySettings } from "@/db/queries/findings";
import { saveMarkupRule } from "@/db/queries/parts-pricing";
import { jobFacts } from "@/db/queries/workflow";
import { DEFAULT_MONEY_SETTINGS } from "@/lib/approvals";
import type { MarkupRule } from "@/lib/parts-pricing";
import type { Action, Actor } from "@/lib/permissions";
import type { FindingInput } from "@/lib/schemas/approvals";
import { access } from "@/lib/server/access";
import { answerRequest, sendRequest } from "@/lib/server/approvals";
import { addJobPart, changeJobPartStatus } from "@/lib/server/bench-parts";
import { createFinding, saveFinding } from "@/lib/server/findings";
import { createInvoice, syncAuthorised } from "@/lib/server/invoices";
import { orderParts } from "@/lib/server/part-orders";
import { ownerWithJobs, staffActor } from "../support/authorised-work";
import { testKnex } from "../support/db";
import { makeShop } from "../support/fixtures";

// Issue 19: every part line of a finding stands for one job part, costed or not (without a cost
// its typed price is the sell price, no markup), and a saved line may stand for another of the
// job's parts, or a new one, until the owner answers.

type Shop = Awaited<ReturnType<typeof makeShop>>;
const on = (actor: Actor, job: string, permission: Action) => access(actor, "job", job, permission);
// common trade practice, no published source: a flat 35 % on cost.
const FLAT: MarkupRule = { kind: "percent", percent: "35" };
const finding = (title: string, lines: FindingInput["lines"]): FindingInput => ({ title, found: `${title}: found on inspection.`, whyItMatters: null, safety: "none", evidence: [], lines });

describe("part lines and their parts", () => {
  let k: Knex;
  let shop: Shop;
  let writer: Actor;
  let tech: Actor;
  let owner: Actor;
  let jobs: { id: number; publicId: string }[];
  const answer = async (sent: { publicId: string; hash: string }, answers: ("approved" | "declined")[]) =>
    answerRequest(owner, await access(owner, "request", sent.publicId, "approvals:answer"), { shownHash: sent.hash, lines: answers.map((a, i) => ({ no: i + 1, answer: a })), signature: owner.name, wantsPartsBack: false, confirmed: true }, { ip: "203.0.113.9", userAgent: "vitest" });
  const partsOf = async (jobId: number) => (await listParts({ shopId: shop.id, jobId })).map((p) => [p.description, p.costMinor, p.sellMinor, p.ownerAnswer, p.status]);

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "part-lines", roles: ["owner", "service_writer", "technician"] });
    writer = staffActor(shop, "service_writer");
    tech = staffActor(shop, "technician");
    await saveMoneySettings({ shopId: shop.id, settings: { ...DEFAULT_MONEY_SETTINGS, labourRateMinor: 10_000 } });
    await saveMarkupRule({ shopId: shop.id, rule: FLAT });
    ({ owner, jobs } = await ownerWithJobs(k, shop, 3));
  });
  afterAll(async () => k?.destroy());

  it("an uncosted part line makes its part at the typed price, no markup; approval, ordering and the invoice follow", async () => {
    const job = jobs[0]!;
    const plug = { kind: "part" as const, description: "Spark plug", partNumber: null, qty: "1", unitPrice: "12.00" };
    const filter = { kind: "part" as const, description: "Air filter", partNumber: null, qty: "1", unitPrice: "18.00" };
    const made = await createFinding(writer, await on(writer, job.publicId, "approvals:draft"), finding("Misfire at idle", [plug, filter]));
    // The shop has a markup rule, but there is no cost to apply it to: $12.00 stays $12.00, no reason asked.
    expect((await k("finding_lines").where({ finding_id: made.id }).orderBy("position")).map((l) => Number(l.unit_price_minor))).toEqual([1200, 1800]);
    expect(await partsOf(job.id)).toEqual([
      ["Spark plug", null, 1200, "pending", "needed"],
      ["Air filter", null, 1800, "pending", "needed"],
    ]);
    // A technician's unpriced part line makes its part too, with no price yet.
    await createFinding(tech, await on(tech, jobs[1]!.publicId, "approvals:draft"), finding("Grip worn", [{ kind: "part", description: "Left grip", partNumber: null, qty: "1" }]));
    expect(await partsOf(jobs[1]!.id)).toEqual([["Left grip", null, null, "pending", "needed"]]);

    const sent = await sendRequest(writer, await on(writer, job.publicId, "approvals:send"), made.id, { findingVersion: made.version });
    expect((await jobFacts({ shopId: shop.id, jobId: job.id })).outstandingParts).toBe(0);
    await answer(sent, ["approved", "declined"]);
    expect(await partsOf(job.id)).toEqual([
      ["Spark plug", null, 1200, "approved", "needed"],
      ["Air filter", null, 1800, "declined", "needed"],
    ]);
    // Only the approved plug waits the job; the declined filter is never ordered.
    expect((await jobFacts({ shopId: shop.id, jobId: job.id })).outstandingParts).toBe(1);
    expect((await k("jobs").where({ id: job.id }).first("status"))!.status).toBe("waiting_parts");
    const [plugPart, filterPart] = await listParts({ shopId: shop.id, jobId: job.id });
    await expect(orderParts(writer, { shopId: shop.id, jobId: null }, { supplier: "Northgate Supply", reference: null, orderedOn: "2026-12-04", expectedOn: null, parts: [filterPart!.id] })).rejects.toMatchObject({ code: "conflict" });

    // The invoice waits for the plug to be fitted, then bills it at the typed $12.00; never the filter.
    const money = await access(writer, "jobMoney", job.publicId, "invoice:create");
    await expect(createInvoice(writer, money)).rejects.toMatchObject({ code: "invalid" });
    await changeJobPartStatus(writer, await on(writer, job.publicId, "parts:manage"), { part: plugPart!.id, from: "needed", to: "fitted", expectedOn: null });
    const { publicId } = await createInvoice(writer, money);
    const invoice = (await k("invoices").where({ public_id: publicId }).first())!;
    expect((await k("invoice_lines").where({ invoice_id: invoice.id })).map((l) => [l.description, Number(l.unit_price_minor)])).toEqual([["Spark plug", 1200]]);
    await expect(syncAuthorised(await access(writer, "invoice", publicId, "invoice:create"), Number(invoice.version))).rejects.toMatchObject({ code: "conflict" });
  });

  it("a saved line re-points to another of the job's parts or a new one before the answer, and is refused after it", async () => {
    const job = jobs[2]!;
    const drafting = async () => on(writer, job.publicId, "approvals:draft");
    const stock = await addJobPart(writer, await on(writer, job.publicId, "parts:manage"), { job: job.publicId, description: "Chain kit (from stock)", partNumber: "CK-520", supplier: null, qty: "1", cost: "60.00", status: "received", expectedOn: null, forWork: { findingId: null, noOkNeeded: false } });
    const chain = { kind: "part" as const, description: "Chain kit", partNumber: null, qty: "1", cost: "", unitPrice: "90.00" };
    const made = await createFinding(writer, await drafting(), finding("Chain stretched", [chain]));
    const lineId = Number((await k("finding_lines").where({ finding_id: made.id }).first("id"))!.id);
    const first = (await k("job_parts").where({ finding_line_id: lineId }).first())!;
    expect(first.description).toBe("Chain kit");

    // The desk points the line at the kit already on the shelf: the proposal it had is dropped,
    // the stock kit keeps its $60.00 cost and is priced by the rule (+35 % → $81.00).
    const v2 = await saveFinding(writer, await drafting(), made.id, { ...finding("Chain stretched", [{ ...chain, id: lineId, unitPrice: "", partId: stock.id }]), version: made.version });
    expect(await k("job_parts").where({ id: first.id })).toHaveLength(0);
    expect(await partsOf(job.id)).toEqual([["Chain kit", 6000, 8100, "pending", "received"]]);
    expect(Number((await k("job_parts").where({ id: stock.id }).first())!.finding_line_id)).toBe(lineId);
    expect(Number((await k("finding_lines").where({ id: lineId }).first())!.unit_price_minor)).toBe(8100);

    // A technician may not re-point; nothing changes.
    await expect(saveFinding(tech, await on(tech, job.publicId, "approvals:draft"), made.id, { ...finding("Chain stretched", [{ kind: "part", description: "Chain kit", partNumber: null, qty: "1", id: lineId, newPart: true }]), version: v2.version })).rejects.toMatchObject({ code: "forbidden", fields: { "lines.0.partId": [expect.any(String)] } });

    // Then at a new part after all: the stock kit, already in, is let go (kept on the job, for no named work).
    const v3 = await saveFinding(writer, await drafting(), made.id, { ...finding("Chain stretched", [{ ...chain, id: lineId, unitPrice: "95.00", newPart: true }]), version: v2.version });
    expect(await partsOf(job.id)).toEqual([
      ["Chain kit", 6000, 8100, null, "received"],
      ["Chain kit", null, 9500, "pending", "needed"],
    ]);
    expect((await k("job_parts").where({ id: stock.id }).first())!.finding_line_id).toBeNull();

    // Sent and answered: the line can't stand for another part any more, and says so.
    const sent = await sendRequest(writer, await on(writer, job.publicId, "approvals:send"), made.id, { findingVersion: v3.version });
    await answer(sent, ["approved"]);
    const before = await partsOf(job.id);
    await expect(saveFinding(writer, await drafting(), made.id, { ...finding("Chain stretched", [{ ...chain, id: lineId, partId: stock.id }]), version: v3.version })).rejects.toMatchObject({
      code: "conflict",
      message: expect.stringMatching(/owner has answered/),
    });
    expect(await partsOf(job.id)).toEqual(before);
  });
});
