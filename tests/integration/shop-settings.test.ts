import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { getMoneySettings } from "@/db/queries/findings";
import type { Actor } from "@/lib/permissions";
import { access } from "@/lib/server/access";
import { createFinding } from "@/lib/server/findings";
import { updateBenchSettings } from "@/lib/server/bench-parts";
import { recordCounterPayment } from "@/lib/server/invoice-payments";
import { addLine, createInvoice, issueInvoice } from "@/lib/server/invoices";
import { labourRateChoices, saveDigest, saveHours, saveLabour, saveProfile, saveRegion, saveSupplies, saveTax, saveTolerance } from "@/lib/server/shop-settings";
import { hoursSettingsSchema, labourSettingsSchema, profileSettingsSchema, toleranceSettingsSchema } from "@/lib/schemas/shop-settings";
import { authorise, ownerWithJobs, staffActor } from "../support/authorised-work";
import { testKnex } from "../support/db";
import { makeShop } from "../support/fixtures";

type Shop = Awaited<ReturnType<typeof makeShop>>;
// JSON columns come back parsed or as text depending on the column's check: read either.
const json = (v: unknown) => (typeof v === "string" ? JSON.parse(v) : v);
const labour = (defaultRate: string, named: [string, string][] = []) =>
  labourSettingsSchema.parse({ shop: "x", defaultRate, ...Object.fromEntries(named.flatMap(([n, r], i) => [[`rateName${i}`, n], [`rateAmount${i}`, r]])) });
const tax = (taxRate: string, taxMethod: "per_line" | "per_invoice" = "per_line", own: { labourTaxRate?: string; feeTaxRate?: string; suppliesTaxRate?: string } = {}) => ({
  shop: "x",
  taxMethod,
  taxRate,
  labourTaxRate: own.labourTaxRate ?? "",
  feeTaxRate: own.feeTaxRate ?? "",
  suppliesTaxRate: own.suppliesTaxRate ?? "",
  partsTaxable: true,
  labourTaxable: true,
  feesTaxable: false,
});

