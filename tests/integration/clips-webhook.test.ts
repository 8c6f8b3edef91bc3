import crypto from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { createClipEntry } from "@/db/queries/clips";
import { listTimeline } from "@/db/queries/journal";
import { receiveVideoWebhook } from "@/lib/server/clips";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";

const SECRET = "whsec-clips-test";

/** Signs a body the way the hosted video service does: `t=<unix s>,v1=<hex HMAC-SHA256 of "t.body">`. */
function sign(body: string, at = Math.floor(Date.now() / 1000), secret = SECRET) {
  const v1 = crypto.createHmac("sha256", secret).update(`${at}.${body}`).digest("hex");
  return new Headers({ "mux-signature": `t=${at},v1=${v1}`, "content-type": "application/json" });
}

describe("video webhooks", () => {
  let k: Knex;
  let shopId: number;
  let jobId: number;
  let entryId: number;
  let techId: number;
  const uploadId = `up_${crypto.randomBytes(6).toString("hex")}`;
  const assetId = `as_${crypto.randomBytes(6).toString("hex")}`;

  beforeAll(async () => {
    process.env.MUX_WEBHOOK_SECRET = SECRET;
    process.env.MUX_TOKEN_ID ??= "test-token";
    process.env.MUX_TOKEN_SECRET ??= "test-secret";
    process.env.VIDEO_PLAYBACK_URL = "http://127.0.0.1:1/media/{id}/video.mp4";
    process.env.VIDEO_POSTER_URL = "http://127.0.0.1:1/media/{id}/poster.jpg";
    k = testKnex();
    const shop = await makeShop(k, { label: "clips", roles: ["technician"] });
    shopId = shop.id;
    techId = shop.staff.technician!.id;
    jobId = (await makeCustomerWithJobs(k, shopId, { name: "Cass Bel", statuses: ["inspecting"] })).jobIds[0]!;
    ({ entryId } = await createClipEntry({
      shopId,
      jobId,
      userId: techId,
      uploadId,
      publicId: crypto.randomBytes(16).toString("base64url").slice(0, 22),
      name: "idle.mp4",
      bytes: 1000,
      caption: "Idle rattle",
      visibility: "shop",
    }));
  });
  afterAll(async () => k?.destroy());

  const clip = async () => (await listTimeline({ shopId, jobId, audience: "shop", order: "desc", limit: 10 })).entries.find((e) => e.id === entryId)?.clip;

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

  it("an errored asset carries the reason to the timeline", async () => {
    const other = `up_${crypto.randomBytes(6).toString("hex")}`;
    const { entryId: id } = await createClipEntry({ shopId, jobId, userId: techId, uploadId: other, publicId: crypto.randomBytes(16).toString("base64url").slice(0, 22), name: null, bytes: 10, caption: null, visibility: "shop" });
    const body = JSON.stringify({ id: `evt-${other}`, type: "video.asset.errored", data: { id: "as_broken", upload_id: other, errors: { type: "invalid_input", messages: ["The file is not a decodable video."] } } });
    await receiveVideoWebhook(body, sign(body));
    const entry = (await listTimeline({ shopId, jobId, audience: "shop", order: "desc", limit: 10 })).entries.find((e) => e.id === id);
    expect(entry?.clip).toMatchObject({ status: "errored", error: "The file is not a decodable video.", src: null });
  });
});
