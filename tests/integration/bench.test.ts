import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { getBenchSettings, getReassemblyProgress, insertTeardownStep, insertTorqueRecord, listTeardownSteps } from "@/db/queries/bench";
import { listParts } from "@/db/queries/bench-parts";
import { checklistFromSteps } from "@/lib/bench";
import { CAUSE_LABEL } from "@/lib/job-workflow";
import type { Action, Actor } from "@/lib/permissions";
import { type JobAccess, access } from "@/lib/server/access";
import { addJobPart, changeJobPartStatus, updateBenchSettings } from "@/lib/server/bench-parts";
import { addTeardownStep, recordChainReading, recordReading, recordTorque, setTeardownTorque, tickTeardownStep } from "@/lib/server/bench";
import { roundHalfUp } from "@/lib/rounding";
import { getClipLimits } from "@/db/queries/clips";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";

type Shop = Awaited<ReturnType<typeof makeShop>>;
const actorOf = (shop: Shop, role: "owner" | "technician" | "service_writer"): Actor => ({
  userId: shop.staff[role]!.id,
  email: shop.staff[role]!.email,
  name: role,
  memberships: [{ shopId: shop.id, shopSlug: shop.slug, shopName: shop.slug, role }],
});

describe("bench tools", () => {
  let k: Knex;
  let shop: Shop;
  let other: Shop;
  let tech: Actor;
  let customer: Actor;
  const jobs: { id: number; publicId: string }[] = [];

  const count = async (table: string, jobId: number) => Number((await k(table).where({ job_id: jobId }).count({ n: "*" }).first())?.n ?? 0);
  const entries = (jobId: number) => k("journal_entries").where({ job_id: jobId }).orderBy("id");
  /** The job as the bench actions find it (declared resource "job"): resolved and authorised (lib/server/access.ts). */
  const onJob = (actor: Actor, publicId: string, permission: Action) => access(actor, "job", publicId, permission);
  /** Resolve and authorise as the action would, then do its work: a refusal stops before any write. */
  const act = <T>(actor: Actor, publicId: string, permission: Action, work: (found: JobAccess) => Promise<T>) => onJob(actor, publicId, permission).then(work);
  const status = async (jobId: number) => String((await k("jobs").where({ id: jobId }).first("status"))!.status);

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "bench", roles: ["owner", "technician", "service_writer"] });
    other = await makeShop(k, { label: "bench-other", roles: ["technician"] });
    tech = actorOf(shop, "technician");
    const [userId] = await k("users").insert({ email: `owner.${shop.slug}@mail.test`, name: "Noor Vell" });
    customer = { userId: Number(userId), email: `owner.${shop.slug}@mail.test`, name: "Noor Vell", memberships: [] };
    const made = await makeCustomerWithJobs(k, shop.id, { name: "Noor Vell", userId: Number(userId), statuses: ["in_progress", "in_progress", "in_progress"] });
    for (const id of made.jobIds) jobs.push({ id, publicId: String((await k("jobs").where({ id }).first("public_id"))!.public_id) });
  });
  afterAll(async () => k?.destroy());

  it("a torque record writes its row and a shop-only timeline entry holding its snapshot", async () => {
    const [job] = jobs;
    const made = await recordTorque(tech, await onJob(tech, job!.publicId, "bench:record"), {
      job: job!.publicId,
      fastener: "Clutch cover bolts, 8 × M6",
      specValue: 10,
      unit: "nm",
      appliedValue: 10,
      tool: "3/8 click wrench",
      passes: null,
      boltCount: 8,
      note: null,
      share: false,
    });
    const row = await k("torque_records").where({ id: made.id }).first();
    expect(row).toMatchObject({ fastener: "Clutch cover bolts, 8 × M6", unit: "nm", bolt_count: 8, entry_id: made.entryId });
    const entry = await k("journal_entries").where({ id: made.entryId }).first();
    expect(entry).toMatchObject({ kind: "torque", visibility: "shop", job_id: job!.id });
    const body = typeof entry?.body === "string" ? JSON.parse(entry.body) : entry?.body;
    // The shop's default passes (common supplier practice, REFERENCES.md §3) and the 8-bolt cross pattern.
    expect(body).toMatchObject({ specValue: 10, passPercents: [30, 60, 100], pattern: "cross", displayUnit: "nm" });
  });

  it("a failing insert leaves neither the record nor its entry", async () => {
    const [job] = jobs;
    const before = { rows: await count("torque_records", job!.id), entries: await count("journal_entries", job!.id), steps: await count("teardown_steps", job!.id) };
    // Longer than the column: the row insert fails after the entry was written, in the same transaction.
    const body = { fastener: "x".repeat(300), specValue: 10, unit: "nm" as const, appliedValue: null, tool: null, passPercents: [30, 60, 100], boltCount: null, pattern: null, note: null, displayUnit: "nm" as const };
    await expect(insertTorqueRecord({ shopId: shop.id, jobId: job!.id, userId: tech.userId, visibility: "shop", body })).rejects.toThrow(/too long/i);
    // A photo that doesn't exist: the step's foreign key refuses it.
    const step = { removed: "Seat", count: null, size: null, notes: null, storage: null };
    await expect(insertTeardownStep({ shopId: shop.id, jobId: job!.id, userId: tech.userId, photoId: "A".repeat(22), step })).rejects.toThrow(/foreign key/i);
    expect({ rows: await count("torque_records", job!.id), entries: await count("journal_entries", job!.id), steps: await count("teardown_steps", job!.id) }).toEqual(before);
  });

  it("readings are judged against their limits", async () => {
    const [job] = jobs;
    const low = await recordReading(tech, await onJob(tech, job!.publicId, "bench:record"), { job: job!.publicId, label: "Rear brake disc thickness", value: 4.3, unit: "mm", min: 4.5, max: null, source: "shop manual p. 9-3" });
    const ok = await recordReading(tech, await onJob(tech, job!.publicId, "bench:record"), { job: job!.publicId, label: "Idle speed", value: 1500, unit: "rpm", min: 1400, max: 1600, source: null });
    expect((await k("readings").where({ id: low.id }).first())!.verdict).toBe("below");
    expect((await k("readings").where({ id: ok.id }).first())!.verdict).toBe("within");
  });

  it("the chain helper records elongation against the limit", async () => {
    const [job] = jobs;
    // REFERENCES.md §4: #520 (15.875 mm) over 20 pitches, measured 322.3 mm → 1.512 %, past a 1.5 % limit.
    const made = await recordChainReading(tech, await onJob(tech, job!.publicId, "bench:record"), { job: job!.publicId, label: "Drive chain", pitchMm: 15.875, pitches: 20, measuredMm: 322.3, limitPct: 1.5, source: null });
    const row = await k("readings").where({ id: made.id }).first();
    expect(roundHalfUp(Number(row?.value), 3)).toBe(1.512);
    expect(row).toMatchObject({ verdict: "above", unit: "%" });
    // Without a typed limit the shop's default (3 %, REFERENCES.md §4 "most drives") applies: within.
    const lenient = await recordChainReading(tech, await onJob(tech, job!.publicId, "bench:record"), { job: job!.publicId, label: "Drive chain", pitchMm: 15.875, pitches: 20, measuredMm: 322.3, limitPct: null, source: null });
    expect(await k("readings").where({ id: lenient.id }).first()).toMatchObject({ verdict: "within", max_value: 3 });
  });

  it("parts needed → ordered → received park the job on parts and bring it back with one shared entry", async () => {
    const job = jobs[1]!;
    const part = async (description: string) => addJobPart(tech, await onJob(tech, job.publicId, "parts:manage"), { job: job.publicId, description, partNumber: null, supplier: "Invented Supply Co.", qty: "1", cost: "42.50", status: "needed", expectedOn: null, forWork: { findingId: null, noOkNeeded: true } });
    const chain = await part("Cam chain");
    expect(chain.jobMovedTo).toBe("waiting_parts");
    expect(await status(job.id)).toBe("waiting_parts");
    const parked = (await entries(job.id)).filter((e) => e.kind === "status");
    expect(parked).toHaveLength(1);
    expect(JSON.stringify(parked[0]!.body)).toContain(CAUSE_LABEL.part_needed);
    const guide = await part("Cam chain guide");
    expect(guide.jobMovedTo).toBeNull();

    for (const id of [chain.id, guide.id]) await changeJobPartStatus(tech, await onJob(tech, job.publicId, "parts:manage"), { part: id, from: "needed", to: "ordered", expectedOn: "2026-12-20" });
    expect(await status(job.id)).toBe("waiting_parts");
    await changeJobPartStatus(tech, await onJob(tech, job.publicId, "parts:manage"), { part: chain.id, from: "ordered", to: "received", expectedOn: null });
    expect(await status(job.id)).toBe("waiting_parts"); // the guide is still to come

    const sharedBefore = (await entries(job.id)).filter((e) => e.visibility === "shared").length;
    const last = await changeJobPartStatus(tech, await onJob(tech, job.publicId, "parts:manage"), { part: guide.id, from: "ordered", to: "received", expectedOn: null });
    expect(last.jobMovedTo).toBe("in_progress");
    expect(await status(job.id)).toBe("in_progress");
    const shared = (await entries(job.id)).filter((e) => e.visibility === "shared").slice(sharedBefore);
    expect(shared).toHaveLength(1);
    expect(shared[0]!.kind).toBe("status");
    expect(JSON.stringify(shared[0]!.body)).toContain(CAUSE_LABEL.part_received);
    // The owner is told at once: one "parts in" alert for the mail sweep, and not a digest item too.
    const alerts = await k("job_alerts").where({ job_id: job.id, kind: "parts_in" });
    expect(alerts).toHaveLength(1);
    expect(await k("job_update_queue").where({ entry_id: shared[0]!.id })).toHaveLength(0);
    // Part entries stay shop-only and never carry cost or supplier.
    const partEntries = (await entries(job.id)).filter((e) => e.kind === "part");
    expect(partEntries).toHaveLength(6);
    expect(partEntries.every((e) => e.visibility === "shop")).toBe(true);
    expect(JSON.stringify(partEntries.map((e) => e.body))).not.toMatch(/4250|42\.5|cost|Invented Supply/i);
    const [listed] = await listParts({ shopId: shop.id, jobId: job.id });
    expect(listed).toMatchObject({ costMinor: 4250, status: "received", expectedOn: "2026-12-20" });
    expect(listed!.history.map((h) => h.to)).toEqual(["needed", "ordered", "received"]);
    // Pressing "received" again from a stale page is refused, not applied twice.
    await expect(changeJobPartStatus(tech, await onJob(tech, job.publicId, "parts:manage"), { part: chain.id, from: "ordered", to: "received", expectedOn: null })).rejects.toMatchObject({ code: "conflict" });
  });

  it("the reassembly checklist from stored steps is reversed, with the torque on the right step", async () => {
    const job = jobs[2]!;
    const add = async (removed: string, notes: string) => addTeardownStep(tech, await onJob(tech, job.publicId, "bench:record"), { job: job.publicId, removed, count: null, size: null, notes, storage: "Tray 1", photo: null });
    const seat = await add("Seat", "Two hooks at the rear");
    const cover = await add("Clutch cover", "Long bolt at 2 o'clock");
    const plates = await add("Clutch plates", "Keep in order, dished plate last");
    expect([seat.seq, cover.seq, plates.seq]).toEqual([1, 2, 3]);
    await setTeardownTorque(tech, await onJob(tech, job.publicId, "bench:record"), { step: cover.id, torqueValue: 115, torqueUnit: "lbf_in", boltCount: 8 });
    expect((await entries(job.id)).filter((e) => e.kind === "teardown")).toHaveLength(3);

    const steps = await listTeardownSteps({ shopId: shop.id, jobId: job.id });
    const list = checklistFromSteps(steps, [30, 60, 100]);
    expect(list.map((i) => i.removed)).toEqual(["Clutch plates", "Clutch cover", "Seat"]);
    expect(list[0]!.torque).toBeNull();
    expect(list[2]!.torque).toBeNull();
    // NIST SP 811 App. B.9 via REFERENCES.md §1: 115 lbf·in → 13.0 N·m.
    expect(roundHalfUp(list[1]!.torque!.valueIn.nm, 1)).toBe(13.0);
    // ASME PCC-1 legacy cross pattern for 8 bolts (REFERENCES.md §2).
    expect(list[1]!.torque!.tighteningOrder).toEqual([1, 5, 3, 7, 2, 6, 4, 8]);

    await tickTeardownStep(tech, await onJob(tech, job.publicId, "bench:record"), { step: plates.id, value: true });
    await tickTeardownStep(tech, await onJob(tech, job.publicId, "bench:record"), { step: cover.id, value: true });
    const ticked = (await listTeardownSteps({ shopId: shop.id, jobId: job.id })).find((s) => s.id === cover.id)!;
    expect(ticked.checked).toMatchObject({ by: expect.stringContaining("technician") });
    // Floor: 2 of 3 is 66 %, never rounded up towards done.
    expect(await getReassemblyProgress({ shopId: shop.id, jobId: job.id })).toEqual({ done: 2, total: 3, percent: 66 });
    expect(await getReassemblyProgress({ shopId: shop.id, jobId: jobs[1]!.id })).toBeNull();
  });

  it("another shop's job is refused as if it didn't exist; the owner can't record", async () => {
    const job = jobs[0]!;
    const stranger = actorOf(other, "technician");
    const torque = { job: job.publicId, fastener: "Axle nut", specValue: 80, unit: "lbf_ft" as const, appliedValue: null, tool: null, passes: null, boltCount: null, note: null, share: false };
    await expect(act(stranger, job.publicId, "bench:record", (found) => recordTorque(stranger, found, torque))).rejects.toMatchObject({ code: "not_found" });
    const step = { job: job.publicId, removed: "Seat", count: null, size: null, notes: null, storage: null, photo: null };
    await expect(act(stranger, job.publicId, "bench:record", (found) => addTeardownStep(stranger, found, step))).rejects.toMatchObject({ code: "not_found" });
    const bolt = { job: job.publicId, description: "Bolt", partNumber: null, supplier: null, qty: "1", cost: null, status: "needed" as const, expectedOn: null, forWork: { findingId: null, noOkNeeded: true } };
    await expect(act(stranger, job.publicId, "parts:manage", (found) => addJobPart(stranger, found, bolt))).rejects.toMatchObject({ code: "not_found" });
    await expect(act(customer, job.publicId, "bench:record", (found) => recordTorque(customer, found, torque))).rejects.toMatchObject({ code: "forbidden" });
    expect(await k("torque_records").where({ fastener: "Axle nut" }).count({ n: "*" }).first()).toEqual({ n: 0 });
  });
  it("the shop owner sets the bench and clip limits; a technician can't", async () => {
    const input = { shop: shop.slug, torqueUnit: "lbf_ft" as const, passes: [30, 70, 100], chainLimitPct: 1.5, clipMaxMinutes: 5, clipMaxGb: 0.5, ownerWaitDays: 5 };
    // As the settings action declares it (specs/actions.ts): the shop, with shop:manage-settings.
    await expect(access(tech, "shop", shop.slug, "shop:manage-settings")).rejects.toMatchObject({ code: "forbidden" });
    await updateBenchSettings(await access(actorOf(shop, "owner"), "shop", shop.slug, "shop:manage-settings"), input);
    expect(await getClipLimits({ shopId: shop.id })).toEqual({ maxSeconds: 300, maxBytes: 512 * 1024 * 1024 });
    expect(await getBenchSettings({ shopId: shop.id })).toMatchObject({ torqueUnit: "lbf_ft", passPercents: [30, 70, 100], chainLimitPct: 1.5 });
    expect((await k("shops").where({ id: shop.id }).first("owner_wait_days"))!.owner_wait_days).toBe(5);
  });
});
