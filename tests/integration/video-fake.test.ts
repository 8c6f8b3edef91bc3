// Drives fakes/video with the official @mux/mux-node SDK and upchunk-style chunked PUTs, so the fake stays
// honest about the API, upload protocol, webhook signatures and media serving the app relies on.
import { execFile } from "node:child_process";
import { mkdtemp, readFile, rm, writeFile } from "node:fs/promises";
import http from "node:http";
import os from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import Mux, { AuthenticationError, InternalServerError, NotFoundError, RateLimitError } from "@mux/mux-node";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  askUploadOffset as askOffset,
  delayProcessing,
  dropWebhooks,
  failNextApiCalls,
  failNextChunks,
  listWebhookDeliveries,
  mediaUrls,
  putUploadChunk as putChunk,
  waitForWebhook,
} from "../../fakes/video/client";
import { createVideoFake, type VideoFake } from "../../fakes/video/server";
import type { MuxAsset } from "../../fakes/video/types";

const run = promisify(execFile);
const KIB256 = 256 * 1024;
const TOKEN = { tokenId: "bench-token-id", tokenSecret: "bench-token-secret" };
const SECRET = "bench-webhook-secret";

type Received = { raw: string; headers: http.IncomingHttpHeaders; event: { id: string; type: string; data: { id: string; asset_id?: string; status: string }; attempts: unknown[] } };

/** A stand-in for the app's webhook route: records every request; can answer 500 to chosen event types. */
async function startReceiver() {
  const received: Received[] = [];
  const failures = new Map<string, number>();
  const server = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", () => {
      const raw = Buffer.concat(chunks).toString("utf8");
      const event = JSON.parse(raw) as Received["event"];
      received.push({ raw, headers: req.headers, event });
      const left = failures.get(event.type) ?? 0;
      failures.set(event.type, Math.max(0, left - 1));
      res.writeHead(left > 0 ? 500 : 200).end(left > 0 ? "not now" : "ok");
    });
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const { port } = server.address() as { port: number };
  const waitFor = async (match: (r: Received) => boolean, count = 1, timeoutMs = 45_000) => {
    const deadline = Date.now() + timeoutMs;
    while (received.filter(match).length < count) {
      if (Date.now() > deadline) throw new Error(`webhook receiver: expected ${count} matching events, got ${received.filter(match).length}`);
      await new Promise((r) => setTimeout(r, 50));
    }
    return received.filter(match);
  };
  return { url: `http://127.0.0.1:${port}/api/webhooks/video`, received, failures, waitFor, close: () => new Promise<void>((r) => server.close(() => r())) };
}

/** Sends part of a chunk and then cuts the connection, as a phone losing signal would. */
async function dropMidChunk(url: string, bytes: Buffer, start: number, end: number) {
  const req = http.request(url, { method: "PUT", headers: { "content-type": "video/mp4", "content-range": `bytes ${start}-${end}/${bytes.length}`, "content-length": end - start + 1 } });
  req.on("error", () => undefined);
  req.write(bytes.subarray(start, start + 100 * 1024));
  await new Promise((r) => setTimeout(r, 300));
  req.destroy();
}

