import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { listReadings, listTeardownSteps } from "@/db/queries/bench";
import { listSpecs } from "@/db/queries/bench-specs";
import { checklistFromSteps } from "@/lib/bench";
import { formatNumberInput, numberStyleFor } from "@/lib/number-input";
import type { Actor } from "@/lib/permissions";
import { atResolution, readingLimitText, readingLine } from "@/lib/reading-text";
import { readingSchema, specSchema, stepTorqueSchema, teardownStepSchema } from "@/lib/schemas/bench";
import { access } from "@/lib/server/access";
import { addSpec } from "@/lib/server/bench-parts";
import { addTeardownStep, recordReading, setTeardownTorque } from "@/lib/server/bench";
import { stepTorqueNote } from "@/lib/torque-special";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";

// Issue 18 gaps, through the schemas and the server into MariaDB and back: a spec library limit
// keeps the decimals typed (migration 32) and hands them to the reading it pre-fills; a teardown
// step's torque takes loosen-and-retorque and "other" threads as a torque record does.
// The numbers are invented examples, not maker's data.
type Shop = Awaited<ReturnType<typeof makeShop>>;

describe("spec limits keep their resolution; step torques take retorque and “other” threads", () => {
  let k: Knex;
  let shop: Shop;
  let owner: Actor;
  let tech: Actor;
  let job: { id: number; publicId: string };
  const actorOf = (role: "owner" | "technician"): Actor => ({
    userId: shop.staff[role]!.id,
    email: shop.staff[role]!.email,
    name: role,
    memberships: [{ shopId: shop.id, shopSlug: shop.slug, shopName: shop.slug, role }],
  });
  const onJob = () => access(tech, "job", job.publicId, "bench:record");
  const spec = async (form: Record<string, string>) =>
    addSpec(owner, await access(owner, "shop", shop.slug, "specs:manage"), specSchema.parse({ shop: shop.slug, make: "Testmake", model: "T-250", ...form }));

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "spec-step-extras", roles: ["owner", "technician"] });
    await k("shops").where({ id: shop.id }).update({ currency: "USD" });
    const made = await makeCustomerWithJobs(k, shop.id, { name: "Ines Rowan", statuses: ["in_progress"] });
    job = { id: made.jobIds[0]!, publicId: String((await k("jobs").where({ id: made.jobIds[0]! }).first("public_id"))!.public_id) };
    owner = actorOf("owner");
    tech = actorOf("technician");
  });
  afterAll(async () => k?.destroy());

  it("a limit typed as 0.10–0.20 mm is listed, pre-filled and recorded at 0.10–0.20", async () => {
    const { id } = await spec({ kind: "limit", label: "Intake valve clearance", unit: "mm", min: "0.10", max: "0.20", source: "manual p. 3-8" });
    const row = (await k("spec_entries").where({ id }).first())!;
    expect([Number(row.min_value), row.min_decimals, Number(row.max_value), row.max_decimals, row.value_decimals]).toEqual([0.1, 2, 0.2, 2, null]);

    const listed = (await listSpecs({ shopId: shop.id })).find((s) => s.id === id)!;
    expect(listed.decimals).toEqual({ value: null, min: 2, max: 2 });
    // The specs page's words for a limit.
    expect(readingLimitText(listed)).toBe("0.10–0.20 mm");
    // The reading form's pick fills the fields as the shop writes numbers, decimals kept.
    const style = numberStyleFor("USD");
    const filled = { min: formatNumberInput(listed.min!, style, listed.decimals.min ?? undefined), max: formatNumberInput(listed.max!, style, listed.decimals.max ?? undefined) };
    expect(filled).toEqual({ min: "0.10", max: "0.20" });

    await recordReading(tech, await onJob(), readingSchema.parse({ job: job.publicId, label: listed.label, value: "0.06", unit: "mm", ...filled, source: listed.source }));
    const reading = (await listReadings({ shopId: shop.id, jobId: job.id }))[0]!;
    expect(reading.decimals).toEqual({ value: 2, min: 2, max: 2 });
    // 0.06 is 0.04 under the 0.10 minimum: plain subtraction.
    expect(readingLine(reading)).toBe("Intake valve clearance: 0.06 mm — limit 0.10–0.20 mm (manual p. 3-8) — OUT OF LIMIT: 0.04 mm under the minimum");
  });

  it("a capacity keeps its typed decimals; an entry written before migration 32 reads as before", async () => {
    const { id } = await spec({ kind: "capacity", label: "Engine oil with filter", value: "1.50", unit: "L" });
    const cap = (await listSpecs({ shopId: shop.id })).find((s) => s.id === id)!;
    expect(atResolution(cap.value!, cap.decimals.value)).toBe("1.50");

    const [old] = await k("spec_entries").insert({ shop_id: shop.id, make: "Testmake", model: "T-250", kind: "limit", label: "Chain slack", min_value: 0.5, max_value: 1.2, unit: "in" });
    const before = (await listSpecs({ shopId: shop.id })).find((s) => s.id === Number(old))!;
    expect(before.decimals).toEqual({ value: null, min: null, max: null });
    expect(readingLimitText(before)).toBe("0.5–1.2 in");
    expect(formatNumberInput(before.min!, numberStyleFor("USD"), before.decimals.min ?? undefined)).toBe("0.5");
  });

  it("a step torque records loosen-and-retorque with its sequence and what “other” was on the threads, through to the checklist and the timeline", async () => {
    const f = await onJob();
    const step = await addTeardownStep(tech, f, teardownStepSchema.parse({ job: job.publicId, removed: "Rear sprocket nuts", count: "6", size: "M8" }));
    const save = (form: Record<string, string>) => setTeardownTorque(tech, f, stepTorqueSchema.parse({ job: job.publicId, step: String(step.id), torqueValue: "30", torqueUnit: "nm", ...form }));
    await save({ lubrication: "other", lubricationOther: "copper paste", loosenRetorque: "on", retorqueSequence: "loosen 90°, retorque to 30 N·m" });

    const row = (await k("teardown_steps").where({ id: step.id }).first())!;
    expect([row.torque_lubrication, row.torque_lubrication_other, Boolean(row.torque_loosen_retorque), row.torque_retorque_sequence]).toEqual(["other", "copper paste", true, "loosen 90°, retorque to 30 N·m"]);
    const listed = (await listTeardownSteps({ shopId: shop.id, jobId: job.id })).find((s) => s.id === step.id)!;
    expect(listed.torque).toMatchObject({ lubrication: "other", lubricationOther: "copper paste", loosenRetorque: true, retorqueSequence: "loosen 90°, retorque to 30 N·m" });
    const item = checklistFromSteps([listed], [30, 60, 100])[0]!;
    const words = "threads: copper paste; loosened and retorqued (loosen 90°, retorque to 30 N·m)";
    expect(stepTorqueNote(item.torque!)).toBe(words);

    // The step's timeline entry carries them too (db/queries/teardown-history.ts refreshes it).
    const entries = await k("journal_entries").where({ job_id: job.id, kind: "teardown" }).select("body");
    const bodies = entries.map((e) => (typeof e.body === "string" ? JSON.parse(e.body) : e.body));
    const entry = bodies.find((b) => b.removed === "Rear sprocket nuts");
    expect(stepTorqueNote(entry.torque)).toBe(words);

    // Typing only the sequence also says it was loosened and retorqued, as on a torque record.
    await save({ retorqueSequence: "back off, retorque to 30 N·m" });
    const again = (await listTeardownSteps({ shopId: shop.id, jobId: job.id })).find((s) => s.id === step.id)!;
    expect(again.torque).toMatchObject({ lubrication: null, lubricationOther: null, loosenRetorque: true, retorqueSequence: "back off, retorque to 30 N·m" });
  });

  it("refuses a retorque tick without its sequence and “other” threads without what, beside the field, writing nothing", async () => {
    const f = await onJob();
    const step = await addTeardownStep(tech, f, teardownStepSchema.parse({ job: job.publicId, removed: "Stator cover bolts", count: "8", size: "M6" }));
    const save = (form: Record<string, string>) => setTeardownTorque(tech, f, stepTorqueSchema.parse({ job: job.publicId, step: String(step.id), torqueValue: "10", torqueUnit: "nm", ...form }));
    const revisions = async () => Number((await k("teardown_step_revisions").where({ step_id: step.id }).count({ n: "*" }).first())!.n);
    await expect(save({ loosenRetorque: "on" })).rejects.toMatchObject({ code: "invalid", fields: { retorqueSequence: [expect.stringContaining("Say how it is loosened and retorqued")] } });
    await expect(save({ lubrication: "other" })).rejects.toMatchObject({ code: "invalid", fields: { lubricationOther: ["Say what was on the threads, e.g. “molybdenum paste”."] } });
    expect((await k("teardown_steps").where({ id: step.id }).first())!.torque_value).toBeNull();
    expect(await revisions()).toBe(0);
    // A step saved without them (or before migration 32) says nothing more than before.
    await save({ lubrication: "oiled" });
    const listed = (await listTeardownSteps({ shopId: shop.id, jobId: job.id })).find((s) => s.id === step.id)!;
    expect(stepTorqueNote(listed.torque!)).toBe("threads oiled");
  });
});
