import crypto from "node:crypto";
import { createElement as h } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { getDropoff } from "@/db/queries/dropoff";
import { saveMoneySettings } from "@/db/queries/findings";
import { DropoffSummary } from "@/components/dropoff/dropoff-summary";
import { AuthorisationRecord } from "@/components/invoices/authorisation-record";
import { DEFAULT_MONEY_SETTINGS, canonicalJson } from "@/lib/approvals";
import type { Actor } from "@/lib/permissions";
import type { DropoffFieldsInput } from "@/lib/schemas/dropoff";
import { access } from "@/lib/server/access";
import { authorisedWork } from "@/lib/server/authorised-work";
import { renderInvoicePdf } from "@/lib/server/invoice-pdf";
import { invoiceView } from "@/lib/server/invoice-views";
import { prepareDropoff, prepareStandardDropoff, sendDropoffLink, signDropoffAtCounter, signDropoffOnline } from "@/lib/server/dropoff";
import { saveDropoffTerms } from "@/lib/server/shop-settings";
import { addLine, createInvoice } from "@/lib/server/invoices";
import { authorise, ownerWithJobs, staffActor } from "../support/authorised-work";
import { testKnex } from "../support/db";
import { makeShop } from "../support/fixtures";

// The authorisation signed at drop-off (issue 16 §5), through the same lib/server functions the
// actions call, after the same access checks, on the real database.

type Shop = Awaited<ReturnType<typeof makeShop>>;
const sha256 = (text: string) => crypto.createHash("sha256").update(text, "utf8").digest("hex");
const fields = (over: Partial<DropoffFieldsInput> = {}): DropoffFieldsInput => ({
  chargeKind: "amount",
  chargeAmount: "95.00",
  chargeHours: "",
  description: "Inspection and diagnosis",
  authorisedUpTo: "300.00",
  terms: null,
  ...over,
});
// JSON columns may come back parsed or as text, depending on the connection's settings.
const parsed = (v: unknown) => (typeof v === "string" ? JSON.parse(v) : v);
const signature = (shownHash: string, name: string) => ({ shownHash, signature: name, wantsPartsBack: false, agree: true });

