import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { listReadings } from "@/db/queries/bench";
import { saveMoneySettings } from "@/db/queries/findings";
import { BenchEntryBody } from "@/components/journal/bench-entry-body";
import { DEFAULT_MONEY_SETTINGS } from "@/lib/approvals";
import { AppError } from "@/lib/errors";
import type { Action, Actor } from "@/lib/permissions";
import { readingLine } from "@/lib/reading-text";
import { access } from "@/lib/server/access";
import { sendRequest } from "@/lib/server/approvals";
import { recordChainReading, recordReading } from "@/lib/server/bench";
import { summarizeEntry } from "@/lib/server/emails/entry-summary";
import { findingInputSchema } from "@/lib/schemas/approvals";
import { createFinding } from "@/lib/server/findings";
import { editEntry, readTimeline } from "@/lib/server/journal";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";

// Issue 18, readings: resolution kept from the form to every place the owner reads it, negative
// sizes refused with nothing written, the chain's 200/N rule and pin-count check. The limits are
// what a shop types from its manual (invented here); the chain figures cite REFERENCES §4.

type Shop = Awaited<ReturnType<typeof makeShop>>;
const staff = (shop: Shop, role: "technician" | "service_writer"): Actor => ({
  userId: shop.staff[role]!.id,
  email: shop.staff[role]!.email,
  name: role,
  memberships: [{ shopId: shop.id, shopSlug: shop.slug, shopName: shop.slug, role }],
});
const onJob = (actor: Actor, publicId: string, permission: Action) => access(actor, "job", publicId, permission);

// 0.10 − 0.06 = 0.04 mm under the minimum (the reading rule, lib/readings.ts)
const VALVE_LINE = "Intake valve clearance, left: 0.06 mm — limit 0.10–0.20 mm (maker's manual) — OUT OF LIMIT: 0.04 mm under the minimum";

