// Issue 20 §2: posts replayed by the phone's outbox carry an Idempotency-Key; a replay creates
// nothing new and answers as the first send did; the same key with another body is refused; two
// sends of one key at once write once. Each case runs the route's own code (idempotentRoute
// around the same writer the route calls) against the real MariaDB and, for clips, the video fake.
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
import { readingSchema, torqueRecordSchema } from "@/lib/schemas/bench";
import { statusChangeFields } from "@/lib/schemas/jobs";
import { access } from "@/lib/server/access";
import { recordReading, recordTorque } from "@/lib/server/bench";
import { startClipUpload } from "@/lib/server/clips";
import { IDEMPOTENCY_TTL_MS, idempotentRoute, runIdempotent } from "@/lib/server/idempotency";
import { changeJobStatus, postEntry, uploadPhoto } from "@/lib/server/journal";
import { staffActor } from "../support/authorised-work";
import { testKnex } from "../support/db";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";

const note = (text: string) => ({ type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text }] }] });
const newKey = () => `k-${crypto.randomUUID()}`;
const TOKEN = { tokenId: "idem-test-token", tokenSecret: "idem-test-secret" };

/** A request as the route gets it: its address and, if given, the key header. */
const request = (job: string, what: string, key: string | null) =>
  new Request(`http://localhost/api/jobs/${job}/${what}`, { method: "POST", headers: key ? { "idempotency-key": key } : {} });

/** What the route answers: the first send's result is sent with status 200, a replay is already a Response. */
async function answered(result: unknown) {
  if (result instanceof Response) return { status: result.status, body: (await result.json()) as unknown, replayed: result.headers.get("idempotent-replayed") === "true" };
  return { status: 200, body: JSON.parse(JSON.stringify(result)) as unknown, replayed: false };
}

