// Issue 20 §2, the bench records the phone's outbox replays besides torque records and readings:
// chain wear, measurement sets, teardown steps, a step's torque spec, reassembly ticks and
// "replaced with new" marks. Each case goes the way the route does (app/api/jobs/[job]/…): the
// route's own declared body schema, the job's access, idempotentRoute around the writer it
// calls, and any failure mapped to the answer's status and body by toErrorBody — against the
// real MariaDB. A replay with the same key writes nothing and answers as the first send did; bad
// input is a 4xx that names the field, with nothing written and no key kept.
import crypto from "node:crypto";
import type { Knex } from "knex";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { z } from "zod";
import { POST as chainRoute } from "@/app/api/jobs/[job]/chain-readings/route";
import { POST as measurementRoute } from "@/app/api/jobs/[job]/measurement-sets/route";
import { POST as replacedRoute } from "@/app/api/jobs/[job]/reassembly-replaced/route";
import { POST as tickRoute } from "@/app/api/jobs/[job]/reassembly-ticks/route";
import { POST as stepTorqueRoute } from "@/app/api/jobs/[job]/step-torques/route";
import { POST as teardownRoute } from "@/app/api/jobs/[job]/teardown-steps/route";
import { toErrorBody } from "@/lib/error-body";
import type { Actor } from "@/lib/permissions";
import type { ChainReadingInput, TeardownStepInput } from "@/lib/schemas/bench";
import type { MeasurementSetInput } from "@/lib/schemas/measurements";
import { type JobAccess, access } from "@/lib/server/access";
import { addTeardownStep, markStepReplaced, recordChainReading, setTeardownTorque, tickTeardownStep } from "@/lib/server/bench";
import { idempotentRoute } from "@/lib/server/idempotency";
import { recordMeasurementSet } from "@/lib/server/measurements";
import { staffActor } from "../support/authorised-work";
import { testKnex } from "../support/db";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";

const newKey = () => `k-${crypto.randomUUID()}`;
type Declared = { declaration: { body?: unknown } };
type Answer = { status: number; body: unknown; replayed: boolean };

/**
 * One POST as the route handles it once the caller is signed in: its declared body schema (a zod
 * failure is a 422 naming the field), the job's access for bench:record, then the work inside
 * idempotentRoute with the key header. The first answer is sent with status 200; a replay is
 * already a Response.
 */
async function post(route: Declared, what: string, actor: Actor, job: string, raw: unknown, key: string, work: (found: JobAccess, body: never) => Promise<unknown>): Promise<Answer> {
  try {
    const body = (route.declaration.body as z.ZodType).parse(raw);
    const found = await access(actor, "job", job, "bench:record");
    const req = new Request(`http://localhost/api/jobs/${job}/${what}`, { method: "POST", headers: { "idempotency-key": key } });
    const result = await idempotentRoute(req, actor.userId, body, () => work(found, body as never));
    if (result instanceof Response) return { status: result.status, body: (await result.json()) as unknown, replayed: result.headers.get("idempotent-replayed") === "true" };
    return { status: 200, body: JSON.parse(JSON.stringify(result)) as unknown, replayed: false };
  } catch (error) {
    const { status, body } = toErrorBody(error);
    return { status, body, replayed: false };
  }
}

