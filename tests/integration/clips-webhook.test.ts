import crypto from "node:crypto";
import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { putUploadChunk, waitForWebhook } from "../../fakes/video/client";
import { createVideoFake, type VideoFake } from "../../fakes/video/server";
import { createClipEntry, listFailedClips } from "@/db/queries/clips";
import { listTimeline } from "@/db/queries/journal";
import { access } from "@/lib/server/access";
import { readWebhookBody } from "@/lib/server/body-limit";
import { clearFailedClipOfJob, receiveVideoWebhook, startClipUpload } from "@/lib/server/clips";
import { mux } from "@/lib/server/video";
import { staffActor } from "../support/authorised-work";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";
import { type NextLikeServer, sendStreamed, startNextLikeServer } from "../support/next-like-server";

const SECRET = "whsec-clips-test";
const TOKEN = { tokenId: "clips-test-token", tokenSecret: "clips-test-secret" };

/** Signs a body the way the hosted video service does: `t=<unix s>,v1=<hex HMAC-SHA256 of "t.body">`. */
function sign(body: string, at = Math.floor(Date.now() / 1000), secret = SECRET) {
  const v1 = crypto.createHmac("sha256", secret).update(`${at}.${body}`).digest("hex");
  return new Headers({ "mux-signature": `t=${at},v1=${v1}`, "content-type": "application/json" });
}

const newId = () => crypto.randomBytes(16).toString("base64url").slice(0, 22);

