// Issue 20 §2, conflicts: once the desk has handed the machine back (status "picked_up") the job
// is closed, so a note, photo, clip, torque record, reading or other bench record that a phone
// queued before that and sends afterwards is refused with 409 and words the queued item can show,
// and nothing of it is written (no entry, no row, no idempotency key, no upload at the video
// service). Each writer is called as its route calls it: through idempotentRoute with a key.
import crypto from "node:crypto";
import fs from "node:fs";
import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import type { Knex } from "knex";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createVideoFake, type VideoFake } from "../../fakes/video/server";
import { AppError } from "@/lib/errors";
import type { Actor } from "@/lib/permissions";
import { readingSchema, teardownStepSchema, torqueRecordSchema } from "@/lib/schemas/bench";
import { access } from "@/lib/server/access";
import { addTeardownStep, recordChainReading, recordReading, recordTorque } from "@/lib/server/bench";
import { startClipUpload } from "@/lib/server/clips";
import { idempotentRoute } from "@/lib/server/idempotency";
import { postEntry, uploadPhoto } from "@/lib/server/journal";
import { recordMeasurementSet } from "@/lib/server/measurements";
import { staffActor } from "../support/authorised-work";
import { testKnex } from "../support/db";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";

const note = (text: string) => ({ type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text }] }] });
const newKey = () => `k-${crypto.randomUUID()}`;
const TOKEN = { tokenId: "collected-test-token", tokenSecret: "collected-test-secret" };
const request = (job: string, what: string, key: string) => new Request(`http://localhost/api/jobs/${job}/${what}`, { method: "POST", headers: { "idempotency-key": key } });

