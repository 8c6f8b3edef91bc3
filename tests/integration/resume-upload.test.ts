// Issue 20 §2: a queued clip resumes after a reload from what the upload URL already holds,
// sending only the missing range (lib/client/resume-upload.ts; @mux/upchunk can only start at
// byte 0). Against the video fake's resumable upload URL, over real HTTP.
import crypto from "node:crypto";
import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import Mux from "@mux/mux-node";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { failNextChunks, putUploadChunk, resetVideoFake } from "../../fakes/video/client";
import { createVideoFake, type VideoFake } from "../../fakes/video/server";
import { askOffset, offsetFromRange, sendFrom } from "@/lib/client/resume-upload";

const TOKEN = { tokenId: "resume-test-token", tokenSecret: "resume-test-secret" };
const KiB256 = 256 * 1024;

describe("resuming a clip upload from where it stopped", () => {
  let dir: string;
  let fake: VideoFake;
  let mux: Mux;
  // 5 chunks of 256 KiB and a short last one.
  const bytes = crypto.randomBytes(5 * KiB256 + 12_345);
  const file = new Blob([bytes], { type: "video/mp4" });
  const newUpload = async () => {
    const upload = await mux.video.uploads.create({ cors_origin: "http://localhost:3000", new_asset_settings: { playback_policies: ["public"] } });
    if (!upload.url) throw new Error("the video fake made an upload without a URL");
    return { id: upload.id, url: upload.url };
  };

  beforeAll(async () => {
    dir = await mkdtemp(path.join(os.tmpdir(), "benchside-resume-"));
    fake = await createVideoFake({ port: 0, dir, ...TOKEN });
    mux = new Mux({ ...TOKEN, baseURL: fake.url, maxRetries: 0 });
  });
  beforeEach(async () => {
    await resetVideoFake(fake.url);
  });
  afterAll(async () => {
    await fake?.close();
    if (dir) await rm(dir, { recursive: true, force: true });
  });

  it("reads the offset from a Range answer", () => {
    expect(offsetFromRange("bytes=0-262143")).toBe(KiB256);
    expect(offsetFromRange(null)).toBe(0);
    expect(offsetFromRange("junk")).toBe(0);
  });

  it("after a reload: asks what arrived, sends only the rest, and the upload completes", async () => {
    const upload = await newUpload();
    // The page sent two chunks before it was closed.
    expect((await putUploadChunk(upload.url, bytes, 0, KiB256 - 1, bytes.length)).status).toBe(308);
    expect((await putUploadChunk(upload.url, bytes, KiB256, 2 * KiB256 - 1, bytes.length)).status).toBe(308);
    const asked = await askOffset(upload.url, bytes.length);
    expect(asked).toEqual({ state: "partial", offset: 2 * KiB256 });
    const progress: number[] = [];
    const result = await sendFrom(upload.url, file, 2 * KiB256, { chunkBytes: KiB256, onProgress: (f) => progress.push(f), retryDelayMs: 10 });
    expect(result).toEqual({ ok: true });
    expect(progress.at(-1)).toBe(1);
    expect(progress[0]).toBeCloseTo((3 * KiB256) / bytes.length, 5); // started at chunk 3, not at 0
    expect((await mux.video.uploads.retrieve(upload.id)).status).toBe("asset_created");
    expect(await askOffset(upload.url, bytes.length)).toEqual({ state: "complete" });
  });

  it("a connection dropped mid-chunk: asks again and carries on from what reached the service", async () => {
    const upload = await newUpload();
    await failNextChunks(fake.url, 1, { drop: true });
    const result = await sendFrom(upload.url, file, 0, { chunkBytes: KiB256, retryDelayMs: 10 });
    expect(result).toEqual({ ok: true });
    expect((await mux.video.uploads.retrieve(upload.id)).status).toBe("asset_created");
  });

  it("gateway errors are retried; an upload that is gone is refused with the service's words", async () => {
    const upload = await newUpload();
    await failNextChunks(fake.url, 2, { status: 503 });
    expect(await sendFrom(upload.url, file, 0, { chunkBytes: KiB256, retryDelayMs: 10 })).toEqual({ ok: true });

    const cancelled = await newUpload();
    await mux.video.uploads.cancel(cancelled.id);
    const asked = await askOffset(cancelled.url, bytes.length);
    expect(asked).toMatchObject({ state: "refused", status: 410 });
    const sent = await sendFrom(cancelled.url, file, 0, { chunkBytes: KiB256, retryDelayMs: 10 });
    expect(sent).toMatchObject({ ok: false, status: 410, message: expect.stringMatching(/cancelled/) });
  });
});