describe("readings: resolution, refusals and what the owner reads", () => {
  let k: Knex;
  let shop: Shop;
  let tech: Actor;
  let writer: Actor;
  let owner: Actor;
  let job: { id: number; publicId: string };

  const counts = async () => ({
    readings: Number((await k("readings").where({ job_id: job.id }).count({ n: "*" }).first())!.n),
    entries: Number((await k("journal_entries").where({ job_id: job.id }).count({ n: "*" }).first())!.n),
  });
  const refusal = (p: Promise<unknown>) =>
    p.then(
      () => {
        throw new Error("expected a refusal");
      },
      (e: unknown) => e as AppError,
    );
  const valve = { label: "Intake valve clearance, left", value: "0.06", unit: "mm", min: "0.10", max: "0.20", source: "maker's manual" };

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "readings", roles: ["technician", "service_writer"] });
    const email = `owner.${shop.slug}@mail.test`;
    const [userId] = await k("users").insert({ email, name: "Ilse Varro" });
    owner = { userId: Number(userId), email, name: "Ilse Varro", memberships: [] };
    const made = await makeCustomerWithJobs(k, shop.id, { name: "Ilse Varro", email, userId: Number(userId), statuses: ["inspecting"] });
    job = { id: made.jobIds[0]!, publicId: String((await k("jobs").where({ id: made.jobIds[0]! }).first("public_id"))!.public_id) };
    tech = staff(shop, "technician");
    writer = staff(shop, "service_writer");
  });
  afterAll(async () => k?.destroy());

  it("keeps the typed resolution: 0.10–0.20 stays 0.10–0.20 in the row, the list and the timeline snapshot", async () => {
    const made = await recordReading(tech, await onJob(tech, job.publicId, "bench:record"), { job: job.publicId, ...valve });
    const row = (await k("readings").where({ id: made.id }).first())!;
    expect(row).toMatchObject({ verdict: "below", value_decimals: 2, min_decimals: 2, max_decimals: 2 });
    const listed = (await listReadings({ shopId: shop.id, jobId: job.id })).find((r) => r.id === made.id)!;
    expect(listed.decimals).toEqual({ value: 2, min: 2, max: 2 });
    expect(readingLine(listed)).toBe(VALVE_LINE);
    const entry = (await k("journal_entries").where({ id: made.entryId }).first())!;
    const body = typeof entry.body === "string" ? JSON.parse(entry.body) : entry.body;
    expect(body.decimals).toEqual({ value: 2, min: 2, max: 2 });
    expect(readingLine(body)).toBe(VALVE_LINE);
  });

  it("a number passed from code keeps the resolution it is given, or none", async () => {
    const found = await onJob(tech, job.publicId, "bench:record");
    const given = await recordReading(tech, found, { job: job.publicId, label: "Disc thickness", value: 4.5, unit: "mm", min: 4, max: null, source: null, decimals: { value: 2, min: 1 } });
    expect((await k("readings").where({ id: given.id }).first())).toMatchObject({ value_decimals: 2, min_decimals: 1, max_decimals: null });
    const none = await recordReading(tech, found, { job: job.publicId, label: "Disc thickness", value: 4.5, unit: "mm", min: 4, max: null, source: null });
    expect((await k("readings").where({ id: none.id }).first())).toMatchObject({ value_decimals: null, min_decimals: null });
  });

  it("refuses a negative reading or limit beside its field, and writes nothing", async () => {
    const found = await onJob(tech, job.publicId, "bench:record");
    const before = await counts();
    const pad = await refusal(recordReading(tech, found, { job: job.publicId, label: "Front pad, inner", value: "-0.5", unit: "mm", min: "1.0", max: null, source: null }));
    expect(pad.code).toBe("invalid");
    expect(pad.fields?.value?.[0]).toMatch(/^The reading can’t be below zero: a thickness, a clearance, a length or a pad measures 0 or more/);
    const limit = await refusal(recordReading(tech, found, { job: job.publicId, label: "Run-out", value: "0.05", unit: "mm", min: "-0.1", max: "0.1", source: null }));
    expect(limit.fields?.min?.[0]).toMatch(/^The minimum can’t be below zero/);
    const fromCode = await refusal(recordReading(tech, found, { job: job.publicId, label: "Run-out", value: -0.05, unit: "mm", min: null, max: "0.1", source: null }));
    expect(fromCode.fields?.value?.[0]).toMatch(/can’t be below zero/);
    expect(await counts()).toEqual(before);
    // A temperature can be: a coolant's freeze point of −37 °C against a limit of at most −30 °C.
    const freeze = await recordReading(tech, found, { job: job.publicId, label: "Coolant freeze point", value: "-37", unit: "°C", min: null, max: "-30", source: "Maker's manual" });
    expect((await k("readings").where({ id: freeze.id }).first())).toMatchObject({ verdict: "within" });
  });

  it("chain: 200/N applies when tighter, with the reason kept; a likely pin miscount is asked about first", async () => {
    const found = await onJob(tech, job.publicId, "bench:record");
    const before = await counts();
    // REFERENCES §4: #520 (15.875 mm) over 20 pitches, nominal 317.5 mm. 325.755 mm → 2.6 %:
    // within the shop's 3 %, past 200/80 = 2.5 % (REFERENCES §4: N = 80 → 2.5 %).
    const chain = { job: job.publicId, label: "Drive chain", pitchMm: "15.875", pitches: 20, measuredMm: "325.755", limitPct: "3", source: null };
    const made = await recordChainReading(tech, found, { ...chain, sprocketTeeth: 80 });
    const row = (await k("readings").where({ id: made.id }).first())!;
    expect(row).toMatchObject({ verdict: "above", max_value: 2.5 });
    const listed = (await listReadings({ shopId: shop.id, jobId: job.id })).find((r) => r.id === made.id)!;
    expect(readingLine(listed)).toBe(
      "Drive chain: 2.60 % — limit at most 2.5 % (200/N for a large sprocket of 80 teeth, tighter than the shop's 3 %) — OUT OF LIMIT: at or past the replace-at limit by 0.10 %",
    );
    // REFERENCES §4 formula: a new chain over 21 pitches (333.375 mm) entered as 20 reads 5 %.
    const miscount = await refusal(recordChainReading(tech, found, { ...chain, measuredMm: "333.375" }));
    expect(miscount.fields?.pitches?.[0]).toMatch(/pitches = pins − 1 \(22 pins span 21 pitches\)/);
    // More than 10 % over new (common trade practice, no published source): refused outright.
    const stretched = await refusal(recordChainReading(tech, found, { ...chain, measuredMm: "360", countChecked: true }));
    expect(stretched.fields?.measuredMm?.[0]).toMatch(/more than any chain still on a machine stretches/);
    expect(await counts()).toEqual({ readings: before.readings + 1, entries: before.entries + 1 });
    // Count checked: logged as it reads (5 % past a 3 % limit).
    const confirmed = await recordChainReading(tech, found, { ...chain, measuredMm: "333.375", countChecked: true });
    expect((await k("readings").where({ id: confirmed.id }).first())!.verdict).toBe("above");
  });

  it("the owner's timeline, the digest line and the approval's evidence carry the limit and verdict", async () => {
    const found = await onJob(tech, job.publicId, "bench:record");
    const made = await recordReading(tech, found, { job: job.publicId, ...valve });
    await editEntry(tech, await onJob(tech, job.publicId, "journal:post"), made.entryId, { version: 1, visibility: "shared" });
    const timeline = await readTimeline(owner, await onJob(owner, job.publicId, "job:view"), { order: "desc", limit: 50 });
    const entry = timeline.entries.find((e) => e.id === made.entryId)!;
    expect(entry).toBeDefined();
    const html = renderToStaticMarkup(createElement(BenchEntryBody, { entry }));
    expect(html).toContain("Intake valve clearance, left: 0.06 mm");
    expect(html).toContain("Out of limit: under");
    expect(html).toContain("0.04 mm under the minimum.");
    expect(html).toContain("Limit 0.10–0.20 mm (maker&#x27;s manual)");
    expect(summarizeEntry({ kind: entry.kind, body: entry.body, caption: null, photoCount: 0 }).text).toBe(VALVE_LINE);

    // A finding with the reading as evidence, sent: the request freezes the whole line for the owner.
    await saveMoneySettings({ shopId: shop.id, settings: { ...DEFAULT_MONEY_SETTINGS, labourRateMinor: 10_000 } });
    const draft = findingInputSchema.parse({
      title: "Intake valve clearance out of limit",
      found: `${VALVE_LINE}.`,
      whyItMatters: "A tight valve can burn and lose compression.",
      safety: "none",
      evidence: [{ kind: "reading", ref: String(made.id), momentMs: null }],
      lines: [{ kind: "labour", description: "Set valve clearances", hours: "1.5" }],
    });
    const finding = await createFinding(writer, await onJob(writer, job.publicId, "approvals:draft"), draft);
    const sent = await sendRequest(writer, await onJob(writer, job.publicId, "approvals:send"), finding.id, { findingVersion: finding.version });
    const request = (await k("approval_requests").where({ public_id: sent.publicId }).first())!;
    const snapshot = typeof request.snapshot === "string" ? JSON.parse(request.snapshot) : request.snapshot;
    expect(snapshot.evidence).toEqual([{ kind: "reading", ref: String(made.id), momentMs: null, label: VALVE_LINE }]);
  });
});