describe("idempotency keys on the posts the outbox replays", () => {
  let k: Knex;
  let dir: string;
  let uploads: string;
  let fake: VideoFake;
  let shop: Awaited<ReturnType<typeof makeShop>>;
  let tech: Actor;
  let writer: Actor;
  let jobs: { id: number; publicId: string }[];
  const count = (table: "journal_entries" | "torque_records" | "readings" | "clips" | "job_status_changes" | "idempotency_keys", where: Record<string, unknown>) =>
    k(table).where(where).count({ n: "*" }).first().then((r) => Number(r?.n));

  beforeAll(async () => {
    dir = await mkdtemp(path.join(os.tmpdir(), "benchside-idem-"));
    uploads = await mkdtemp(path.join(os.tmpdir(), "benchside-idem-uploads-"));
    process.env.STORAGE_DIR = uploads;
    fake = await createVideoFake({ port: 0, dir, ...TOKEN });
    Object.assign(process.env, { MUX_TOKEN_ID: TOKEN.tokenId, MUX_TOKEN_SECRET: TOKEN.tokenSecret, MUX_BASE_URL: fake.url, MUX_MAX_RETRIES: "0", APP_URL: "http://localhost:3999" });
    k = testKnex();
    shop = await makeShop(k, { label: "idem", roles: ["technician", "service_writer"] });
    tech = staffActor(shop, "technician");
    writer = staffActor(shop, "service_writer");
    const made = await makeCustomerWithJobs(k, shop.id, { name: "Ivo Lark", statuses: ["inspecting", "inspecting", "inspecting"] });
    jobs = await Promise.all(made.jobIds.map(async (id) => ({ id, publicId: String((await k("jobs").where({ id }).first("public_id"))!.public_id) })));
  }, 30_000);
  afterAll(async () => {
    await fake?.close();
    await k?.destroy();
    if (dir) await rm(dir, { recursive: true, force: true });
    if (uploads) await rm(uploads, { recursive: true, force: true });
  });

  const postNote = async (actor: Actor, job: { publicId: string }, key: string | null, text: string) => {
    const body = { kind: "note" as const, note: note(text), visibility: "shop" as const };
    const found = await access(actor, "job", job.publicId, "journal:post");
    return answered(await idempotentRoute(request(job.publicId, "entries", key), actor.userId, body, () => postEntry(actor, found, body)));
  };

  it("a replayed note creates nothing new and answers exactly as the first send", async () => {
    const job = jobs[0]!;
    const key = newKey();
    const before = await count("journal_entries", { job_id: job.id, kind: "note" });
    const first = await postNote(tech, job, key, "Carb bowl drained, varnish in the jet.");
    const again = await postNote(tech, job, key, "Carb bowl drained, varnish in the jet.");
    expect(first.replayed).toBe(false);
    expect(again).toEqual({ ...first, replayed: true });
    expect(await count("journal_entries", { job_id: job.id, kind: "note" })).toBe(before + 1);
    expect(await count("idempotency_keys", { user_id: tech.userId, idem_key: key })).toBe(1);
  });

  it("the same key with another body is refused with 422 and nothing is written", async () => {
    const job = jobs[0]!;
    const key = newKey();
    await postNote(tech, job, key, "Spark plug gap checked.");
    const before = await count("journal_entries", { job_id: job.id, kind: "note" });
    const refused = postNote(tech, job, key, "Spark plug replaced.");
    await expect(refused).rejects.toBeInstanceOf(AppError);
    await expect(refused).rejects.toMatchObject({ code: "invalid", message: expect.stringMatching(/already used for a different post/) });
    // The same key sent to another address is another request too.
    const found = await access(tech, "job", job.publicId, "bench:record");
    const torque = torqueRecordSchema.parse({ job: job.publicId, fastener: "Head bolts", specValue: "10", unit: "nm" });
    await expect(idempotentRoute(request(job.publicId, "torque-records", key), tech.userId, torque, () => recordTorque(tech, found, torque))).rejects.toMatchObject({ code: "invalid" });
    expect(await count("journal_entries", { job_id: job.id, kind: "note" })).toBe(before);
    expect(await count("torque_records", { job_id: job.id })).toBe(0);
  });

  it("two concurrent sends of one key write once and both get the first answer", async () => {
    const job = jobs[1]!;
    const key = newKey();
    const before = await count("journal_entries", { job_id: job.id, kind: "note" });
    const answers = await Promise.all([1, 2, 3].map(() => postNote(tech, job, key, "Compression 120 psi on both cylinders.")));
    expect(await count("journal_entries", { job_id: job.id, kind: "note" })).toBe(before + 1);
    const bodies = answers.map((a) => a.body);
    expect(new Set(bodies.map((b) => JSON.stringify(b))).size).toBe(1);
    expect(answers.filter((a) => !a.replayed)).toHaveLength(1);
  });

  it("keys belong to a person: another staff member's same key is their own post", async () => {
    const job = jobs[1]!;
    const key = newKey();
    const a = await postNote(tech, job, key, "Drive belt worn.");
    const b = await postNote(writer, job, key, "Drive belt worn.");
    expect(b.replayed).toBe(false);
    expect(b.body).not.toEqual(a.body);
  });

  it("a torque record, a reading and a photo set are recorded once per key", async () => {
    const job = jobs[2]!;
    const bench = await access(tech, "job", job.publicId, "bench:record");
    const torque = torqueRecordSchema.parse({ job: job.publicId, fastener: "Flywheel nut", specValue: "60", unit: "nm", share: "on" });
    const torqueKey = newKey();
    const t1 = await answered(await idempotentRoute(request(job.publicId, "torque-records", torqueKey), tech.userId, torque, async () => ({ id: (await recordTorque(tech, bench, torque)).id })));
    const t2 = await answered(await idempotentRoute(request(job.publicId, "torque-records", torqueKey), tech.userId, torque, async () => ({ id: (await recordTorque(tech, bench, torque)).id })));
    expect(t2).toEqual({ ...t1, replayed: true });
    expect(await count("torque_records", { job_id: job.id })).toBe(1);

    const reading = readingSchema.parse({ job: job.publicId, label: "Rotor thickness", value: "4.52", unit: "mm", min: "4.00" });
    const readingKey = newKey();
    const send = async () => answered(await idempotentRoute(request(job.publicId, "readings", readingKey), tech.userId, reading, async () => ({ id: (await recordReading(tech, bench, reading)).id })));
    const r1 = await send();
    expect(await send()).toEqual({ ...r1, replayed: true });
    expect(await count("readings", { job_id: job.id })).toBe(1);

    const post = await access(tech, "job", job.publicId, "journal:post");
    const jpeg = fs.readFileSync(path.join(__dirname, "../fixtures/photos/gps.jpg"));
    const photo = await uploadPhoto(tech, post, new File([jpeg], "idle.jpg", { type: "image/jpeg" }));
    const set = { kind: "photos" as const, photoIds: [photo.id], caption: "Stator", visibility: "shop" as const };
    const setKey = newKey();
    const sendSet = async () => answered(await idempotentRoute(request(job.publicId, "entries", setKey), tech.userId, set, () => postEntry(tech, post, set)));
    const p1 = await sendSet();
    // Without the key the second post is refused ("already posted"); with it, the first answer.
    expect(await sendSet()).toEqual({ ...p1, replayed: true });
    expect(await count("journal_entries", { job_id: job.id, kind: "photos" })).toBe(1);
  });

  it("a status move replayed answers as the first move instead of 'someone moved it'", async () => {
    const job = jobs[2]!;
    const found = await access(writer, "job", job.publicId, "job:change-status");
    const body = statusChangeFields.parse({ from: "inspecting", to: "waiting_parts", note: "" });
    const key = newKey();
    const move = async () => answered(await idempotentRoute(request(job.publicId, "status", key), writer.userId, body, async () => (await changeJobStatus(writer, found, body), { to: body.to })));
    const before = await count("job_status_changes", { job_id: job.id });
    const first = await move();
    expect(first.body).toEqual({ to: "waiting_parts" });
    expect(await move()).toEqual({ ...first, replayed: true });
    expect(await count("job_status_changes", { job_id: job.id })).toBe(before + 1);
    // Without a key the same move again is the conflict it always was.
    await expect(changeJobStatus(writer, found, body)).rejects.toMatchObject({ code: "conflict" });
  });

  it("a clip's upload ticket is made once: a replay gets the same clip and upload URL", async () => {
    const job = jobs[0]!;
    const found = await access(tech, "job", job.publicId, "journal:post");
    const clip = { name: "idle.mp4", size: 20 * 1024 * 1024, durationSeconds: 12, type: "video/mp4", caption: null, visibility: "shop" as const };
    const key = newKey();
    const uploadsBefore = (await (await fetch(`${fake.url}/_fake/status`)).json()) as { uploads: number };
    const answers = await Promise.all([1, 2].map(async () => answered(await idempotentRoute(request(job.publicId, "clips", key), tech.userId, clip, () => startClipUpload(tech, found, clip)))));
    expect(answers[0]!.body).toEqual(answers[1]!.body);
    expect((answers[0]!.body as { uploadUrl: string }).uploadUrl).toMatch(/^http/);
    expect(await count("clips", { job_id: job.id })).toBe(1);
    // The concurrent duplicate waited on the key before calling the video service: one direct upload.
    const uploadsAfter = (await (await fetch(`${fake.url}/_fake/status`)).json()) as { uploads: number };
    expect(uploadsAfter.uploads).toBe(uploadsBefore.uploads + 1);
  });

  it("a failed first send stores no key, so the next send is a fresh attempt", async () => {
    const job = jobs[1]!;
    const key = newKey();
    const found = await access(tech, "job", job.publicId, "bench:record");
    const bad = torqueRecordSchema.parse({ job: job.publicId, fastener: "Axle nut", specValue: "0", unit: "nm" });
    await expect(idempotentRoute(request(job.publicId, "torque-records", key), tech.userId, bad, () => recordTorque(tech, found, bad))).rejects.toBeInstanceOf(AppError);
    expect(await count("idempotency_keys", { user_id: tech.userId, idem_key: key })).toBe(0);
    expect(await count("torque_records", { job_id: job.id })).toBe(0);
  });

  it("keys expire: past the time-to-live the same key runs again", async () => {
    const job = jobs[1]!;
    const key = newKey();
    const later = new Date(Date.now() + IDEMPOTENCY_TTL_MS + 60_000);
    const body = { kind: "note" as const, note: note("Fuel petcock rebuilt."), visibility: "shop" as const };
    const found = await access(tech, "job", job.publicId, "journal:post");
    const req = { userId: tech.userId, key, method: "POST", path: `/api/jobs/${job.publicId}/entries`, body };
    const first = await runIdempotent(req, () => postEntry(tech, found, body));
    expect((await runIdempotent(req, () => postEntry(tech, found, body))).replayed).toBe(true);
    const afterExpiry = await runIdempotent(req, () => postEntry(tech, found, body), () => later);
    expect(afterExpiry.replayed).toBe(false);
    expect(afterExpiry.body.id).not.toBe(first.body.id);
  });

  it("a malformed key is refused with 422 before anything runs", async () => {
    const job = jobs[1]!;
    let ran = false;
    const req = new Request(`http://localhost/api/jobs/${job.publicId}/entries`, { method: "POST", headers: { "idempotency-key": "short" } });
    await expect(idempotentRoute(req, tech.userId, {}, async () => (ran = true))).rejects.toMatchObject({ code: "invalid" });
    expect(ran).toBe(false);
  });
});