async function waitForAsset(mux: Mux, id: string, timeoutMs = 45_000): Promise<MuxAsset> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const asset = (await mux.video.assets.retrieve(id)) as unknown as MuxAsset;
    if (asset.status !== "preparing") return asset;
    if (Date.now() > deadline) throw new Error(`asset ${id} still preparing after ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

describe("video fake with the @mux/mux-node SDK", () => {
  let dir: string;
  let fake: VideoFake;
  let mux: Mux;
  let receiver: Awaited<ReturnType<typeof startReceiver>>;
  let clip: Buffer;
  let clipDuration: number;
  let uploadId: string;
  let assetId: string;

  beforeAll(async () => {
    dir = await mkdtemp(path.join(os.tmpdir(), "benchside-video-fake-"));
    const clipPath = path.join(dir, "clip.mp4");
    // Constant 4 Mbit/s so the 2-s clip (about 1 MB) spans several 256 KiB chunks.
    await run("ffmpeg", ["-v", "error", "-f", "lavfi", "-i", "testsrc=duration=2:size=320x240:rate=25", "-f", "lavfi", "-i", "sine=duration=2",
      "-c:v", "libx264", "-b:v", "4M", "-minrate", "4M", "-maxrate", "4M", "-bufsize", "1M", "-x264-params", "nal-hrd=cbr", "-pix_fmt", "yuv420p",
      "-c:a", "aac", "-shortest", "-y", clipPath]);
    clip = await readFile(clipPath);
    const probed = await run("ffprobe", ["-v", "error", "-show_entries", "format=duration", "-of", "csv=p=0", clipPath]);
    clipDuration = Number(probed.stdout.trim());
    receiver = await startReceiver();
    fake = await createVideoFake({ port: 0, dir: path.join(dir, "state"), ...TOKEN, webhookUrl: receiver.url, webhookSecret: SECRET, webhookRetryBaseMs: 200, webhookMaxAttempts: 5 });
    mux = new Mux({ ...TOKEN, baseURL: fake.url, maxRetries: 0 });
  }, 60_000);

  afterAll(async () => {
    await fake?.close();
    await receiver?.close();
    if (dir) await rm(dir, { recursive: true, force: true });
  });

  it("creates a direct upload whose URL answers the CORS preflight for the upload's origin", async () => {
    expect(clip.length).toBeGreaterThan(3 * KIB256);
    const upload = await mux.video.uploads.create({ cors_origin: "http://localhost:3000/", new_asset_settings: { playback_policies: ["public"], passthrough: "job-17-clip-1" } });
    uploadId = upload.id;
    expect(upload).toMatchObject({ status: "waiting", cors_origin: "http://localhost:3000/", timeout: 3600 });
    expect(upload.url?.startsWith(`${fake.url}/upload/${upload.id}?token=`)).toBe(true);
    expect((await mux.video.uploads.retrieve(upload.id)).url).toBe(upload.url);

    const preflight = await fetch(upload.url ?? "", { method: "OPTIONS", headers: { origin: "http://localhost:3000", "access-control-request-method": "PUT", "access-control-request-headers": "content-type,content-range" } });
    expect(preflight.status).toBe(204);
    expect(preflight.headers.get("access-control-allow-origin")).toBe("http://localhost:3000");
    expect(preflight.headers.get("access-control-allow-methods")).toContain("PUT");
    expect(preflight.headers.get("access-control-allow-headers")).toBe("content-type, content-range");
    expect(preflight.headers.get("access-control-expose-headers")).toBe("Range");
  });

  it("takes chunks with Content-Range, survives a dropped connection and resumes from where it got to", async () => {
    const { url = "" } = await mux.video.uploads.retrieve(uploadId);
    const total = clip.length;
    expect(await putChunk(url, clip, 0, KIB256 - 1, total)).toEqual({ status: 308, range: `bytes=0-${KIB256 - 1}` });
    expect((await putChunk(url, clip, 0, 1000, total)).status).toBe(400); // a non-final chunk must be whole 256 KiB

    await dropMidChunk(url, clip, KIB256, 2 * KIB256 - 1);
    const asked = await askOffset(url, total);
    expect(asked.status).toBe(308);
    const got = Number(/^bytes=0-(\d+)$/.exec(asked.range ?? "")?.[1]);
    expect(got).toBeGreaterThanOrEqual(KIB256 - 1);
    expect(got).toBeLessThan(KIB256 + 100 * 1024);
    expect((await putChunk(url, clip, got + 2, got + 1 + KIB256, total)).status).toBe(400); // a gap is refused

    // Carry on from the reported offset, then repeat an earlier chunk the way upchunk retries one: both are accepted.
    expect(await putChunk(url, clip, got + 1, got + KIB256, total)).toEqual({ status: 308, range: `bytes=0-${got + KIB256}` });
    const repeated = await putChunk(url, clip, KIB256, 2 * KIB256 - 1, total);
    const held = Math.max(got + KIB256, 2 * KIB256 - 1);
    expect(repeated).toEqual({ status: 308, range: `bytes=0-${held}` });

    await delayProcessing(fake.url, 1500);
    expect((await putChunk(url, clip, held + 1, total - 1, total)).status).toBe(200);
    const done = await mux.video.uploads.retrieve(uploadId);
    expect(done.status).toBe("asset_created");
    assetId = done.asset_id ?? "";
    expect((await mux.video.assets.retrieve(assetId)).status).toBe("preparing");
    // The bytes on disk are exactly the file, despite the drop and the repeat.
    expect((await readFile(path.join(dir, "state", "uploads", `${uploadId}.upload`))).equals(clip)).toBe(true);
    await delayProcessing(fake.url, 0);
  }, 30_000);

  it("processes the clip to ready with ffprobe's duration, its aspect ratio and a public playback id", async () => {
    const asset = await waitForAsset(mux, assetId);
    expect(asset.status).toBe("ready");
    expect(Math.abs((asset.duration ?? 0) - clipDuration)).toBeLessThanOrEqual(0.1);
    expect(asset.aspect_ratio).toBe("4:3");
    expect(asset).toMatchObject({ upload_id: uploadId, passthrough: "job-17-clip-1", max_stored_resolution: "SD", progress: { state: "completed", progress: 100 } });
    expect(asset.playback_ids).toEqual([{ id: expect.stringMatching(/^[A-Za-z0-9]{32}$/), policy: "public" }]);
    expect(asset.tracks?.map((t) => t.type)).toEqual(["video", "audio"]);
    expect(asset.tracks?.[0]).toMatchObject({ max_width: 320, max_height: 240 });
  }, 60_000);

  it("serves the poster and a web-playable MP4 with CORS and byte ranges", async () => {
    const asset = (await mux.video.assets.retrieve(assetId)) as unknown as MuxAsset;
    const { src, poster } = mediaUrls(fake.url, asset.playback_ids[0]?.id ?? "");
    const image = await fetch(poster);
    expect(image.status).toBe(200);
    expect(image.headers.get("content-type")).toBe("image/jpeg");
    expect(image.headers.get("access-control-allow-origin")).toBe("*");
    expect([...new Uint8Array(await image.arrayBuffer()).subarray(0, 3)]).toEqual([0xff, 0xd8, 0xff]);

    const whole = Buffer.from(await (await fetch(src)).arrayBuffer());
    const part = await fetch(src, { headers: { range: "bytes=0-99" } });
    expect(part.status).toBe(206);
    expect(part.headers.get("content-range")).toBe(`bytes 0-99/${whole.length}`);
    expect(part.headers.get("access-control-allow-origin")).toBe("*");
    const head = Buffer.from(await part.arrayBuffer());
    expect(head.equals(whole.subarray(0, 100))).toBe(true);
    expect(head.subarray(4, 8).toString("latin1")).toBe("ftyp");
    const past = await fetch(src, { headers: { range: `bytes=${whole.length}-` } });
    expect(past.status).toBe(416);
    expect(past.headers.get("content-range")).toBe(`bytes */${whole.length}`);
    // +faststart puts the index before the media data, so playback starts before the download ends.
    expect(whole.indexOf("moov")).toBeLessThan(whole.indexOf("mdat"));

    const saved = path.join(dir, "rendition.mp4");
    await writeFile(saved, whole);
    const { stdout } = await run("ffprobe", ["-v", "error", "-show_entries", "stream=codec_name,width,height", "-of", "csv=p=0", saved]);
    expect(stdout.trim().split("\n")).toEqual(["h264,320,240", "aac"]);
  });

  it("sends asset_created and ready webhooks that mux.webhooks.unwrap accepts", async () => {
    const [created] = await receiver.waitFor((r) => r.event.type === "video.upload.asset_created" && r.event.data.id === uploadId);
    const [ready] = await receiver.waitFor((r) => r.event.type === "video.asset.ready" && r.event.data.id === assetId);
    expect(created?.event.data.asset_id).toBe(assetId);
    expect(ready?.event.data.status).toBe("ready");
    for (const hit of [created, ready]) {
      if (!hit) throw new Error("missing webhook");
      expect(hit.headers["mux-signature"]).toMatch(/^t=\d+,v1=[0-9a-f]{64}$/);
      const event = await mux.webhooks.unwrap(hit.raw, hit.headers as Record<string, string>, SECRET);
      expect(event.id).toBe(hit.event.id);
      await expect(mux.webhooks.unwrap(hit.raw.replace('"status"', '"Status"'), hit.headers as Record<string, string>, SECRET)).rejects.toThrow(/signature/i);
      await expect(mux.webhooks.unwrap(hit.raw, hit.headers as Record<string, string>, "another-secret")).rejects.toThrow(/signature/i);
    }
  });

  it("marks a file that is not a video as errored with the reason", async () => {
    const upload = await mux.video.uploads.create({ cors_origin: "*", new_asset_settings: { playback_policies: ["public"] } });
    const notes = Buffer.from("Torque notes, not a video.\n".repeat(200));
    expect((await putChunk(upload.url ?? "", notes, 0, notes.length - 1, notes.length)).status).toBe(200);
    const id = (await mux.video.uploads.retrieve(upload.id)).asset_id ?? "";
    const asset = await waitForAsset(mux, id);
    expect(asset.status).toBe("errored");
    expect(asset.errors?.type).toBe("invalid_input");
    expect(asset.errors?.messages[0]).toMatch(/not a decodable video/);
    await receiver.waitFor((r) => r.event.type === "video.asset.errored" && r.event.data.id === id);
  }, 30_000);

  it("turns a rotated 1080p phone clip into a 720×1280 portrait rendition", async () => {
    const raw = path.join(dir, "landscape.mp4");
    const phone = path.join(dir, "phone.mp4");
    await run("ffmpeg", ["-v", "error", "-f", "lavfi", "-i", "testsrc=duration=1:size=1920x1080:rate=25", "-c:v", "libx264", "-preset", "ultrafast", "-y", raw]);
    // Phones store the sensor's landscape frames plus a 90° display rotation.
    await run("ffmpeg", ["-v", "error", "-i", raw, "-c", "copy", "-metadata:s:v:0", "rotate=90", "-y", phone]);
    const bytes = await readFile(phone);
    const upload = await mux.video.uploads.create({ cors_origin: "*", new_asset_settings: { playback_policies: ["public"] } });
    expect((await putChunk(upload.url ?? "", bytes, 0, bytes.length - 1, bytes.length)).status).toBe(200);
    const asset = await waitForAsset(mux, (await mux.video.uploads.retrieve(upload.id)).asset_id ?? "");
    expect(asset).toMatchObject({ status: "ready", aspect_ratio: "9:16", max_stored_resolution: "HD" });
    expect(asset.tracks).toEqual([expect.objectContaining({ type: "video", max_width: 720, max_height: 1280 })]);

    // The SDK pages assets by cursor; one per page walks all three, newest first.
    const listed: string[] = [];
    for await (const item of mux.video.assets.list({ limit: 1 })) listed.push(item.id);
    expect(listed).toHaveLength(3);
    expect(listed[0]).toBe(asset.id);
    expect(listed[2]).toBe(assetId);
  }, 60_000);

  it("throws the SDK's AuthenticationError for bad credentials and NotFoundError for unknown ids", async () => {
    const wrong = new Mux({ tokenId: TOKEN.tokenId, tokenSecret: "not-the-secret", baseURL: fake.url, maxRetries: 0 });
    const error = await wrong.video.uploads.create({ cors_origin: "*" }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(AuthenticationError);
    expect((error as AuthenticationError).error).toEqual({ error: { type: "unauthorized", messages: ["Unauthorized request"] } });
    await expect(mux.video.assets.retrieve("NoSuchAsset")).rejects.toBeInstanceOf(NotFoundError);
  });

  it("fails exactly the next N API calls when told to, then recovers", async () => {
    await failNextApiCalls(fake.url, 2, 500);
    await expect(mux.video.assets.retrieve(assetId)).rejects.toBeInstanceOf(InternalServerError);
    await expect(mux.video.uploads.retrieve(uploadId)).rejects.toBeInstanceOf(InternalServerError);
    expect((await mux.video.assets.retrieve(assetId)).id).toBe(assetId);
    await failNextApiCalls(fake.url, 1, 429);
    await expect(mux.video.assets.retrieve(assetId)).rejects.toBeInstanceOf(RateLimitError);
    expect((await mux.video.assets.retrieve(assetId)).id).toBe(assetId);
  });

  it("redelivers a webhook the app answered with 500, with the same event id, and deletes the asset", async () => {
    receiver.failures.set("video.asset.deleted", 2);
    const { playback_ids } = (await mux.video.assets.retrieve(assetId)) as unknown as MuxAsset;
    await mux.video.assets.delete(assetId);
    const hits = await receiver.waitFor((r) => r.event.type === "video.asset.deleted" && r.event.data.id === assetId, 3, 15_000);
    expect(new Set(hits.map((h) => h.event.id)).size).toBe(1);
    expect(hits.map((h) => h.event.attempts.length)).toEqual([0, 1, 2]);
    for (const hit of hits) await mux.webhooks.unwrap(hit.raw, hit.headers as Record<string, string>, SECRET);
    const delivery = await waitForWebhook(fake.url, { type: "video.asset.deleted", objectId: assetId, state: "delivered" });
    expect(delivery.attempts.map((a) => a.status)).toEqual([500, 500, 200]);
    await expect(mux.video.assets.retrieve(assetId)).rejects.toBeInstanceOf(NotFoundError);
    expect((await fetch(mediaUrls(fake.url, playback_ids[0]?.id ?? "").src)).status).toBe(404);
  }, 30_000);

  it("fails or cuts off a chunk when told to, and records but does not send webhooks while dropping", async () => {
    const upload = await mux.video.uploads.create({ cors_origin: "*" });
    await failNextChunks(fake.url, 1, { status: 503 });
    expect((await putChunk(upload.url ?? "", clip, 0, KIB256 - 1, clip.length)).status).toBe(503);
    expect((await putChunk(upload.url ?? "", clip, 0, KIB256 - 1, clip.length)).status).toBe(308);
    await failNextChunks(fake.url, 1, { drop: true });
    await expect(putChunk(upload.url ?? "", clip, KIB256, 2 * KIB256 - 1, clip.length)).rejects.toThrow();
    const after = await askOffset(upload.url ?? "", clip.length);
    expect(after.status).toBe(308);
    expect(Number(/^bytes=0-(\d+)$/.exec(after.range ?? "")?.[1])).toBeLessThan(2 * KIB256 - 1);

    await dropWebhooks(fake.url, true);
    expect((await mux.video.uploads.cancel(upload.id)).status).toBe("cancelled");
    expect((await putChunk(upload.url ?? "", clip, KIB256, 2 * KIB256 - 1, clip.length)).status).toBe(410);
    const [dropped] = await listWebhookDeliveries(fake.url, { type: "video.upload.cancelled", objectId: upload.id });
    expect(dropped?.state).toBe("dropped");
    await new Promise((r) => setTimeout(r, 300));
    expect(receiver.received.some((r) => r.event.type === "video.upload.cancelled")).toBe(false);
    await dropWebhooks(fake.url, false);
  });
});

describe("video fake persistence", () => {
  it("keeps an unfinished upload's bytes across a restart, so the client can ask and carry on", async () => {
    const dir = await mkdtemp(path.join(os.tmpdir(), "benchside-video-restart-"));
    const bytes = Buffer.alloc(KIB256 + 10, 7);
    try {
      const first = await createVideoFake({ port: 0, dir });
      const mux1 = new Mux({ ...TOKEN, baseURL: first.url, maxRetries: 0 });
      const upload = await mux1.video.uploads.create({ cors_origin: "*" });
      expect((await putChunk(upload.url ?? "", bytes, 0, KIB256 - 1, bytes.length)).status).toBe(308);
      await first.close();

      const second = await createVideoFake({ port: 0, dir });
      try {
        const mux2 = new Mux({ ...TOKEN, baseURL: second.url, maxRetries: 0 });
        const again = await mux2.video.uploads.retrieve(upload.id);
        expect(again.url?.startsWith(second.url)).toBe(true);
        expect(await askOffset(again.url ?? "", bytes.length)).toEqual({ status: 308, range: `bytes=0-${KIB256 - 1}` });
      } finally {
        await second.close();
      }
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});
