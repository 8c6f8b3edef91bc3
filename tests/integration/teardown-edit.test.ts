import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { getReassemblyProgress, listTeardownSteps } from "@/db/queries/bench";
import { listTeardownRevisions, reviseTeardownStep } from "@/db/queries/teardown-history";
import { checklistFromSteps } from "@/lib/bench";
import type { Action, Actor } from "@/lib/permissions";
import { teardownDeleteSchema, teardownEditSchema } from "@/lib/schemas/bench";
import { access } from "@/lib/server/access";
import { addTeardownStep, setTeardownTorque, tickTeardownStep } from "@/lib/server/bench";
import { deleteTeardownStep, editTeardownStep } from "@/lib/server/teardown-edit";
import { ownerWithJobs, staffActor } from "../support/authorised-work";
import { makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";

// Issue 18 §7: teardown steps are edited and deleted with a trail, on real MariaDB.

type Shop = Awaited<ReturnType<typeof makeShop>>;

describe("editing and deleting teardown steps", () => {
  let k: Knex;
  let shop: Shop;
  let other: Shop;
  let tech: Actor;
  let customer: Actor;
  let jobs: { id: number; publicId: string }[] = [];

  const onJob = (actor: Actor, publicId: string, permission: Action = "bench:record") => access(actor, "job", publicId, permission);
  const parse = (v: unknown) => (typeof v === "string" ? JSON.parse(v) : v);
  /** Everything an edit could write, to show a refused one wrote nothing. */
  const state = async (jobId: number) => ({
    steps: await k("teardown_steps").where({ job_id: jobId }).orderBy("id").select("id", "removed", "count", "notes", "version", "deleted_at", "torque_value"),
    revisions: await k("teardown_step_revisions").where({ job_id: jobId }).orderBy("id").select("id"),
    entries: await k("journal_entries").where({ job_id: jobId }).orderBy("id").select("id", "version", "body", "deleted_at", "edited_at"),
    entryRevisions: await k("journal_entry_revisions as r").join("journal_entries as e", "e.id", "r.entry_id").where({ "e.job_id": jobId }).select("r.id"),
    status: (await k("jobs").where({ id: jobId }).first("status"))!.status,
  });
  const add = async (job: { publicId: string }, removed: string, extra: Partial<{ count: number; notes: string }> = {}) =>
    addTeardownStep(tech, await onJob(tech, job.publicId), { job: job.publicId, removed, count: extra.count ?? null, size: null, notes: extra.notes ?? null, storage: "Tray 2", photo: null });

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "teardown-edit", roles: ["owner", "technician"] });
    other = await makeShop(k, { label: "teardown-edit-other", roles: ["technician"] });
    tech = staffActor(shop, "technician");
    ({ owner: customer, jobs } = await ownerWithJobs(k, shop, 3, "Lio Brandt"));
  });
  afterAll(async () => k?.destroy());

  it("an edit keeps the step as it was (who, when), bumps its version and refreshes its timeline entry, marked edited", async () => {
    const job = jobs[0]!;
    const cover = await add(job, "Clutch cover", { count: 8, notes: "Long bolt at 2 o'clock" });
    const input = teardownEditSchema.parse({ job: job.publicId, step: String(cover.id), version: "1", removed: "Clutch cover, right side", count: "9", size: "", notes: "Long bolt at 2 o'clock", storage: "Tray 2" });
    expect(await editTeardownStep(tech, await onJob(tech, job.publicId), input)).toMatchObject({ version: 2 });

    const [step] = await listTeardownSteps({ shopId: shop.id, jobId: job.id });
    expect(step).toMatchObject({ removed: "Clutch cover, right side", count: 9, version: 2 });
    const [rev] = await listTeardownRevisions({ shopId: shop.id, jobId: job.id });
    expect(rev).toMatchObject({ stepId: cover.id, seq: 1, version: 1, change: "edit", by: expect.stringContaining("technician") });
    expect(rev!.previous).toMatchObject({ removed: "Clutch cover", count: 8, notes: "Long bolt at 2 o'clock", storage: "Tray 2", torque: null });

    const entry = await k("journal_entries").where({ id: cover.entryId }).first();
    expect(entry!.edited_at).not.toBeNull();
    expect(entry!.version).toBe(2);
    expect(parse(entry!.body)).toMatchObject({ seq: 1, removed: "Clutch cover, right side", count: 9 });
    // The entry's own history keeps what it showed before.
    const entryRev = await k("journal_entry_revisions").where({ entry_id: cover.entryId }).first();
    expect(entryRev).toMatchObject({ version: 1, change: "edit" });
    expect(parse(entryRev!.body)).toMatchObject({ removed: "Clutch cover", count: 8 });
  });

  it("saving a step unchanged writes nothing: no revision, no new version", async () => {
    const job = jobs[0]!;
    const [step] = await listTeardownSteps({ shopId: shop.id, jobId: job.id });
    const before = await state(job.id);
    const same = teardownEditSchema.parse({ job: job.publicId, step: String(step!.id), version: "2", removed: "Clutch cover, right side", count: "9", size: "", notes: "Long bolt at 2 o'clock", storage: "Tray 2" });
    expect(await editTeardownStep(tech, await onJob(tech, job.publicId), same)).toMatchObject({ version: 2 });
    expect(await state(job.id)).toEqual(before);
  });

  it("a torque change is kept in the history too, and the entry shows the new torque", async () => {
    const job = jobs[0]!;
    const [step] = await listTeardownSteps({ shopId: shop.id, jobId: job.id });
    await setTeardownTorque(tech, await onJob(tech, job.publicId), { step: step!.id, torqueValue: "10", torqueUnit: "nm", boltCount: 9 });
    await setTeardownTorque(tech, await onJob(tech, job.publicId), { step: step!.id, torqueValue: "12", torqueUnit: "nm", boltCount: 9 });
    const revs = (await listTeardownRevisions({ shopId: shop.id, jobId: job.id })).filter((r) => r.change === "torque");
    expect(revs.map((r) => r.previous.torque?.value ?? null)).toEqual([null, 10]);
    const entryId = Number((await k("teardown_steps").where({ id: step!.id }).first("entry_id"))!.entry_id);
    const body = parse((await k("journal_entries").where({ id: entryId }).first("body"))!.body);
    expect(body.torque).toMatchObject({ value: 12, unit: "nm", boltCount: 9 });
    expect(body.torque).not.toHaveProperty("note");
    expect((await listTeardownSteps({ shopId: shop.id, jobId: job.id }))[0]!.version).toBe(4);
  });

  it("a stale version, a step of another job and a bad column are refused with nothing written", async () => {
    const job = jobs[0]!;
    const [step] = await listTeardownSteps({ shopId: shop.id, jobId: job.id });
    const before = await state(job.id);
    const stale = teardownEditSchema.parse({ job: job.publicId, step: String(step!.id), version: "1", removed: "Old tab's text" });
    await expect(editTeardownStep(tech, await onJob(tech, job.publicId), stale)).rejects.toMatchObject({ code: "conflict" });
    // The step id of job 0 named on job 1: not on that job.
    const elsewhere = teardownEditSchema.parse({ job: jobs[1]!.publicId, step: String(step!.id), version: String(step!.version), removed: "Wrong job" });
    await expect(editTeardownStep(tech, await onJob(tech, jobs[1]!.publicId), elsewhere)).rejects.toMatchObject({ code: "not_found" });
    // Longer than the column: fails after the revision row was written, in the same transaction.
    const tooLong = { removed: "x".repeat(300), count: null, size: null, notes: null, storage: null };
    await expect(reviseTeardownStep({ shopId: shop.id, jobId: job.id, stepId: step!.id, userId: tech.userId, expectedVersion: step!.version, change: { kind: "edit", set: tooLong } })).rejects.toThrow(/too long/i);
    expect(await state(job.id)).toEqual(before);
  });

  it("another shop's technician and the machine's owner are refused before anything is written", async () => {
    const job = jobs[0]!;
    const [step] = await listTeardownSteps({ shopId: shop.id, jobId: job.id });
    const before = await state(job.id);
    const stranger = staffActor(other, "technician");
    await expect(onJob(stranger, job.publicId)).rejects.toMatchObject({ code: "not_found" });
    await expect(onJob(customer, job.publicId)).rejects.toMatchObject({ code: "forbidden" });
    // And a form that names no version doesn't parse (the action answers 422).
    expect(teardownDeleteSchema.safeParse({ job: job.publicId, step: String(step!.id), version: "" }).success).toBe(false);
    expect(await state(job.id)).toEqual(before);
  });

  it("a deleted step leaves the log, the checklist and the progress; its entry goes; its history stays", async () => {
    const job = jobs[1]!;
    const seat = await add(job, "Seat");
    const tank = await add(job, "Fuel tank", { notes: "Petcock off first" });
    const wrong = await add(job, "Wrong line: typed twice");
    await tickTeardownStep(tech, await onJob(tech, job.publicId), { step: tank.id, value: true });
    await tickTeardownStep(tech, await onJob(tech, job.publicId), { step: seat.id, value: true });
    expect(await getReassemblyProgress({ shopId: shop.id, jobId: job.id })).toEqual({ done: 2, total: 3, percent: 66 });

    const made = await deleteTeardownStep(tech, await onJob(tech, job.publicId), teardownDeleteSchema.parse({ job: job.publicId, step: String(wrong.id), version: "1" }));
    const steps = await listTeardownSteps({ shopId: shop.id, jobId: job.id });
    expect(steps.map((s) => s.removed)).toEqual(["Seat", "Fuel tank"]);
    expect(checklistFromSteps(steps, [30, 60, 100]).map((i) => i.removed)).toEqual(["Fuel tank", "Seat"]);
    expect(await getReassemblyProgress({ shopId: shop.id, jobId: job.id })).toEqual({ done: 2, total: 2, percent: 100 });
    // Everything left was back together: the job follows, as after the last tick (lib/job-workflow.ts).
    expect(made.jobMovedTo).toBe("ready");

    const row = await k("teardown_steps").where({ id: wrong.id }).first();
    expect(row!.deleted_at).not.toBeNull();
    expect(row!.deleted_by_user_id).toBe(tech.userId);
    expect((await k("journal_entries").where({ id: wrong.entryId }).first())!.deleted_at).not.toBeNull();
    const history = await listTeardownRevisions({ shopId: shop.id, jobId: job.id });
    expect(history).toEqual([expect.objectContaining({ stepId: wrong.id, seq: 3, change: "delete", previous: expect.objectContaining({ removed: "Wrong line: typed twice" }) })]);

    // Gone is gone: a second delete, an edit or a tick of it finds nothing.
    await expect(deleteTeardownStep(tech, await onJob(tech, job.publicId), teardownDeleteSchema.parse({ job: job.publicId, step: String(wrong.id), version: "2" }))).rejects.toMatchObject({ code: "not_found" });
    await expect(tickTeardownStep(tech, await onJob(tech, job.publicId), { step: wrong.id, value: true })).rejects.toMatchObject({ code: "not_found" });
    // The next step logged is numbered past the deleted one (the removal order stays unique).
    expect((await add(job, "Side panel")).seq).toBe(4);
  });

  it("once the machine is collected the log is closed: edits, deletes and torque changes are refused, nothing written", async () => {
    const job = jobs[2]!;
    const step = await add(job, "Front wheel");
    await k("jobs").where({ id: job.id }).update({ status: "picked_up" });
    const before = await state(job.id);
    const found = await onJob(tech, job.publicId);
    const edit = teardownEditSchema.parse({ job: job.publicId, step: String(step.id), version: "1", removed: "Front wheel and spacers" });
    await expect(editTeardownStep(tech, found, edit)).rejects.toMatchObject({ code: "conflict", message: expect.stringMatching(/collected/) });
    await expect(deleteTeardownStep(tech, found, teardownDeleteSchema.parse({ job: job.publicId, step: String(step.id), version: "1" }))).rejects.toMatchObject({ code: "conflict" });
    await expect(setTeardownTorque(tech, found, { step: step.id, torqueValue: "60", torqueUnit: "nm", boltCount: null })).rejects.toMatchObject({ code: "conflict" });
    expect(await state(job.id)).toEqual(before);
  });
});
