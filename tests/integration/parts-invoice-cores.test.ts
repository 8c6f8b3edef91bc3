import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { saveMoneySettings } from "@/db/queries/findings";
import { DEFAULT_MONEY_SETTINGS } from "@/lib/approvals";
import { TOLERANCE_PRESETS } from "@/lib/shop-settings";
import type { Actor } from "@/lib/permissions";
import { access } from "@/lib/server/access";
import { addJobPart } from "@/lib/server/bench-parts";
import { recordDeposit } from "@/lib/server/invoice-payments";
import { invoiceView } from "@/lib/server/invoice-views";
import { createInvoice, issueInvoice, removeLine, syncAuthorised } from "@/lib/server/invoices";
import { askPartDeposit, chargeCore, coreReturned, markSpecialOrder } from "@/lib/server/part-orders";
import { authorise, ownerWithJobs, staffActor } from "../support/authorised-work";
import { testKnex } from "../support/db";
import { makeShop } from "../support/fixtures";

// Issue 19: a fitted part's core charge goes on the invoice; once the old core goes back, a credit
// line gives it back with its tax; a special-order deposit already paid shows against the invoice.
// The whole core charge comes back with the core: common trade practice, no published source.

type Shop = Awaited<ReturnType<typeof makeShop>>;

describe("cores and special-order deposits on the invoice", () => {
  let k: Knex;
  let shop: Shop;
  let writer: Actor;
  let owner: Actor;
  let jobs: { id: number; publicId: string }[];
  const version = async (publicId: string) => Number((await k("invoices").where({ public_id: publicId }).first("version"))!.version);

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "part-cores", roles: ["owner", "service_writer", "technician"] });
    writer = staffActor(shop, "service_writer");
    await saveMoneySettings({ shopId: shop.id, settings: { ...DEFAULT_MONEY_SETTINGS, labourRateMinor: 10_000, tax: { ratePercent: "8.25", method: "per_line" } } });
    ({ owner, jobs } = await ownerWithJobs(k, shop, 1));
  });
  afterAll(async () => k?.destroy());

  it("charges a fitted part's core, flags it past the estimate until the core goes back, then credits it with its tax", async () => {
    const job = jobs[0]!;
    // The starter's line makes its job part; the helper's bench fits it.
    await authorise({ writer, owner, jobPublicId: job.publicId, title: "Starter dead", lines: [{ kind: "part", description: "Starter motor", qty: "1", unitPrice: "120.00" }] });
    const starter = (await k("job_parts").where({ job_id: job.id, description: "Starter motor" }).first())!;
    expect(starter.status).toBe("fitted");
    const parts = await access(writer, "job", job.publicId, "parts:manage");
    await chargeCore(writer, parts, { part: Number(starter.id), charge: "25.00" });

    // A special-order seat, its deposit asked before ordering and paid at the counter.
    const seat = await addJobPart(writer, parts, { job: job.publicId, description: "Seat cover, made to order", partNumber: null, supplier: null, qty: "1", cost: null, status: "needed", expectedOn: null, forWork: { findingId: null, noOkNeeded: true } });
    await markSpecialOrder(writer, parts, { part: seat.id, special: true });
    const money = await access(writer, "jobMoney", job.publicId, "invoice:create");
    const { deposit } = await askPartDeposit(writer, money, { part: seat.id, amount: "30.00", note: "Made to order" });
    await recordDeposit(writer, await access(writer, "deposit", deposit.publicId, "invoice:record-payment"), { deposit: deposit.publicId, method: "cash", reference: null });

    const { publicId } = await createInvoice(writer, money);
    const lines = async () => (await k("invoice_lines").join("invoices", "invoices.id", "invoice_lines.invoice_id").where("invoices.public_id", publicId).orderBy("position").select("invoice_lines.*")).map((l) => [l.source, l.description, Number(l.unit_price_minor ?? l.amount_minor), l.part_id == null ? null : Number(l.part_id)]);
    expect(await lines()).toEqual([
      ["authorised", "Starter motor", 12_000, null],
      ["core_charge", "Core charge: Starter motor", 2500, Number(starter.id)],
    ]);
    // Strict estimate (REFERENCES §6: no charge above it without consent): the core charge is flagged.
    let view = await invoiceView(job.id, "shop");
    expect(view.invoice!.flaggedCount).toBe(1);
    await expect(issueInvoice(writer, await access(writer, "invoice", publicId, "invoice:create"), await version(publicId))).rejects.toMatchObject({ code: "conflict" });

    // The old starter goes back: the credit comes in once, and nothing is flagged any more.
    await coreReturned(writer, parts, { part: Number(starter.id) });
    view = await invoiceView(job.id, "shop");
    expect(view.missingAuthorised).toBe(1);
    await syncAuthorised(await access(writer, "invoice", publicId, "invoice:create"), await version(publicId));
    await expect(syncAuthorised(await access(writer, "invoice", publicId, "invoice:create"), await version(publicId))).rejects.toMatchObject({ code: "conflict" });
    expect((await lines()).map((l) => l[0])).toEqual(["authorised", "core_charge", "core_credit"]);
    // Taking the charge off takes its credit with it (a credit alone would give back what wasn't charged); bringing in restores both.
    const chargeLine = (await k("invoice_lines").join("invoices", "invoices.id", "invoice_lines.invoice_id").where("invoices.public_id", publicId).where("invoice_lines.source", "core_charge").first("invoice_lines.id"))!;
    await removeLine(await access(writer, "invoice", publicId, "invoice:create"), { version: await version(publicId), line: Number(chargeLine.id) });
    expect((await lines()).map((l) => l[0])).toEqual(["authorised"]);
    await syncAuthorised(await access(writer, "invoice", publicId, "invoice:create"), await version(publicId));
    expect((await lines()).map((l) => l[0])).toEqual(["authorised", "core_charge", "core_credit"]);
    view = await invoiceView(job.id, "shop");
    const inv = view.invoice!;
    // $120.00 at 8.25 % = $9.90; the $25.00 core's $2.0625 → $2.06 comes back with it (SSUTA §324 / RCW 82.08.054, per line, half-up).
    expect(inv.lines.map((l) => [l.source, l.netMinor, l.taxMinor, l.flagged])).toEqual([
      ["authorised", 12_000, 990, false],
      ["core_charge", 2500, 206, false],
      ["core_credit", -2500, -206, false],
    ]);
    expect([inv.subtotalMinor, inv.taxMinor, inv.totalMinor]).toEqual([12_000, 990, 12_990]);
    // The seat's deposit, paid before the invoice, counts against it and says what it was for.
    expect([inv.paidMinor, inv.balanceMinor]).toEqual([3000, 9990]);
    expect(view.payments.map((p) => [p.kind, p.amountMinor, p.forPart])).toEqual([["deposit", 3000, "Seat cover, made to order"]]);

    await issueInvoice(writer, await access(writer, "invoice", publicId, "invoice:create"), await version(publicId));
    const ownerView = await invoiceView(job.id, "owner");
    expect(ownerView.invoice!.status).toBe("issued");
    expect(ownerView.invoice!.lines.map((l) => l.description)).toEqual(["Starter motor", "Core charge: Starter motor", "Core returned: Starter motor"]);
    expect(ownerView.payments[0]!.forPart).toBe("Seat cover, made to order");
    // The core went back before the invoice was issued: the credit is on it, nothing is owed.
    expect(await k("shop_events").where({ shop_id: shop.id, kind: "core_credit_owed" })).toEqual([]);
  });

  it("a core that goes back after the invoice was issued puts 'core credit owed' in the desk inbox with the amount", async () => {
    // A shop with a 10 % allowance over the estimate (Maryland §14-1002(b)), so a $10 core charge on a
    // $120 part can be billed before the core is back.
    const tolerant = await makeShop(k, { label: "part-cores-late", roles: ["owner", "service_writer", "technician"] });
    const desk = staffActor(tolerant, "service_writer");
    await saveMoneySettings({ shopId: tolerant.id, settings: { ...DEFAULT_MONEY_SETTINGS, tolerance: TOLERANCE_PRESETS.maryland.setting } });
    const { owner: them, jobs: [job] } = await ownerWithJobs(k, tolerant, 1);
    await authorise({ writer: desk, owner: them, jobPublicId: job!.publicId, title: "Starter dead", lines: [{ kind: "part", description: "Starter motor", qty: "1", unitPrice: "120.00" }] });
    const starter = (await k("job_parts").where({ job_id: job!.id, description: "Starter motor" }).first())!;
    const parts = await access(desk, "job", job!.publicId, "parts:manage");
    await chargeCore(desk, parts, { part: Number(starter.id), charge: "10.00" });
    const { publicId } = await createInvoice(desk, await access(desk, "jobMoney", job!.publicId, "invoice:create"));
    await issueInvoice(desk, await access(desk, "invoice", publicId, "invoice:create"), await version(publicId));

    await coreReturned(desk, parts, { part: Number(starter.id) });
    const owed = await k("shop_events").where({ shop_id: tolerant.id, kind: "core_credit_owed" });
    expect(owed).toHaveLength(1);
    const payload = typeof owed[0]!.payload === "string" ? JSON.parse(owed[0]!.payload) : owed[0]!.payload;
    expect(payload).toMatchObject({ amountMinor: 1000, currency: "USD", invoice: publicId, part: Number(starter.id) });
    expect(payload.summary).toMatch(/^Core of Starter motor returned after invoice .+ was issued: the owner is owed the core charge$/);
    // The issued invoice itself is not changed behind the owner's back.
    const lines = await k("invoice_lines").join("invoices", "invoices.id", "invoice_lines.invoice_id").where("invoices.public_id", publicId).pluck("invoice_lines.source");
    expect(lines).toEqual(["authorised", "core_charge"]);
  });
});