describe("video webhooks", () => {
  let k: Knex;
  let dir: string;
  let fake: VideoFake;
  let app: NextLikeServer;
  let shop: Awaited<ReturnType<typeof makeShop>>;
  let jobId: number;
  let jobPublicId: string;
  let entryId: number;
  const uploadId = `up_${crypto.randomBytes(6).toString("hex")}`;
  const assetId = `as_${crypto.randomBytes(6).toString("hex")}`;

  beforeAll(async () => {
    dir = await mkdtemp(path.join(os.tmpdir(), "benchside-clips-webhook-"));
    // The app's webhook route, in-process: the body capped as it is read, then the real handler.
    app = await startNextLikeServer(async (req) => receiveVideoWebhook(await readWebhookBody(req), req.headers), { closeOnRefusal: true });
    fake = await createVideoFake({ port: 0, dir, ...TOKEN, webhookUrl: `${app.url}/api/webhooks/video`, webhookSecret: SECRET, webhookRetryBaseMs: 100, webhookMaxAttempts: 3 });
    Object.assign(process.env, {
      MUX_WEBHOOK_SECRET: SECRET,
      MUX_TOKEN_ID: TOKEN.tokenId,
      MUX_TOKEN_SECRET: TOKEN.tokenSecret,
      MUX_BASE_URL: fake.url,
      MUX_MAX_RETRIES: "0",
      APP_URL: "http://localhost:3999",
      VIDEO_PLAYBACK_URL: `${fake.url}/media/{id}/video.mp4`,
      VIDEO_POSTER_URL: `${fake.url}/media/{id}/poster.jpg`,
    });
    k = testKnex();
    shop = await makeShop(k, { label: "clips", roles: ["technician"] });
    const made = await makeCustomerWithJobs(k, shop.id, { name: "Cass Bel", statuses: ["inspecting"] });
    jobId = made.jobIds[0]!;
    jobPublicId = (await k("jobs").where({ id: jobId }).first("public_id"))!.public_id;
    ({ entryId } = await createClip(uploadId, "Idle rattle"));
  }, 30_000);
  afterAll(async () => {
    await fake?.close();
    await app?.close();
    await k?.destroy();
    if (dir) await rm(dir, { recursive: true, force: true });
  });

  const createClip = (upload: string, caption: string | null = null) =>
    createClipEntry({ shopId: shop.id, jobId, userId: shop.staff.technician!.id, uploadId: upload, publicId: newId(), name: "idle.mp4", bytes: 1000, caption, visibility: "shop" });
  const timeline = async () => (await listTimeline({ shopId: shop.id, jobId, audience: "shop", order: "desc", limit: 50 })).entries;
  const clip = async () => (await timeline()).find((e) => e.id === entryId)?.clip;
  const tables = async () => ({
    events: Number((await k("video_webhook_events").count({ n: "*" }).first())?.n),
    clips: await k("clips").where({ job_id: jobId }).orderBy("id").select("id", "status", "entry_id", "error"),
    entries: Number((await k("journal_entries").where({ job_id: jobId }).count({ n: "*" }).first())?.n),
  });

  it("refuses a wrong, missing or stale signature (401) and changes nothing", async () => {
    const body = JSON.stringify({ id: "evt-bad", type: "video.upload.asset_created", data: { id: uploadId, asset_id: assetId } });
    await expect(receiveVideoWebhook(body, sign(body, undefined, "not-the-secret"))).rejects.toMatchObject({ code: "unauthenticated" });
    await expect(receiveVideoWebhook(body, new Headers())).rejects.toMatchObject({ code: "unauthenticated" });
    // SDK-NOTES / the service's docs: deliveries older than 300 s are refused.
    await expect(receiveVideoWebhook(body, sign(body, Math.floor(Date.now() / 1000) - 600))).rejects.toMatchObject({ code: "unauthenticated" });
    // Altered after signing.
    const headers = sign(body);
    await expect(receiveVideoWebhook(body.replace(assetId, "as_other"), headers)).rejects.toMatchObject({ code: "unauthenticated" });
    expect((await clip())?.status).toBe("uploading");
    expect(await k("video_webhook_events").where({ event_id: "evt-bad" })).toHaveLength(0);
  });

  it("acknowledges a signed body it can't use and writes nothing (a 5xx would be retried forever)", async () => {
    const before = await tables();
    const unusable = [
      "{}",
      "not json at all",
      JSON.stringify({ id: 42, type: ["video.asset.ready"], data: "ready" }),
      JSON.stringify({ id: "evt-wrong-types", type: "video.asset.ready", data: { id: assetId, duration: "long", playback_ids: "pb" } }),
      JSON.stringify({ id: "evt-unknown-type", type: "video.asset.static_renditions.ready", data: { id: assetId } }),
    ];
    for (const body of unusable) {
      const answer = await receiveVideoWebhook(body, sign(body));
      expect(answer, body).toMatchObject({ applied: false, ignored: expect.any(String) });
    }
    expect(await tables()).toEqual(before);
    // Through the route's path too: answered 200, never a 5xx.
    for (const body of unusable) {
      const res = await sendStreamed(`${app.url}/api/webhooks/video`, { total: 0, prefix: Buffer.from(body), headers: Object.fromEntries(sign(body)) });
      expect(res.status, body).toBe(200);
    }
    expect(await tables()).toEqual(before);
  });

  it("refuses a forged 5 MB body fast, reading no more than the 1 MB cap", async () => {
    const before = app.records.length;
    const chunked = await sendStreamed(`${app.url}/api/webhooks/video`, { total: 5 * 1024 * 1024, headers: { "content-type": "application/json", "mux-signature": "t=1,v1=00" } });
    expect(chunked.status).toBe(413);
    expect(app.records[before]!.consumed).toBeLessThan(1024 * 1024 + 256 * 1024);
    expect(chunked.ms).toBeLessThan(1000);
    const declared = await sendStreamed(`${app.url}/api/webhooks/video`, { total: 5 * 1024 * 1024, headers: { "content-type": "application/json", "content-length": String(5 * 1024 * 1024) } });
    expect(declared.status).toBe(413);
    expect(app.records[before + 1]!.consumed).toBe(0);
  });

  it("applies each event once: a redelivery changes nothing", async () => {
    const created = JSON.stringify({ id: `evt-${uploadId}-1`, type: "video.upload.asset_created", data: { id: uploadId, asset_id: assetId } });
    expect(await receiveVideoWebhook(created, sign(created))).toEqual({ applied: true });
    expect((await clip())?.status).toBe("processing");

    const ready = JSON.stringify({
      id: `evt-${uploadId}-2`,
      type: "video.asset.ready",
      data: { id: assetId, upload_id: uploadId, status: "ready", duration: 12.5, aspect_ratio: "16:9", playback_ids: [{ id: "pb123", policy: "public" }] },
    });
    expect(await receiveVideoWebhook(ready, sign(ready))).toEqual({ applied: true });
    const readyClip = await clip();
    // Played through the app's own route, which checks who is asking (never the service's address).
    expect(readyClip).toMatchObject({ status: "ready", durationSeconds: 12.5, aspectRatio: "16:9", src: `/api/clips/${readyClip?.id}/video.mp4` });

    // The same asset_created again (a retry after a lost answer): still ready, nothing moves back.
    expect(await receiveVideoWebhook(created, sign(created))).toEqual({ applied: false });
    expect((await clip())?.status).toBe("ready");
    expect(await k("video_webhook_events").where({ event_id: `evt-${uploadId}-1` })).toHaveLength(1);
  });

  it("a clip the service turns down leaves the timeline and stays only as a failed upload staff can clear", async () => {
    const cases = [
      { type: "video.asset.errored", data: (up: string) => ({ id: `as_${up}`, upload_id: up, errors: { type: "invalid_input", messages: ["The file is not a decodable video."] } }), reason: "The file is not a decodable video." },
      { type: "video.upload.errored", data: (up: string) => ({ id: up, error: { type: "invalid_input", message: "The upload could not be read." } }), reason: "The upload could not be read." },
      { type: "video.upload.cancelled", data: (up: string) => ({ id: up }), reason: "The upload was cancelled before it finished; send the clip again." },
    ];
    const technician = staffActor(shop, "technician");
    const job = await access(technician, "job", jobPublicId, "journal:post");
    for (const c of cases) {
      const upload = `up_${crypto.randomBytes(6).toString("hex")}`;
      const { entryId: id } = await createClip(upload);
      await k("journal_entries").where({ id }).update({ visibility: "shared" });
      const body = JSON.stringify({ id: `evt-${upload}`, type: c.type, data: c.data(upload) });
      expect(await receiveVideoWebhook(body, sign(body))).toEqual({ applied: true });
      // No entry, no history, no digest notice left; the row keeps the reason, without an entry.
      expect((await timeline()).some((e) => e.id === id)).toBe(false);
      expect(await k("journal_entries").where({ id })).toHaveLength(0);
      expect(await k("job_update_queue").where({ entry_id: id })).toHaveLength(0);
      const failed = (await listFailedClips({ shopId: shop.id, jobId })).find((f) => f.error === c.reason);
      expect(failed, c.type).toMatchObject({ name: "idle.mp4", error: c.reason });
      await expect(clearFailedClipOfJob(job, failed!.id)).resolves.toEqual({ cleared: failed!.id });
      await expect(clearFailedClipOfJob(job, failed!.id)).rejects.toMatchObject({ code: "not_found" });
    }
    // A clip on the timeline is not a failed upload: it can't be cleared this way.
    const onTimeline = (await k("clips").where({ entry_id: entryId }).first("public_id"))!.public_id;
    await expect(clearFailedClipOfJob(job, onTimeline)).rejects.toMatchObject({ code: "not_found" });
  });

  it("a clip longer than the shop allows once processed is turned down too", async () => {
    await k("shops").where({ id: shop.id }).update({ clip_max_seconds: 60 });
    const upload = `up_${crypto.randomBytes(6).toString("hex")}`;
    const { entryId: id } = await createClip(upload);
    const body = JSON.stringify({ id: `evt-${upload}-ready`, type: "video.asset.ready", data: { id: `as_${upload}`, upload_id: upload, duration: 75, playback_ids: [{ id: "pb-long", policy: "public" }] } });
    await receiveVideoWebhook(body, sign(body));
    expect(await k("journal_entries").where({ id })).toHaveLength(0);
    expect(await k("clips").where({ upload_id: upload }).first("status", "entry_id", "playback_id")).toEqual({ status: "errored", entry_id: null, playback_id: null });
    expect((await listFailedClips({ shopId: shop.id, jobId }))[0]?.error).toMatch(/1:15/);
  });

  it("garbage sent to the video fake ends with no entry, a failed upload with the reason, and the asset deleted", async () => {
    await k("shops").where({ id: shop.id }).update({ clip_max_seconds: 600 });
    const technician = staffActor(shop, "technician");
    const job = await access(technician, "job", jobPublicId, "journal:post");
    const garbage = Buffer.from("this is a parts list, not a video\n".repeat(50));
    const started = await startClipUpload(technician, job, { name: "parts-list.mp4", size: garbage.length, caption: null, visibility: "shop", durationSeconds: undefined, type: "video/mp4" });
    expect((await timeline()).some((e) => e.id === started.entryId)).toBe(true);
    expect((await putUploadChunk(started.uploadUrl, garbage, 0, garbage.length - 1, garbage.length)).status).toBe(200);
    const row = async () => k("clips").where({ public_id: started.clipId }).first("status", "entry_id", "asset_id", "error");
    await expect.poll(async () => (await row())?.status, { timeout: 30_000 }).toBe("errored");
    const failed = (await row())!;
    expect(failed).toMatchObject({ entry_id: null, error: expect.stringMatching(/not a decodable video/) });
    const failedAsset = failed.asset_id!;
    expect((await timeline()).some((e) => e.id === started.entryId)).toBe(false);
    // Deleted at the service as well: the fake confirms with its own webhook, and the asset is gone.
    await waitForWebhook(fake.url, { type: "video.asset.deleted", objectId: failedAsset });
    await expect(mux().video.assets.retrieve(failedAsset)).rejects.toMatchObject({ status: 404 });
    // That confirmation doesn't hide the failed upload from staff.
    expect((await listFailedClips({ shopId: shop.id, jobId })).map((f) => f.id)).toContain(started.clipId);
  }, 60_000);
});