describe("idempotency keys on the bench records the outbox replays", () => {
  let k: Knex;
  let tech: Actor;
  let job: { id: number; publicId: string };
  type Counted = "readings" | "measurement_sets" | "teardown_steps" | "teardown_step_revisions" | "journal_entries" | "job_status_changes";
  const count = (table: Counted) =>
    k(table)
      .where({ job_id: job.id })
      .count({ n: "*" })
      .first()
      .then((r) => Number(r?.n));
  const keyKept = (key: string) =>
    k("idempotency_keys")
      .where({ user_id: tech.userId, idem_key: key })
      .count({ n: "*" })
      .first()
      .then((r) => Number(r?.n));
  const step = (id: number) => k("teardown_steps").where({ id }).first();

  beforeAll(async () => {
    k = testKnex();
    const shop = await makeShop(k, { label: "idem-bench", roles: ["technician"] });
    tech = staffActor(shop, "technician");
    const made = await makeCustomerWithJobs(k, shop.id, { name: "Oren Pike", statuses: ["in_progress"] });
    const id = made.jobIds[0]!;
    job = { id, publicId: String((await k("jobs").where({ id }).first("public_id"))!.public_id) };
  }, 30_000);
  afterAll(async () => {
    await k?.destroy();
  });

  /** Sends `raw` twice with one key: the second send is the first's answer, and `table` grew by one only. */
  async function replayed(route: Declared, what: string, table: Counted, raw: unknown, work: (found: JobAccess, body: never) => Promise<unknown>) {
    const key = newKey();
    const before = await count(table);
    const first = await post(route, what, tech, job.publicId, raw, key, work);
    expect(first, JSON.stringify(first.body)).toMatchObject({ status: 200, replayed: false });
    const again = await post(route, what, tech, job.publicId, raw, key, work);
    expect(again).toEqual({ ...first, replayed: true });
    expect(await count(table)).toBe(before + 1);
    expect(await keyKept(key)).toBe(1);
    return first.body;
  }

  /** Bad input: a 4xx naming `field` (when given), nothing in `tables` changed, the key not kept. */
  async function refused(route: Declared, what: string, tables: Counted[], raw: unknown, work: (found: JobAccess, body: never) => Promise<unknown>, want: { status: number; field?: string }) {
    const key = newKey();
    const before = await Promise.all(tables.map(count));
    const answer = await post(route, what, tech, job.publicId, raw, key, work);
    expect(answer.status).toBe(want.status);
    const error = (answer.body as { error: { message: string; fields?: Record<string, string[]> } }).error;
    expect(error.message.length).toBeGreaterThan(0);
    if (want.field) expect(error.fields?.[want.field]?.[0]).toEqual(expect.any(String));
    expect(await Promise.all(tables.map(count))).toEqual(before);
    expect(await keyKept(key)).toBe(0);
  }

  const chain = async (found: JobAccess, body: ChainReadingInput) => {
    const made = await recordChainReading(tech, found, body);
    return { id: made.id, verdict: made.check.verdict };
  };
  const measurements = async (found: JobAccess, body: MeasurementSetInput) => {
    const made = await recordMeasurementSet(tech, found, body);
    return { id: made.id, out: made.out };
  };
  const teardown = async (found: JobAccess, body: TeardownStepInput) => {
    const made = await addTeardownStep(tech, found, body);
    return { id: made.id, seq: made.seq };
  };
  const stepTorque = async (found: JobAccess, body: Parameters<typeof setTeardownTorque>[2]) => (await setTeardownTorque(tech, found, body), { step: body.step });
  const tick = async (found: JobAccess, body: { step: number; value: boolean }) => ({ step: body.step, done: body.value, jobMovedTo: (await tickTeardownStep(tech, found, body)).jobMovedTo });
  const replace = async (found: JobAccess, body: { step: number; value: boolean }) => (await markStepReplaced(tech, found, body), { step: body.step, replaced: body.value });

  it("a chain wear reading is recorded once per key; bad numbers are refused beside their field", async () => {
    // Invented numbers; only the count of what was written is checked.
    const fields = { job: job.publicId, label: "Drive chain", pitchMm: "15.875", pitches: "20", measuredMm: "318" };
    const body = await replayed(chainRoute, "chain-readings", "readings", fields, chain);
    expect(body).toMatchObject({ id: expect.any(Number) });
    await refused(chainRoute, "chain-readings", ["readings", "journal_entries"], { ...fields, pitches: "twenty" }, chain, { status: 422, field: "pitches" });
    await refused(chainRoute, "chain-readings", ["readings", "journal_entries"], { ...fields, pitchMm: "0" }, chain, { status: 422, field: "pitchMm" });
  });

  it("a measurement set is recorded once per key; a set without a limit is refused", async () => {
    const fields = { job: job.publicId, kind: "leak_down", unit: "%", max: "10", source: "Invented manual p. 1", label0: "Cylinder 1", value0: "4", label1: "Cylinder 2", value1: "6" };
    const body = await replayed(measurementRoute, "measurement-sets", "measurement_sets", fields, measurements);
    expect(body).toMatchObject({ id: expect.any(Number), out: 0 });
    await refused(measurementRoute, "measurement-sets", ["measurement_sets", "journal_entries"], { ...fields, max: "" }, measurements, { status: 422, field: "min" });
    await refused(measurementRoute, "measurement-sets", ["measurement_sets", "journal_entries"], { ...fields, kind: "guesswork" }, measurements, { status: 422, field: "kind" });
  });

  it("a teardown step is logged once per key; an empty or foreign step is refused", async () => {
    const fields = { job: job.publicId, removed: "Clutch cover", count: "9", size: "8 mm head", storage: "Bin 2" };
    const body = (await replayed(teardownRoute, "teardown-steps", "teardown_steps", fields, teardown)) as { id: number; seq: number };
    expect(body.seq).toBeGreaterThan(0);
    await refused(teardownRoute, "teardown-steps", ["teardown_steps", "journal_entries"], { ...fields, removed: "  " }, teardown, { status: 422, field: "removed" });
    // A photo id of the right shape that isn't one of this job's posted photos.
    await refused(teardownRoute, "teardown-steps", ["teardown_steps", "journal_entries"], { ...fields, photo: "p".repeat(22) }, teardown, { status: 422, field: "photo" });
  });

  it("a step's torque spec is set once per key (one revision kept, not two); a zero torque or a missing step is refused", async () => {
    const made = await post(teardownRoute, "teardown-steps", tech, job.publicId, { job: job.publicId, removed: "Stator cover" }, newKey(), teardown);
    const stepId = (made.body as { id: number }).id;
    const fields = { job: job.publicId, step: String(stepId), torqueValue: "10", torqueUnit: "nm", boltCount: "8" };
    expect(await replayed(stepTorqueRoute, "step-torques", "teardown_step_revisions", fields, stepTorque)).toEqual({ step: stepId });
    expect(Number((await step(stepId))!.torque_value)).toBe(10);
    await refused(stepTorqueRoute, "step-torques", ["teardown_step_revisions", "journal_entries"], { ...fields, torqueValue: "0" }, stepTorque, { status: 422, field: "torqueValue" });
    await refused(stepTorqueRoute, "step-torques", ["teardown_step_revisions", "journal_entries"], { ...fields, step: "999999999" }, stepTorque, { status: 404 });
  });

  it("a reassembly tick and a 'replaced with new' mark replayed answer as the first and change nothing again", async () => {
    const made = await post(teardownRoute, "teardown-steps", tech, job.publicId, { job: job.publicId, removed: "Oil filter cover" }, newKey(), teardown);
    const stepId = (made.body as { id: number }).id;
    const fields = { job: job.publicId, step: String(stepId), value: "1" };

    const key = newKey();
    const moves = await count("job_status_changes");
    const first = await post(tickRoute, "reassembly-ticks", tech, job.publicId, fields, key, tick);
    expect(first).toMatchObject({ status: 200, replayed: false, body: { step: stepId, done: true } });
    const checked = (await step(stepId))!.checked_at;
    expect(checked).not.toBeNull();
    const movesAfterFirst = await count("job_status_changes");
    await new Promise((resolve) => setTimeout(resolve, 20));
    // Sent again (its answer was lost): the first answer, the tick's time and the job's moves as they were.
    expect(await post(tickRoute, "reassembly-ticks", tech, job.publicId, fields, key, tick)).toEqual({ ...first, replayed: true });
    expect((await step(stepId))!.checked_at).toEqual(checked);
    expect(await count("job_status_changes")).toBe(movesAfterFirst);
    expect(movesAfterFirst - moves).toBeLessThanOrEqual(1);

    const replacedKey = newKey();
    const marked = await post(replacedRoute, "reassembly-replaced", tech, job.publicId, fields, replacedKey, replace);
    expect(marked).toMatchObject({ status: 200, body: { step: stepId, replaced: true } });
    expect(Boolean((await step(stepId))!.replaced_new)).toBe(true);
    // Cleared meanwhile on the bench; the lost-answer replay of the mark doesn't set it again.
    await markStepReplaced(tech, await access(tech, "job", job.publicId, "bench:record"), { step: stepId, value: false });
    expect(await post(replacedRoute, "reassembly-replaced", tech, job.publicId, fields, replacedKey, replace)).toEqual({ ...marked, replayed: true });
    expect(Boolean((await step(stepId))!.replaced_new)).toBe(false);

    for (const [route, what, work] of [
      [tickRoute, "reassembly-ticks", tick],
      [replacedRoute, "reassembly-replaced", replace],
    ] as const) {
      await refused(route, what, ["teardown_steps", "job_status_changes"], { ...fields, value: "yes" }, work, { status: 422, field: "value" });
      await refused(route, what, ["teardown_steps", "job_status_changes"], { ...fields, step: "999999999" }, work, { status: 404 });
    }
    // The step itself untouched by the refusals.
    expect((await step(stepId))!.checked_at).toEqual(checked);
  });
});