describe("authorisation at drop-off", () => {
  let k: Knex;
  let shop: Shop;
  let writer: Actor;
  let tech: Actor;
  let owner: Actor;
  let jobs: { id: number; publicId: string }[];
  const row = (jobId: number) => k("dropoff_authorisations").where({ shop_id: shop.id, job_id: jobId }).first();
  const desk = (job: string) => access(writer, "job", job, "approvals:send");

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "dropoff", roles: ["owner", "service_writer", "technician"] });
    writer = staffActor(shop, "service_writer");
    tech = staffActor(shop, "technician");
    // Maryland Com. Law §14-1002(b) (REFERENCES §6): no charge more than 10 % over the written estimate.
    await saveMoneySettings({ shopId: shop.id, settings: { ...DEFAULT_MONEY_SETTINGS, labourRateMinor: 10_000, tolerance: { kind: "greater_of", fixedMinor: 0, percent: "10", capMinor: null } } });
    ({ owner, jobs } = await ownerWithJobs(k, shop, 5, "Rowan Pike"));
  });
  afterAll(async () => k?.destroy());

  it("records a counter signature with the SHA-256 of exactly what was shown", async () => {
    const job = jobs[0]!;
    await expect(access(tech, "job", job.publicId, "approvals:send")).rejects.toMatchObject({ code: "forbidden" });
    const first = await prepareDropoff(writer, await desk(job.publicId), fields());
    // Redone before signing: a new text, a new hash; the old hash can no longer be signed.
    const { hash } = await prepareDropoff(writer, await desk(job.publicId), fields({ authorisedUpTo: "350", terms: "Call before ordering parts." }));
    expect(hash).not.toBe(first.hash);
    const counter = await access(writer, "job", job.publicId, "approvals:record-decision");
    await expect(signDropoffAtCounter(writer, counter, signature(first.hash, "Rowan Pike"))).rejects.toMatchObject({ code: "conflict", message: expect.stringMatching(/changed/) });

    const { dropoff } = await signDropoffAtCounter(writer, counter, signature(hash, "Rowan Pike"));
    const stored = (await row(job.id))!;
    const snapshot = parsed(stored.snapshot);
    // The hash is of the canonical text kept beside it, and that text is the snapshot's canonical JSON.
    expect(stored.canonical).toBe(canonicalJson(snapshot));
    expect(sha256(stored.canonical)).toBe(hash);
    expect(stored).toMatchObject({ method: "in_person", signature_name: "Rowan Pike", shown_hash: hash, hash, recorded_by_user_id: writer.userId, ip: null, diagnosis_minor: 9500, authorised_up_to_minor: 35000 });
    expect(snapshot.wording).toMatch(/\$95\.00/);
    expect(snapshot.wording).toMatch(/up to \$350\.00 in total before tax/);
    expect(snapshot.terms).toBe("Call before ordering parts.");
    expect(dropoff.signature).toMatchObject({ method: "in_person", signatureName: "Rowan Pike", recordedBy: expect.any(String) });
    // Signed: it can't be redone, nor signed again.
    await expect(prepareDropoff(writer, await desk(job.publicId), fields())).rejects.toMatchObject({ code: "conflict" });
    await expect(signDropoffAtCounter(writer, counter, signature(hash, "Someone Else"))).rejects.toMatchObject({ code: "conflict", message: expect.stringMatching(/already signed by Rowan Pike/) });
    expect((await row(job.id))!.signature_name).toBe("Rowan Pike");
  });

  it("refuses amounts it can't read, beside the field, and writes nothing", async () => {
    const job = jobs[1]!;
    await expect(prepareDropoff(writer, await desk(job.publicId), fields({ chargeAmount: "ninety" }))).rejects.toMatchObject({ code: "invalid", fields: { chargeAmount: [expect.any(String)] } });
    await expect(prepareDropoff(writer, await desk(job.publicId), fields({ authorisedUpTo: "50" }))).rejects.toMatchObject({ code: "invalid", fields: { authorisedUpTo: [expect.stringMatching(/\$95\.00/)] } });
    expect(await row(job.id)).toBeUndefined();
  });

  it("takes one online signature from the e-mailed link: concurrent answers keep one, a later one is refused", async () => {
    const job = jobs[1]!;
    const { hash } = await prepareDropoff(writer, await desk(job.publicId), fields());
    const { to } = await sendDropoffLink(writer, await desk(job.publicId));
    expect(to).toBe(owner.email);
    // Pressed twice, the same version is mailed once.
    await sendDropoffLink(writer, await desk(job.publicId));
    const mails = await k("outbox").where({ shop_id: shop.id, job_id: job.id, kind: "dropoff-authorisation" });
    expect(mails).toHaveLength(1);
    expect(mails[0]!.to_email).toBe(owner.email);
    expect(mails[0]!.text).toContain(`/my/jobs/${job.publicId}/authorisation`);
    expect(mails[0]!.text).toContain("up to $300.00 in total before tax");
    // Only the machine's owner signs online; the desk may not.
    await expect(access(writer, "job", job.publicId, "approvals:answer")).rejects.toMatchObject({ code: "forbidden" });
    const mine = await access(owner, "job", job.publicId, "approvals:answer");
    const race = await Promise.allSettled(
      Array.from({ length: 5 }, (_, i) => signDropoffOnline(owner, mine, signature(hash, `Rowan Pike ${i}`), { ip: "203.0.113.7", userAgent: `vitest ${i}` })),
    );
    expect(race.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    expect(race.filter((r) => r.status === "rejected").map((r) => (r as PromiseRejectedResult).reason.code)).toEqual(["conflict", "conflict", "conflict", "conflict"]);
    const stored = (await row(job.id))!;
    const winner = (race.find((r) => r.status === "fulfilled") as PromiseFulfilledResult<Awaited<ReturnType<typeof signDropoffOnline>>>).value.dropoff.signature!;
    expect(stored).toMatchObject({ method: "online", signature_name: winner.signatureName, ip: "203.0.113.7", user_agent: winner.userAgent, shown_hash: hash, recorded_by_user_id: owner.userId });
    await expect(signDropoffOnline(owner, mine, signature(hash, "Rowan Pike"), { ip: "203.0.113.8", userAgent: "later" })).rejects.toMatchObject({ code: "conflict" });
    expect((await row(job.id))!.signature_name).toBe(winner.signatureName);
    // The desk hears of it in the inbox.
    expect(await k("shop_events").where({ shop_id: shop.id, job_id: job.id, kind: "owner_answered" }).count({ n: "*" }).first()).toEqual({ n: 1 });
  });

  it("turns the diagnosis charge (a labour time at the shop's rate) into an authorised invoice line", async () => {
    const job = jobs[2]!;
    const jobMoney = await access(writer, "jobMoney", job.publicId, "invoice:create");
    // Unsigned, it authorises nothing.
    const { hash } = await prepareDropoff(writer, await desk(job.publicId), fields({ chargeKind: "time", chargeHours: "0.5", description: "Charging system diagnosis" }));
    await expect(createInvoice(writer, jobMoney)).rejects.toThrow(/Nothing has been authorised/);
    await signDropoffAtCounter(writer, await access(writer, "job", job.publicId, "approvals:record-decision"), signature(hash, "Rowan Pike"));
    const { publicId } = await createInvoice(writer, jobMoney);
    const invoice = (await k("invoices").where({ public_id: publicId }).first())!;
    const lines = await k("invoice_lines").where({ invoice_id: invoice.id }).orderBy("position");
    // 0.5 h × $100.00 = $50.00: common trade practice, no published source.
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatchObject({ source: "authorised", kind: "labour", description: "Charging system diagnosis", hours_tenths: 5, rate_minor: 10_000 });
    expect(invoice.subtotal_minor).toBe(5000);
    const work = await authorisedWork({ shopId: shop.id, jobId: job.id });
    expect(work.record[0]).toMatchObject({ kind: "dropoff", method: "in_person", authorisedPreTaxMinor: 30_000, approved: [{ description: "Charging system diagnosis", netMinor: 5000 }] });
    // Printed with the invoice's authorisation record: how, by whom, the limit and the wording signed.
    const printed = renderToStaticMarkup(h(AuthorisationRecord, { record: work.record, timeZone: "America/Denver" }));
    expect(printed).toContain("Signed at the counter by Rowan Pike");
    expect(printed).toContain("Authorised up to $300.00 before tax");
    expect(printed).toContain("Wording signed: I leave my");
    expect(printed).toContain(`record ${hash.slice(0, 12)}`);
    // The invoice PDF prints the same record (a smoke check: pdfkit compresses its text).
    expect((await renderInvoicePdf(await invoiceView(job.id, "shop"))).subarray(0, 5).toString()).toBe("%PDF-");
    // The job pages: the desk and the owner read the amounts; a technician only that it was signed.
    const dropoff = (await getDropoff({ shopId: shop.id, jobId: job.id }))!;
    const forOwner = renderToStaticMarkup(h(DropoffSummary, { dropoff, timeZone: "America/Denver", showMoney: true, reader: "owner" }));
    expect(forOwner).toContain("0.5 h at $100.00 an hour ($50.00)");
    expect(forOwner).toContain("Signed “Rowan Pike” at the counter");
    const forTech = renderToStaticMarkup(h(DropoffSummary, { dropoff, timeZone: "America/Denver", showMoney: false, reader: "shop" }));
    expect(forTech).toContain("Signed “Rowan Pike” at the counter");
    expect(forTech).not.toMatch(/\$\d/);
  });

  it("compares the invoice with the drop-off amount and the approved requests together", async () => {
    // REFERENCES §6, Maryland Com. Law §14-1002(b): written estimate E = $400 → $440 ceiling.
    // Here E = $300 authorised at drop-off (diagnosis $95 included) + $100 approved later = $400.
    const job = jobs[3]!;
    const { hash } = await prepareDropoff(writer, await desk(job.publicId), fields());
    await signDropoffAtCounter(writer, await access(writer, "job", job.publicId, "approvals:record-decision"), signature(hash, "Rowan Pike"));
    await authorise({ writer, owner, jobPublicId: job.publicId, title: "Stator", lines: [{ kind: "fee", description: "Stator", amount: "100.00" }] });
    expect((await authorisedWork({ shopId: shop.id, jobId: job.id })).authorisedPreTaxMinor).toBe(40_000);
    const { publicId } = await createInvoice(writer, await access(writer, "jobMoney", job.publicId, "invoice:create"));
    const editing = await access(writer, "invoice", publicId, "invoice:create");
    const version = async () => (await k("invoices").where({ public_id: publicId }).first())!.version as number;
    // $95 + $100 authorised lines + $245 of work under the drop-off amount = $440: at the ceiling, charged.
    await addLine(editing, { invoice: publicId, version: await version(), kind: "fee", description: "Wiring repair", partNumber: null, amount: "245.00", taxable: false });
    let inv = (await k("invoices").where({ public_id: publicId }).first())!;
    expect(parsed(inv.totals)).toMatchObject({ authorisedPreTaxMinor: 40_000, toleranceMinor: 4000, ceilingMinor: 44_000, flaggedCount: 0 });
    expect(inv.subtotal_minor).toBe(44_000);
    // One cent more is past $440: that line waits for a new approval.
    await addLine(editing, { invoice: publicId, version: await version(), kind: "fee", description: "Shop rag", partNumber: null, amount: "0.01", taxable: false });
    inv = (await k("invoices").where({ public_id: publicId }).first())!;
    expect(parsed(inv.totals)).toMatchObject({ flaggedCount: 1 });
    expect(inv.subtotal_minor).toBe(44_000);

    // The same $100 approval without a drop-off authorisation: E = $100 → $110 ceiling, so the $245 line is flagged.
    const other = jobs[4]!;
    await authorise({ writer, owner, jobPublicId: other.publicId, title: "Stator", lines: [{ kind: "fee", description: "Stator", amount: "100.00" }] });
    const made = await createInvoice(writer, await access(writer, "jobMoney", other.publicId, "invoice:create"));
    const otherEditing = await access(writer, "invoice", made.publicId, "invoice:create");
    await addLine(otherEditing, { invoice: made.publicId, version: (await k("invoices").where({ public_id: made.publicId }).first())!.version, kind: "fee", description: "Wiring repair", partNumber: null, amount: "245.00", taxable: false });
    const plain = (await k("invoices").where({ public_id: made.publicId }).first())!;
    expect(parsed(plain.totals)).toMatchObject({ authorisedPreTaxMinor: 10_000, ceilingMinor: 11_000, flaggedCount: 1 });
  });

  it("lets a technician put the shop's standard terms up and witness the owner's signature, but not type terms", async () => {
    const own = await makeShop(k, { label: "dropoff-std", roles: ["owner", "service_writer", "technician"] });
    const boss = staffActor(own, "owner");
    const bench = staffActor(own, "technician");
    const { jobs: [job] } = await ownerWithJobs(k, own, 1, "Wyn Ashby");
    const found = await access(bench, "job", job!.publicId, "dropoff:standard");
    // Typed terms stay with the desk (approvals:send).
    await expect(access(bench, "job", job!.publicId, "approvals:send")).rejects.toMatchObject({ code: "forbidden" });
    // No standard terms yet: a clear refusal, nothing written.
    await expect(prepareStandardDropoff(bench, found)).rejects.toMatchObject({ code: "invalid", message: expect.stringMatching(/no standard drop-off terms/) });
    expect(await k("dropoff_authorisations").where({ job_id: job!.id }).first()).toBeUndefined();

    await saveDropoffTerms(boss, await access(boss, "shop", own.slug, "shop:manage-settings"), { shop: own.slug, dropoffCharge: "55.00", dropoffUpTo: "300.00" });
    await expect(saveDropoffTerms(boss, await access(boss, "shop", own.slug, "shop:manage-settings"), { shop: own.slug, dropoffCharge: "55.00", dropoffUpTo: "20" })).rejects.toMatchObject({ fields: { dropoffUpTo: [expect.any(String)] } });
    const { hash } = await prepareStandardDropoff(bench, found);
    await signDropoffAtCounter(bench, found, signature(hash, "Wyn Ashby"));
    const stored = (await k("dropoff_authorisations").where({ job_id: job!.id }).first())!;
    expect(stored).toMatchObject({ method: "in_person", signature_name: "Wyn Ashby", recorded_by_user_id: bench.userId, diagnosis_minor: 5500, authorised_up_to_minor: 30_000, hash });
    expect(sha256(stored.canonical)).toBe(hash);
  });
});

