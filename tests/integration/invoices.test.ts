import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { saveMoneySettings } from "@/db/queries/findings";
import { DEFAULT_MONEY_SETTINGS } from "@/lib/approvals";
import type { Action, Actor } from "@/lib/permissions";
import { access } from "@/lib/server/access";
import { authorisedWork } from "@/lib/server/authorised-work";
import { recordCounterPayment, recordDeposit, requestDeposit } from "@/lib/server/invoice-payments";
import { addLine, createInvoice, issueInvoice, removeLine } from "@/lib/server/invoices";
import { authorise, ownerWithJobs, staffActor } from "../support/authorised-work";
import { testKnex } from "../support/db";
import { makeShop } from "../support/fixtures";

type Shop = Awaited<ReturnType<typeof makeShop>>;
// Resolve and check exactly as the action wrapper does before calling the lib/server function.
const onJobMoney = (actor: Actor, job: string, permission: Action) => access(actor, "jobMoney", job, permission);
const onInvoice = (actor: Actor, invoice: string, permission: Action = "invoice:view") => access(actor, "invoice", invoice, permission);
// REFERENCES §5 worked example: three taxable parts at 8.25 %, taxed per line.
const PARTS = [
  { kind: "part" as const, description: "Front brake pads", qty: "1", unitPrice: "19.99" },
  { kind: "part" as const, description: "Front rotor", qty: "1", unitPrice: "42.50" },
  { kind: "part" as const, description: "Brake fluid", qty: "1", unitPrice: "6.99" },
  { kind: "labour" as const, description: "Fit and bleed", hours: "1.5", rate: "100.00" },
];

