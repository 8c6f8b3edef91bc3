import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { saveMoneySettings } from "@/db/queries/findings";
import { listParts } from "@/db/queries/bench-parts";
import { getMarkupRule, saveMarkupRule } from "@/db/queries/parts-pricing";
import { jobFacts } from "@/db/queries/workflow";
import { DEFAULT_MONEY_SETTINGS } from "@/lib/approvals";
import type { MarkupRule } from "@/lib/parts-pricing";
import type { Action, Actor } from "@/lib/permissions";
import type { FindingInput } from "@/lib/schemas/approvals";
import { access } from "@/lib/server/access";
import { answerRequest, sendRequest } from "@/lib/server/approvals";
import { authorisedWork } from "@/lib/server/authorised-work";
import { addJobPart, changeJobPartStatus } from "@/lib/server/bench-parts";
import { createFinding, saveFinding } from "@/lib/server/findings";
import { saveMarkup } from "@/lib/server/part-pricing";
import { invoiceView } from "@/lib/server/invoice-views";
import { createInvoice, issueInvoice, syncAuthorised } from "@/lib/server/invoices";
import { ownerWithJobs, staffActor } from "../support/authorised-work";
import { testKnex } from "../support/db";
import { makeShop } from "../support/fixtures";

// Issue 19: a part is typed once, on the finding's priced line, and flows from there: the owner's
// answer makes it needed (or leaves it out), it is ordered, received and fitted on the bench, and
// the invoice takes it at the approved sell price. The cost never leaves the staff side.

type Shop = Awaited<ReturnType<typeof makeShop>>;
const on = (actor: Actor, job: string, permission: Action) => access(actor, "job", job, permission);
// common trade practice, no published source: cheap parts carry a bigger markup than dear ones.
const BANDS: MarkupRule = {
  kind: "bands",
  bands: [
    { upToMinor: 1000, percent: "100" },
    { upToMinor: 5000, percent: "60" },
    { upToMinor: null, percent: "35" },
  ],
};