describe("posting onto a job that was collected meanwhile", () => {
  let k: Knex;
  let dir: string;
  let uploads: string;
  let fake: VideoFake;
  let tech: Actor;
  let job: { id: number; publicId: string };

  /** Everything a post or bench record could have left behind, for the job and the technician's keys. */
  const written = async () => {
    const n = async (table: "journal_entries" | "photos" | "torque_records" | "readings" | "clips" | "measurement_sets" | "teardown_steps", where: Record<string, unknown>) =>
      Number((await k(table).where(where).count({ n: "*" }).first())?.n);
    const keys = Number((await k("idempotency_keys").where({ user_id: tech.userId }).count({ n: "*" }).first())?.n);
    const videoUploads = ((await (await fetch(`${fake.url}/_fake/status`)).json()) as { uploads: number }).uploads;
    const tables = ["journal_entries", "photos", "torque_records", "readings", "clips", "measurement_sets", "teardown_steps"] as const;
    return { ...Object.fromEntries(await Promise.all(tables.map(async (t) => [t, await n(t, { job_id: job.id })]))), keys, videoUploads };
  };

  /** The refusal the route answers: code, HTTP status and the words the queued item shows. */
  const refusal = async (work: Promise<unknown>) => {
    const error = await work.then(
      () => null,
      (e: unknown) => e,
    );
    expect(error).toBeInstanceOf(AppError);
    const e = error as AppError;
    return { code: e.code, status: e.status, message: e.message };
  };
  const COLLECTED = {
    code: "conflict",
    status: 409,
    message: "This job was collected, so nothing more can be posted on it. Note anything new on the machine's next job.",
  };

  beforeAll(async () => {
    dir = await mkdtemp(path.join(os.tmpdir(), "benchside-collected-"));
    uploads = await mkdtemp(path.join(os.tmpdir(), "benchside-collected-uploads-"));
    process.env.STORAGE_DIR = uploads;
    fake = await createVideoFake({ port: 0, dir, ...TOKEN });
    Object.assign(process.env, { MUX_TOKEN_ID: TOKEN.tokenId, MUX_TOKEN_SECRET: TOKEN.tokenSecret, MUX_BASE_URL: fake.url, MUX_MAX_RETRIES: "0", APP_URL: "http://localhost:3999" });
    k = testKnex();
    const shop = await makeShop(k, { label: "collected", roles: ["technician"] });
    tech = staffActor(shop, "technician");
    const made = await makeCustomerWithJobs(k, shop.id, { name: "Odile Barrow", statuses: ["ready"] });
    const id = made.jobIds[0]!;
    job = { id, publicId: String((await k("jobs").where({ id }).first("public_id"))!.public_id) };
  }, 30_000);
  afterAll(async () => {
    await fake?.close();
    await k?.destroy();
    if (dir) await rm(dir, { recursive: true, force: true });
    if (uploads) await rm(uploads, { recursive: true, force: true });
  });

  it("while the job is open a post goes in; once collected, a replay of that post still answers as before", async () => {
    const body = { kind: "note" as const, note: note("Chain adjusted before hand-back."), visibility: "shop" as const };
    const key = newKey();
    const send = async () => {
      const found = await access(tech, "job", job.publicId, "journal:post");
      return idempotentRoute(request(job.publicId, "entries", key), tech.userId, body, () => postEntry(tech, found, body));
    };
    const first = (await send()) as { id: number };
    expect(first.id).toBeGreaterThan(0);
    await k("jobs").where({ id: job.id }).update({ status: "picked_up" });
    // Sent before the collection, its answer lost: the retry is told it arrived, not refused.
    const again = await send();
    expect(again).toBeInstanceOf(Response);
    expect(((await (again as Response).json()) as { id: number }).id).toBe(first.id);
  });

  it("a note, a photo (upload and set), a clip, a torque record, a reading, a chain reading, a measurement set and a teardown step are each refused with 409, and nothing is written", async () => {
    expect((await k("jobs").where({ id: job.id }).first("status"))!.status).toBe("picked_up");
    const before = await written();
    const post = await access(tech, "job", job.publicId, "journal:post");
    const bench = await access(tech, "job", job.publicId, "bench:record");
    const keyed = <T>(what: string, body: unknown, work: () => Promise<T>) => idempotentRoute(request(job.publicId, what, newKey()), tech.userId, body, work);

    const noteBody = { kind: "note" as const, note: note("Left a rag in the airbox?"), visibility: "shop" as const };
    expect(await refusal(keyed("entries", noteBody, () => postEntry(tech, post, noteBody)))).toEqual(COLLECTED);

    const jpeg = fs.readFileSync(path.join(__dirname, "../fixtures/photos/gps.jpg"));
    expect(await refusal(uploadPhoto(tech, post, new File([jpeg], "airbox.jpg", { type: "image/jpeg" })))).toEqual(COLLECTED);
    // A set whose photos went up before the collection is refused at the entry too.
    const set = { kind: "photos" as const, photoIds: ["A".repeat(22)], caption: "Airbox", visibility: "shop" as const };
    expect(await refusal(keyed("entries", set, () => postEntry(tech, post, set)))).toEqual(COLLECTED);

    const clip = { name: "idle.mp4", size: 4 * 1024 * 1024, durationSeconds: 8, type: "video/mp4", caption: null, visibility: "shop" as const };
    expect(await refusal(keyed("clips", clip, () => startClipUpload(tech, post, clip)))).toEqual(COLLECTED);

    const torque = torqueRecordSchema.parse({ job: job.publicId, fastener: "Rear axle nut", specValue: "90", unit: "nm" });
    expect(await refusal(keyed("torque-records", torque, () => recordTorque(tech, bench, torque)))).toEqual(COLLECTED);

    const reading = readingSchema.parse({ job: job.publicId, label: "Rear pad", value: "3.1", unit: "mm", min: "1.5" });
    expect(await refusal(keyed("readings", reading, () => recordReading(tech, bench, reading)))).toEqual(COLLECTED);

    const chain = { job: job.publicId, label: "Drive chain", pitchMm: "15.875", pitches: 20, measuredMm: "320", limitPct: "3", source: null };
    expect(await refusal(keyed("chain-readings", chain, () => recordChainReading(tech, bench, chain)))).toEqual(COLLECTED);

    const valves = {
      job: job.publicId,
      kind: "valve_clearance" as const,
      unit: "mm",
      min: "0.10",
      max: "0.20",
      exhaustMin: "0.20",
      exhaustMax: "0.30",
      source: "Maker's service manual",
      note: null,
      rows: [{ row: 0, cylinder: 1, side: "intake" as const, label: "left", value: "0.15", oldShim: null }],
    };
    expect(await refusal(keyed("measurement-sets", valves, () => recordMeasurementSet(tech, bench, valves)))).toEqual(COLLECTED);

    const step = teardownStepSchema.parse({ job: job.publicId, removed: "Airbox lid", count: "4", size: "M6" });
    expect(await refusal(keyed("teardown-steps", step, () => addTeardownStep(tech, bench, step)))).toEqual(COLLECTED);

    expect(await written()).toEqual(before);
  });
});