describe("invoices from authorised work", () => {
  let k: Knex;
  let shop: Shop;
  let writer: Actor;
  let tech: Actor;
  let owner: Actor;
  let stranger: Actor;
  let jobs: { id: number; publicId: string }[];
  const invoiceRow = (publicId: string) => k("invoices").where({ public_id: publicId }).first();

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "invoices", roles: ["owner", "service_writer", "technician"] });
    writer = staffActor(shop, "service_writer");
    tech = staffActor(shop, "technician");
    // Florida §559.909 (REFERENCES §6): the greater of $10 or 10 %, capped at $50.
    await saveMoneySettings({
      shopId: shop.id,
      settings: { ...DEFAULT_MONEY_SETTINGS, labourRateMinor: 10_000, tax: { ratePercent: "8.25", method: "per_line" }, tolerance: { kind: "greater_of", fixedMinor: 1000, percent: "10", capMinor: 5000 } },
    });
    ({ owner, jobs } = await ownerWithJobs(k, shop, 4));
    stranger = (await ownerWithJobs(k, shop, 1, "Someone Else")).owner;
  });
  afterAll(async () => k?.destroy());

  it("numbers 20 invoices created at once 1…20 (no gaps, no duplicates); a job gets one live invoice", async () => {
    const own = await makeShop(k, { label: "numbers", roles: ["service_writer"] });
    const desk = staffActor(own, "service_writer");
    const { owner: o, jobs: many } = await ownerWithJobs(k, own, 21);
    for (const job of many) await authorise({ writer: desk, owner: o, jobPublicId: job.publicId, title: "Spark plug", lines: [{ kind: "fee", description: "Spark plug", amount: "12.00" }] });
    const made = await Promise.all(many.slice(0, 20).map(async (job) => createInvoice(desk, await onJobMoney(desk, job.publicId, "invoice:create"))));
    expect(made.map((m) => m.number).sort((a, b) => a - b)).toEqual(Array.from({ length: 20 }, (_, i) => i + 1));
    // Five desks on one job at once: one invoice, the rest refused, and the number sequence stays whole.
    const last = await onJobMoney(desk, many[20]!.publicId, "invoice:create");
    const race = await Promise.allSettled(Array.from({ length: 5 }, () => createInvoice(desk, last)));
    expect(race.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    expect(race.filter((r) => r.status === "rejected").map((r) => (r as PromiseRejectedResult).reason.code)).toEqual(["conflict", "conflict", "conflict", "conflict"]);
    expect((race.find((r) => r.status === "fulfilled") as PromiseFulfilledResult<{ number: number }>).value.number).toBe(21);
    expect((await k("shops").where({ id: own.id }).first("next_invoice_number"))!.next_invoice_number).toBe(22);
    expect(await k("invoices").where({ shop_id: own.id }).count({ n: "*" }).first()).toEqual({ n: 21 });
  });

  it("makes a draft of the approved lines only, priced per REFERENCES §5, with the authorisation record", async () => {
    const job = jobs[0]!;
    const creating = await onJobMoney(writer, job.publicId, "invoice:create");
    await expect(createInvoice(writer, creating)).rejects.toThrow(/Nothing has been authorised/);
    await authorise({ writer, owner, jobPublicId: job.publicId, title: "Front brakes", lines: PARTS, approve: [0, 1, 2], wantsPartsBack: true });
    await expect(onJobMoney(tech, job.publicId, "invoice:create")).rejects.toMatchObject({ code: "forbidden" });
    const { publicId } = await createInvoice(writer, creating);
    const row = await invoiceRow(publicId);
    expect(row).toMatchObject({ status: "draft", subtotal_minor: 6948, tax_minor: 574, total_minor: 6948 + 574, paid_minor: 0, balance_minor: 7522 }); // SSUTA §324 / RCW 82.08.054, REFERENCES §5
    expect(row!.returned_parts_note).toMatch(/replaced parts back/);
    expect((await k("invoice_lines").where({ invoice_id: row!.id }).orderBy("position")).map((l) => l.description)).toEqual(["Front brake pads", "Front rotor", "Brake fluid"]);
    const work = await authorisedWork({ shopId: shop.id, jobId: job.id });
    expect(work.record[0]).toMatchObject({ method: "online", personName: owner.name, wantsPartsBack: true, approved: [{ description: "Front brake pads" }, { description: "Front rotor" }, { description: "Brake fluid" }], declined: [{ description: "Fit and bleed" }] });
  });

  it("charges an added line within the tolerance, flags one past it, and won't issue until it is removed", async () => {
    const job = jobs[0]!;
    const editing = await onInvoice(writer, (await k("invoices").where({ job_id: job.id }).first("public_id"))!.public_id, "invoice:create");
    const { invoice } = editing;
    // Florida §559.909 (REFERENCES §6): on $69.48 authorised the greater of $10 or 10 % is $10 → ceiling $79.48.
    await addLine(editing, { invoice: invoice.publicId, version: invoice.version, kind: "fee", description: "Disposal of old fluid", partNumber: null, amount: "9.00", taxable: false });
    let row = await invoiceRow(invoice.publicId);
    expect(row!.total_minor).toBe(7522 + 900);
    await addLine(editing, { invoice: invoice.publicId, version: row!.version, kind: "fee", description: "Rush fee", partNumber: null, amount: "5.00", taxable: false });
    row = await invoiceRow(invoice.publicId);
    expect(row!.total_minor).toBe(7522 + 900);
    expect((typeof row!.totals === "string" ? JSON.parse(row!.totals) : row!.totals).flaggedCount).toBe(1);
    await expect(issueInvoice(writer, editing, row!.version)).rejects.toThrow(/past what the owner authorised/);
    await expect(issueInvoice(writer, editing, row!.version - 1)).rejects.toMatchObject({ code: "conflict" });
    const flagged = await k("invoice_lines").where({ invoice_id: row!.id, description: "Rush fee" }).first("id");
    await removeLine(editing, { version: row!.version, line: Number(flagged!.id) });
    row = await invoiceRow(invoice.publicId);
    // The owner can't see a draft.
    await expect(onInvoice(owner, invoice.publicId)).rejects.toMatchObject({ code: "not_found" });
    await issueInvoice(writer, editing, row!.version);
    expect(await invoiceRow(invoice.publicId)).toMatchObject({ status: "issued", balance_minor: 8422 });
    const entry = await k("journal_entries").where({ job_id: job.id, kind: "invoice" }).first();
    expect(entry!.visibility).toBe("shared");
    expect(JSON.stringify(entry!.body)).not.toMatch(/Minor|84\.22|8422/);
    const mail = await k("outbox").where({ dedupe_scope: shop.id, dedupe_key: `invoice:${invoice.publicId}:issued` }).first();
    expect(mail!.to_email).toBe(owner.email);
    expect(mail!.text).toContain("Balance due: $84.22");
    expect(mail!.html).toContain(`/my/jobs/${job.publicId}/invoice`);
  });

  it("lets only the job's owner and the desk see it: technicians are refused, other people get a 404", async () => {
    const publicId = (await k("invoices").where({ job_id: jobs[0]!.id }).first("public_id"))!.public_id;
    await expect(onInvoice(owner, publicId)).resolves.toMatchObject({ audience: "owner", mayViewMoney: true });
    await expect(onInvoice(writer, publicId)).resolves.toMatchObject({ audience: "shop", mayViewMoney: true });
    await expect(onInvoice(staffActor(shop, "owner"), publicId, "invoice:refund")).resolves.toBeDefined();
    await expect(onInvoice(writer, publicId, "invoice:refund")).rejects.toMatchObject({ code: "forbidden" });
    await expect(onInvoice(tech, publicId)).rejects.toMatchObject({ code: "forbidden" });
    await expect(onInvoice(stranger, publicId)).rejects.toMatchObject({ code: "not_found" });
    await expect(onInvoice(owner, publicId, "invoice:record-payment")).rejects.toMatchObject({ code: "forbidden" });
    await expect(onInvoice(writer, publicId, "invoice:pay")).rejects.toMatchObject({ code: "forbidden" });
    // The job's money by the job's id: the same rule.
    await expect(onJobMoney(tech, jobs[0]!.publicId, "invoice:view")).rejects.toMatchObject({ code: "forbidden" });
    await expect(onJobMoney(stranger, jobs[0]!.publicId, "invoice:view")).rejects.toMatchObject({ code: "not_found" });
  });

  it("takes part payments at the counter, refuses more than the balance, and is paid in full at zero", async () => {
    const job = jobs[0]!;
    const publicId = (await k("invoices").where({ job_id: job.id }).first("public_id"))!.public_id;
    const taking = await onInvoice(writer, publicId, "invoice:record-payment");
    await recordCounterPayment(writer, taking, { invoice: publicId, method: "cash", amount: "20.00", reference: null });
    expect(await invoiceRow(publicId)).toMatchObject({ status: "issued", paid_minor: 2000, balance_minor: 6422 });
    await expect(recordCounterPayment(writer, taking, { invoice: publicId, method: "cash", amount: "64.23", reference: null })).rejects.toThrow(/more than the balance due \(\$64\.22\)/);
    await expect(onInvoice(tech, publicId, "invoice:record-payment")).rejects.toMatchObject({ code: "forbidden" });
    await recordCounterPayment(writer, taking, { invoice: publicId, method: "card_terminal", amount: "64.22", reference: "AUTH 55120" });
    expect(await invoiceRow(publicId)).toMatchObject({ status: "paid", paid_minor: 8422, balance_minor: 0 });
    const entries = await k("journal_entries").where({ job_id: job.id, kind: "payment" }).orderBy("id");
    expect(entries.map((e) => (typeof e.body === "string" ? JSON.parse(e.body) : e.body).event)).toEqual(["part_paid", "paid_in_full"]);
    const receipts = await k("outbox").where({ dedupe_scope: shop.id, kind: "receipt", to_email: owner.email }).orderBy("id");
    expect(receipts).toHaveLength(2);
    expect(receipts[1]!.text).toContain("Reference: AUTH 55120");
    expect(receipts[1]!.text).toContain("Your invoice is paid in full.");
  });

  it("counts a parts deposit paid before the invoice towards it", async () => {
    const job = jobs[1]!;
    const { deposit } = await requestDeposit(writer, await onJobMoney(writer, job.publicId, "invoice:create"), { job: job.publicId, amount: "50.00", note: "For the rotor on order.", request: null });
    expect((await k("outbox").where({ dedupe_scope: shop.id, dedupe_key: `deposit:${deposit.publicId}` }).first())!.to_email).toBe(owner.email);
    const recording = await access(writer, "deposit", deposit.publicId, "invoice:record-payment");
    await recordDeposit(writer, recording, { deposit: deposit.publicId, method: "cheque", reference: "Cheque 1042" });
    await expect(recordDeposit(writer, recording, { deposit: deposit.publicId, method: "cash", reference: null })).rejects.toThrow(/already paid/);
    await authorise({ writer, owner, jobPublicId: job.publicId, title: "Rotor", lines: [PARTS[1]!] });
    const { publicId } = await createInvoice(writer, await onJobMoney(writer, job.publicId, "invoice:create"));
    // $42.50 + 8.25 % tax $3.51 (REFERENCES §5 per-line worked value) = $46.01, less the $50 deposit.
    expect(await invoiceRow(publicId)).toMatchObject({ total_minor: 4601, paid_minor: 5000, balance_minor: -399 });
    await issueInvoice(writer, await onInvoice(writer, publicId, "invoice:create"), (await invoiceRow(publicId))!.version);
    expect((await invoiceRow(publicId))!.status).toBe("paid");
  });
});