describe("shop settings", () => {
  let k: Knex;
  let shop: Shop;
  let owner: Actor;
  let writer: Actor;
  const changes = (section?: string) => k("shop_setting_changes").where({ shop_id: shop.id, ...(section ? { section } : {}) }).orderBy("id");
  const asOwner = () => access(owner, "shop", shop.slug, "shop:manage-settings");

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "settings", roles: ["owner", "service_writer", "technician"] });
    owner = staffActor(shop, "owner");
    writer = staffActor(shop, "service_writer");
  });
  afterAll(async () => k?.destroy());

  it("lets only the shop owner in: the writer and the technician are refused, another shop's owner gets the same refusal as a stranger", async () => {
    await expect(asOwner()).resolves.toMatchObject({ shop: { id: shop.id } });
    await expect(access(writer, "shop", shop.slug, "shop:manage-settings")).rejects.toMatchObject({ code: "forbidden" });
    await expect(access(staffActor(shop, "technician"), "shop", shop.slug, "shop:manage-settings")).rejects.toMatchObject({ code: "forbidden" });
    const other = await makeShop(k, { label: "settings-other" });
    await expect(access(staffActor(other, "owner"), "shop", shop.slug, "shop:manage-settings")).rejects.toMatchObject({ code: "forbidden" });
  });

  it("saves each section and records who changed what, with the values before and after", async () => {
    const found = await asOwner();
    await saveProfile(owner, found, profileSettingsSchema.parse({ shop: shop.slug, name: "Cedar Flats Small Engines", email: "desk@cedar.test", phone: "+1 555 0100", address: "12 Mill Road" }));
    await saveHours(owner, found, hoursSettingsSchema.parse({ shop: shop.slug, ...Object.fromEntries(["mon", "tue", "wed", "thu", "fri", "sat"].flatMap((d) => [[`${d}Open`, "08:00"], [`${d}Close`, "17:30"]])), sunClosed: "on" }));
    await saveRegion(owner, found, { shop: shop.slug, timezone: "America/Denver", currency: "USD" });
    await saveLabour(owner, found, labour("95.00", [["Diagnosis", "120.00"]]));
    await saveTax(owner, found, tax("8.25"));
    await saveSupplies(owner, found, { shop: shop.slug, suppliesPercent: "5", suppliesBase: "labour", suppliesCap: "25.00", suppliesTaxable: false });
    await saveTolerance(owner, found, toleranceSettingsSchema.parse({ shop: shop.slug, toleranceKind: "florida" }));
    await saveDigest(owner, found, { shop: shop.slug, digestWindowMinutes: 30 });

    const row = await k("shops").where({ id: shop.id }).first();
    expect(row).toMatchObject({ name: "Cedar Flats Small Engines", email: "desk@cedar.test", phone: "+1 555 0100", address: "12 Mill Road", timezone: "America/Denver", digest_window_minutes: 30 });
    expect(json(row!.opening_hours)).toMatchObject({ mon: { open: "08:00", close: "17:30" }, sun: null });
    const money = await getMoneySettings({ shopId: shop.id });
    expect(money).toMatchObject({ labourRateMinor: 9500, tax: { method: "per_line" }, taxable: { part: true, labour: true, fee: false } });
    expect(Number(money.tax.ratePercent)).toBe(8.25);
    expect(money.supplies).toMatchObject({ base: "labour", capMinor: 2500, taxable: false });
    // Florida §559.909 (REFERENCES §6): greater of $10 or 10 %, capped at $50.
    expect(money.tolerance).toMatchObject({ kind: "greater_of", fixedMinor: 1000, capMinor: 5000 });
    expect(json((await k("shop_money_settings").where({ shop_id: shop.id }).first("labour_rates"))!.labour_rates)).toEqual([{ name: "Diagnosis", rateMinor: 12000 }]);

    // The invoice's add-line form offers them, as the text its rate field takes.
    expect(await labourRateChoices(shop.id, "USD")).toEqual({ defaultRate: "95.00", named: [{ name: "Diagnosis", rate: "120.00" }] });

    const rows = await changes();
    expect(rows.map((r) => r.section)).toEqual(["profile", "hours", "region", "labour", "tax", "supplies", "tolerance", "digest"]);
    expect(rows.every((r) => r.user_id === owner.userId && r.at instanceof Date)).toBe(true);
    const labourRow = rows.find((r) => r.section === "labour")!;
    expect(json(labourRow.before)).toEqual({ defaultRateMinor: null, named: [] });
    expect(json(labourRow.after)).toEqual({ defaultRateMinor: 9500, named: [{ name: "Diagnosis", rateMinor: 12000 }] });
    expect(json(rows.find((r) => r.section === "digest")!.before)).toEqual({ digestWindowMinutes: 15 });
    // Saving the same values again records nothing new.
    await saveDigest(owner, found, { shop: shop.slug, digestWindowMinutes: 30 });
    expect(await changes("digest")).toHaveLength(1);
  });

  it("records the bench, clip and board settings saved from the settings page", async () => {
    await updateBenchSettings(await asOwner(), { torqueUnit: "lbf_ft", passes: [30, 60, 100], chainLimitPct: 3, clipMaxMinutes: 5, clipMaxGb: 1, ownerWaitDays: 4 }, owner);
    const [change] = await changes("bench");
    expect(change).toMatchObject({ user_id: owner.userId });
    expect(json(change!.after)).toEqual({ bench: { torqueUnit: "lbf_ft", passPercents: [30, 60, 100], chainLimitPct: 3, wrenchClass: "type2_4" }, clips: { maxSeconds: 300, maxBytes: 1024 ** 3 }, ownerWaitDays: 4 });
    expect(json(change!.before)).toMatchObject({ ownerWaitDays: 3 });
    expect(await k("shops").where({ id: shop.id }).first("owner_wait_days", "clip_max_seconds")).toEqual({ owner_wait_days: 4, clip_max_seconds: 300 });
  });

  it("refuses bad values beside their field and writes nothing", async () => {
    const found = await asOwner();
    const before = await changes();
    await expect(saveTax(owner, found, tax("eight"))).rejects.toMatchObject({ code: "invalid", fields: { taxRate: [expect.stringMatching(/number of percent/)] } });
    await expect(saveTax(owner, found, tax("120"))).rejects.toMatchObject({ fields: { taxRate: [expect.stringMatching(/more than 100/)] } });
    await expect(saveLabour(owner, found, labour("95.001"))).rejects.toMatchObject({ fields: { defaultRate: [expect.stringMatching(/at most 2 decimal places/)] } });
    await expect(saveLabour(owner, found, labour("95.00", [["Diagnosis", "lots"]]))).rejects.toMatchObject({ fields: { rateAmount0: [expect.any(String)] } });
    await expect(saveSupplies(owner, found, { shop: shop.slug, suppliesPercent: "5", suppliesBase: "labour", suppliesCap: "-3", suppliesTaxable: false })).rejects.toMatchObject({ fields: { suppliesCap: [expect.stringMatching(/negative/)] } });
    // Form-level checks: the message is on the field the form shows.
    const bad = (schema: { safeParse: (v: unknown) => { success: boolean; error?: { issues: { path: PropertyKey[]; message: string }[] } } }, input: unknown) => schema.safeParse(input).error!.issues.map((i) => [i.path.join("."), i.message]);
    expect(bad(hoursSettingsSchema, { shop: shop.slug, monOpen: "17:00", monClose: "08:00", tueOpen: "", ...Object.fromEntries(["wed", "thu", "fri", "sat", "sun"].map((d) => [`${d}Closed`, "on"])) })).toEqual([
      ["monClose", "Closing comes after opening."],
      ["tueOpen", "Enter the opening time, or tick Closed."],
      ["tueClose", "Enter the closing time, or tick Closed."],
    ]);
    expect(bad(profileSettingsSchema, { shop: shop.slug, name: "Cedar", email: "not an address" })).toEqual([["email", "Enter an e-mail address like desk@shop.test."]]);
    expect(await changes()).toHaveLength(before.length);
    expect((await getMoneySettings({ shopId: shop.id })).labourRateMinor).toBe(9500);
  });

  it("refuses the US-dollar statutory rules for a shop in another currency, beside the rule picker", async () => {
    const euro = await makeShop(k, { label: "settings-eur" });
    const euroOwner = staffActor(euro, "owner");
    const found = await access(euroOwner, "shop", euro.slug, "shop:manage-settings");
    await saveRegion(euroOwner, found, { shop: euro.slug, timezone: "Europe/Vienna", currency: "EUR" });
    await expect(saveTolerance(euroOwner, found, toleranceSettingsSchema.parse({ shop: euro.slug, toleranceKind: "maryland" }))).rejects.toMatchObject({ fields: { toleranceKind: [expect.stringMatching(/US dollars/)] } });
    await saveTolerance(euroOwner, found, toleranceSettingsSchema.parse({ shop: euro.slug, toleranceKind: "custom", tolerancePercent: "10", toleranceFixed: "", toleranceCap: "40.00" }));
    expect((await getMoneySettings({ shopId: euro.id })).tolerance).toMatchObject({ kind: "greater_of", fixedMinor: 0, capMinor: 4000 });
  });

  it("applies a new labour rate and tax to new estimates only: the issued invoice keeps its lines and totals", async () => {
    const own = await makeShop(k, { label: "settings-snap", roles: ["owner", "service_writer"] });
    const boss = staffActor(own, "owner");
    const desk = staffActor(own, "service_writer");
    const settingsOf = () => access(boss, "shop", own.slug, "shop:manage-settings");
    await saveLabour(boss, await settingsOf(), labour("100.00"));
    await saveTax(boss, await settingsOf(), tax("10", "per_invoice"));
    const { owner: customer, jobs } = await ownerWithJobs(k, own, 2);
    // The labour line is priced by the shop's default rate (no rate typed).
    await authorise({ writer: desk, owner: customer, jobPublicId: jobs[0]!.publicId, title: "Carb clean", lines: [{ kind: "labour", description: "Clean carburettor", hours: "1.5", rate: undefined as unknown as string }] });
    const made = await createInvoice(desk, await access(desk, "jobMoney", jobs[0]!.publicId, "invoice:create"));
    const editing = await access(desk, "invoice", made.publicId, "invoice:create");
    await issueInvoice(desk, editing, editing.invoice.version);
    const issued = await k("invoices").where({ public_id: made.publicId }).first();
    // 1.5 h × $100 = $150.00; 10 % tax on the invoice = $15.00. Arithmetic of the settings, common trade practice, no published source.
    expect(issued).toMatchObject({ status: "issued", subtotal_minor: 15000, tax_minor: 1500, total_minor: 16500 });
    const linesBefore = await k("invoice_lines").where({ invoice_id: issued!.id }).orderBy("position");
    expect(linesBefore.map((l) => l.rate_minor)).toEqual([10000]);

    await saveLabour(boss, await settingsOf(), labour("130.00"));
    await saveTax(boss, await settingsOf(), tax("20", "per_invoice"));
    // A payment re-prices the issued invoice's balance: with its own pricing, not the new settings.
    await recordCounterPayment(desk, await access(desk, "invoice", made.publicId, "invoice:record-payment"), { invoice: made.publicId, method: "cash", amount: "50.00", reference: null });
    const after = await k("invoices").where({ public_id: made.publicId }).first();
    expect(after).toMatchObject({ subtotal_minor: 15000, tax_minor: 1500, total_minor: 16500, paid_minor: 5000, balance_minor: 11500 });
    expect(await k("invoice_lines").where({ invoice_id: issued!.id }).orderBy("position")).toEqual(linesBefore);
    expect(Number(json(after!.totals).pricing.tax.ratePercent)).toBe(10);
    // The request the owner answered before the change still shows what they were shown.
    const answered = await k("approval_requests").where({ job_id: jobs[0]!.id }).first();
    expect(answered).toMatchObject({ estimate_pre_tax_minor: 15000, estimate_tax_minor: 1500, estimate_total_minor: 16500 });
    expect(json(answered!.snapshot).lines[0]).toMatchObject({ rateMinor: 10000 });

    // A new estimate on the other job uses the new rate and tax.
    const finding = await createFinding(desk, await access(desk, "job", jobs[1]!.publicId, "approvals:draft"), {
      title: "Valve clearance",
      found: "Valve clearance out of range.",
      whyItMatters: null,
      safety: "none",
      evidence: [],
      lines: [{ kind: "labour", description: "Adjust valves", partNumber: null, hours: "2" }],
    });
    expect((await k("finding_lines").where({ finding_id: finding.id }).first("rate_minor"))!.rate_minor).toBe(13000);
    await authorise({ writer: desk, owner: customer, jobPublicId: jobs[1]!.publicId, title: "Valves", lines: [{ kind: "labour", description: "Adjust valves", hours: "2", rate: undefined as unknown as string }] });
    const request = await k("approval_requests").where({ job_id: jobs[1]!.id }).orderBy("id", "desc").first();
    // 2 h × $130 = $260; 20 % = $52.
    expect(request).toMatchObject({ estimate_pre_tax_minor: 26000, estimate_tax_minor: 5200, estimate_total_minor: 31200 });
  });

  it("taxes labour at a rate of its own when the owner sets one, and back at the shop's rate when cleared", async () => {
    const own = await makeShop(k, { label: "settings-kind-tax", roles: ["owner", "service_writer"] });
    const boss = staffActor(own, "owner");
    const desk = staffActor(own, "service_writer");
    const settingsOf = () => access(boss, "shop", own.slug, "shop:manage-settings");
    await expect(saveTax(boss, await settingsOf(), tax("10", "per_invoice", { labourTaxRate: "five" }))).rejects.toMatchObject({ fields: { labourTaxRate: [expect.stringMatching(/number of percent/)] } });
    await saveLabour(boss, await settingsOf(), labour("100.00"));
    await saveTax(boss, await settingsOf(), tax("10", "per_invoice", { labourTaxRate: "5" }));
    expect((await getMoneySettings({ shopId: own.id })).tax).toEqual({ ratePercent: "10.000000", method: "per_invoice", kindRates: { labour: "5.000000" } });
    const { owner: customer, jobs } = await ownerWithJobs(k, own, 1);
    await authorise({
      writer: desk,
      owner: customer,
      jobPublicId: jobs[0]!.publicId,
      title: "Chain and sprockets",
      lines: [
        { kind: "labour", description: "Fit chain and sprockets", hours: "1.5", rate: undefined as unknown as string },
        { kind: "part", description: "Chain kit", qty: "1", unitPrice: "80.00" },
      ],
    });
    // Labour 1.5 h × $100 = $150 at 5 % = $7.50; the part $80 at 10 % = $8.00 (each rate rounded once
    // on its base, SSUTA §324 half-up; a rate per kind is common trade practice, no published source).
    const request = await k("approval_requests").where({ job_id: jobs[0]!.id }).first();
    expect(request).toMatchObject({ estimate_pre_tax_minor: 23000, estimate_tax_minor: 1550, estimate_total_minor: 24550 });
    await saveTax(boss, await settingsOf(), tax("10", "per_invoice"));
    expect((await getMoneySettings({ shopId: own.id })).tax).toEqual({ ratePercent: "10.000000", method: "per_invoice" });
  });

  it("prices an invoice labour line typed without a rate at the shop's default rate, or says beside the rate that there is none", async () => {
    const own = await makeShop(k, { label: "settings-line", roles: ["owner", "service_writer"] });
    const boss = staffActor(own, "owner");
    const desk = staffActor(own, "service_writer");
    const { owner: customer, jobs } = await ownerWithJobs(k, own, 1);
    await authorise({ writer: desk, owner: customer, jobPublicId: jobs[0]!.publicId, title: "Plug", lines: [{ kind: "fee", description: "Spark plug", amount: "12.00" }] });
    const made = await createInvoice(desk, await access(desk, "jobMoney", jobs[0]!.publicId, "invoice:create"));
    const editing = async () => access(desk, "invoice", made.publicId, "invoice:create");
    const line = (version: number) => ({ invoice: made.publicId, version, kind: "labour" as const, description: "Road test", partNumber: null, hours: "0.5", rate: "", taxable: false });
    // No default rate yet: the message is beside the rate field, and nothing is added.
    let found = await editing();
    const refused = await addLine(found, line(found.invoice.version)).catch((e: unknown) => e);
    expect(refused).toMatchObject({ code: "invalid", fields: { rate: [expect.stringMatching(/no default labour rate yet/)] } });
    expect(Object.keys((refused as { fields: object }).fields)).toEqual(["rate"]);
    expect(await k("invoice_lines").where({ invoice_id: found.invoice.id })).toHaveLength(1);

    await saveLabour(boss, await access(boss, "shop", own.slug, "shop:manage-settings"), labour("88.00"));
    found = await editing();
    await addLine(found, line(found.invoice.version));
    const added = await k("invoice_lines").where({ invoice_id: found.invoice.id, description: "Road test" }).first();
    expect(added).toMatchObject({ kind: "labour", hours_tenths: 5, rate_minor: 8800 });
  });
});