describe("parts flow into the price", () => {
  let k: Knex;
  let shop: Shop;
  let writer: Actor;
  let owner: Actor;
  let jobs: { id: number; publicId: string }[];
  const status = async (jobId: number) => (await k("jobs").where({ id: jobId }).first("status"))!.status;

  const finding = (lines: FindingInput["lines"]): FindingInput => ({ title: "Clutch slipping", found: "Clutch slips under load.", whyItMatters: null, safety: "none", evidence: [], lines });
  const cable = { kind: "part" as const, description: "Clutch cable", partNumber: "CC-100", qty: "1", cost: "8.00", unitPrice: "" };
  const plates = { kind: "part" as const, description: "Friction plate set", partNumber: null, qty: "1", cost: "40.00", unitPrice: "70.00" };
  const labour = { kind: "labour" as const, description: "Fit clutch parts", partNumber: null, hours: "1.0", rate: "100.00" };

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "parts-price", roles: ["owner", "service_writer", "technician"] });
    writer = staffActor(shop, "service_writer");
    await saveMoneySettings({ shopId: shop.id, settings: { ...DEFAULT_MONEY_SETTINGS, labourRateMinor: 10_000 } });
    await saveMarkupRule({ shopId: shop.id, rule: BANDS });
    ({ owner, jobs } = await ownerWithJobs(k, shop, 2));
  });
  afterAll(async () => k?.destroy());

  it("prices from the cost by the shop's bands; a different price needs a reason, which is kept", async () => {
    expect(await getMarkupRule({ shopId: shop.id })).toEqual(BANDS);
    const job = jobs[1]!;
    const drafting = await on(writer, job.publicId, "approvals:draft");
    await expect(createFinding(writer, drafting, finding([cable, plates]))).rejects.toMatchObject({ code: "invalid", fields: { "lines.1.priceReason": [expect.stringContaining("$64.00")] } });
    expect(await k("findings").where({ job_id: job.id })).toHaveLength(0);
    expect(await k("job_parts").where({ job_id: job.id })).toHaveLength(0);

    const made = await createFinding(writer, drafting, finding([cable, { ...plates, priceReason: "Price agreed with the owner at drop-off" }]));
    const lines = await k("finding_lines").where({ finding_id: made.id }).orderBy("position");
    // $8.00 is in the first band (+100 %): $16.00. $40.00 would be $64.00 (+60 %); $70.00 was typed.
    expect(lines.map((l) => Number(l.unit_price_minor))).toEqual([1600, 7000]);
    const parts = await listParts({ shopId: shop.id, jobId: job.id });
    expect(parts.map((p) => [p.description, p.costMinor, p.sellMinor, p.priceReason, p.ownerAnswer, p.status])).toEqual([
      ["Clutch cable", 800, 1600, null, "pending", "needed"],
      ["Friction plate set", 4000, 7000, "Price agreed with the owner at drop-off", "pending", "needed"],
    ]);
    // Saving again with the same cost and price keeps the reason without asking twice.
    const again = await saveFinding(writer, drafting, made.id, { ...finding([{ ...cable, id: Number(lines[0]!.id) }, { ...plates, id: Number(lines[1]!.id) }]), version: made.version });
    expect(again.version).toBe(2);
    expect((await listParts({ shopId: shop.id, jobId: job.id })).map((p) => p.priceReason)).toEqual([null, "Price agreed with the owner at drop-off"]);
    // Removing a line drops its part while it was only proposed.
    await saveFinding(writer, drafting, made.id, { ...finding([{ ...cable, id: Number(lines[0]!.id) }]), version: 2 });
    expect((await listParts({ shopId: shop.id, jobId: job.id })).map((p) => p.description)).toEqual(["Clutch cable"]);
    // A part already on the job (taken from stock) is picked by a line: one record, not a second.
    const stock = await addJobPart(writer, await on(writer, job.publicId, "parts:manage"), {
      job: job.publicId,
      description: "Clutch lever",
      partNumber: null,
      supplier: null,
      qty: "1",
      cost: "6.00",
      status: "received",
      expectedOn: null,
      forWork: { findingId: null, noOkNeeded: false },
    });
    await saveFinding(writer, drafting, made.id, { ...finding([{ ...cable, id: Number(lines[0]!.id) }, { kind: "part", description: "Clutch lever", partNumber: null, qty: "1", unitPrice: "", partId: stock.id }]), version: 3 });
    const picked = (await listParts({ shopId: shop.id, jobId: job.id })).find((p) => p.id === stock.id)!;
    // Its stored $6.00 cost prices it by the first band: $12.00.
    expect([picked.ownerAnswer, picked.costMinor, picked.sellMinor, picked.status]).toEqual(["pending", 600, 1200, "received"]);
    expect(await k("job_parts").where({ job_id: job.id })).toHaveLength(2);
  });

  it("finding line → approved → needed → ordered → received → fitted → on the invoice at the approved price; the declined one never", async () => {
    const job = jobs[0]!;
    const made = await createFinding(writer, await on(writer, job.publicId, "approvals:draft"), finding([cable, { ...plates, priceReason: "Matched the counter price" }, labour]));
    // Proposed parts don't hold the job.
    expect((await jobFacts({ shopId: shop.id, jobId: job.id })).outstandingParts).toBe(0);

    const sent = await sendRequest(writer, await on(writer, job.publicId, "approvals:send"), made.id, { findingVersion: made.version });
    // The owner's request and e-mail carry the sell price only, never the cost or the reason.
    const request = await k("approval_requests").where({ public_id: sent.publicId }).first();
    expect(request!.canonical).not.toMatch(/cost|reason|"unitPriceMinor":800\b|"unitPriceMinor":4000\b/i);
    expect(request!.canonical).toContain('"unitPriceMinor":1600');
    const mail = await k("outbox").where({ dedupe_scope: shop.id, dedupe_key: `approval:${sent.publicId}` }).first();
    expect(mail!.text).toContain("$16.00");
    expect(`${mail!.text}${mail!.html}`).not.toMatch(/\$8\.00|\$40\.00|counter price/);

    await answerRequest(
      owner,
      await access(owner, "request", sent.publicId, "approvals:answer"),
      { shownHash: sent.hash, lines: [{ no: 1, answer: "approved" }, { no: 2, answer: "declined" }, { no: 3, answer: "approved" }], signature: owner.name, wantsPartsBack: false, confirmed: true },
      { ip: "203.0.113.9", userAgent: "vitest" },
    );
    const [approved, declined] = await listParts({ shopId: shop.id, jobId: job.id });
    expect([approved!.ownerAnswer, declined!.ownerAnswer]).toEqual(["approved", "declined"]);
    // Only the approved part waits the job.
    expect((await jobFacts({ shopId: shop.id, jobId: job.id })).outstandingParts).toBe(1);
    expect(await status(job.id)).toBe("waiting_parts");

    const managing = async () => on(writer, job.publicId, "parts:manage");
    await expect(changeJobPartStatus(writer, await managing(), { part: declined!.id, from: "needed", to: "ordered", expectedOn: null })).rejects.toMatchObject({ code: "conflict" });
    await changeJobPartStatus(writer, await managing(), { part: approved!.id, from: "needed", to: "ordered", expectedOn: null });
    await changeJobPartStatus(writer, await managing(), { part: approved!.id, from: "ordered", to: "received", expectedOn: null });
    expect(await status(job.id)).toBe("in_progress");

    // Received but not fitted: not billed, and the draft says why.
    const { publicId } = await createInvoice(writer, await access(writer, "jobMoney", job.publicId, "invoice:create"));
    const invoice = (await k("invoices").where({ public_id: publicId }).first())!;
    const billed = async () => (await k("invoice_lines").where({ invoice_id: invoice.id }).orderBy("position")).map((l) => [l.kind, l.description, l.unit_price_minor == null ? null : Number(l.unit_price_minor)]);
    expect(await billed()).toEqual([["labour", "Fit clutch parts", null]]);
    expect((await authorisedWork({ shopId: shop.id, jobId: job.id })).partsNotFitted).toEqual([{ description: "Clutch cable", status: "received" }]);

    await changeJobPartStatus(writer, await managing(), { part: approved!.id, from: "received", to: "fitted", expectedOn: null });
    const version = Number((await k("invoices").where({ id: invoice.id }).first("version"))!.version);
    await syncAuthorised(await access(writer, "invoice", publicId, "invoice:create"), version);
    // Exactly the fitted part, at the price the owner approved; the declined one never.
    expect(await billed()).toEqual([
      ["labour", "Fit clutch parts", null],
      ["part", "Clutch cable", 1600],
    ]);
    // Issued, the owner's invoice page shows the sell price only: no cost, no reason.
    await issueInvoice(writer, await access(writer, "invoice", publicId, "invoice:create"), Number((await k("invoices").where({ id: invoice.id }).first("version"))!.version));
    const view = await invoiceView(job.id, "owner");
    expect(view.invoice!.lines.map((l) => [l.description, l.unitPriceMinor])).toEqual([
      ["Fit clutch parts", null],
      ["Clutch cable", 1600],
    ]);
    expect(JSON.stringify(view)).not.toMatch(/costMinor|cost_minor|sellMinor|price_?reason|counter price/i);
  });

  it("the shop owner sets the markup in settings; a bad band is refused beside its field and nothing is saved", async () => {
    const boss = staffActor(shop, "owner");
    const onShop = await access(boss, "shop", shop.slug, "shop:manage-settings");
    const form = { shop: shop.slug, markupKind: "bands" as const, markupPercent: "", band1UpTo: "20.00", band1Percent: "80", band2UpTo: "15.00", band2Percent: "50", topPercent: "30" };
    await expect(saveMarkup(boss, onShop, form)).rejects.toMatchObject({ code: "invalid", fields: { band2UpTo: ["Each band must end above the one before it."] } });
    await expect(saveMarkup(boss, onShop, { ...form, band2UpTo: "", band2Percent: "", topPercent: "" })).rejects.toMatchObject({ fields: { topPercent: [expect.any(String)] } });
    expect(await getMarkupRule({ shopId: shop.id })).toEqual(BANDS);
    await saveMarkup(boss, onShop, { ...form, band2UpTo: "", band2Percent: "" });
    expect(await getMarkupRule({ shopId: shop.id })).toEqual({ kind: "bands", bands: [{ upToMinor: 2000, percent: "80" }, { upToMinor: null, percent: "30" }] });
    const change = await k("shop_setting_changes").where({ shop_id: shop.id, section: "markup" }).first();
    expect(change!.user_id).toBe(boss.userId);
    // A technician may draft part lines but not cost them.
    const tech = staffActor(shop, "technician");
    await expect(createFinding(tech, await on(tech, jobs[1]!.publicId, "approvals:draft"), finding([{ kind: "part", description: "Lever", partNumber: null, qty: "1", cost: "3.00" }]))).rejects.toMatchObject({ code: "forbidden" });
    await saveMarkupRule({ shopId: shop.id, rule: BANDS });
  });
});
