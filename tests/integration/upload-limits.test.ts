// Body limits enforced while the body streams in (issue 14 §4, DESIGN §5 "ten concurrent
// over-size photo uploads"): requests go through a real loopback socket into a web Request built
// the way Next builds one for a route handler (tests/support/next-like-server.ts).
import { readFile } from "node:fs/promises";
import path from "node:path";
import { NextRequest } from "next/server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { processPhoto, PHOTO_LIMITS, receivePhotoFile } from "@/lib/server/photos";
import { readBodyCapped, readFormDataCapped, readJsonCapped, readTextCapped } from "@/lib/server/body-limit";
import { connectTestDatabase } from "../support/db";
import { type NextLikeServer, sendStreamed, startNextLikeServer } from "../support/next-like-server";

const MiB = 1024 * 1024;
const BOUNDARY = "----benchside-test-boundary";
const multipartHead = (name = "photo.jpg", field = "photo") =>
  Buffer.from(`--${BOUNDARY}\r\nContent-Disposition: form-data; name="${field}"; filename="${name}"\r\nContent-Type: image/jpeg\r\n\r\n`);
const multipartTail = Buffer.from(`\r\n--${BOUNDARY}--\r\n`);
const MULTIPART = { "content-type": `multipart/form-data; boundary=${BOUNDARY}` };

/** Samples this process's memory every few milliseconds while `work` runs; answers the peak growth. */
async function peakGrowth(work: () => Promise<unknown>) {
  const before = process.memoryUsage();
  let rss = before.rss;
  let arrayBuffers = before.arrayBuffers;
  const timer = setInterval(() => {
    const now = process.memoryUsage();
    rss = Math.max(rss, now.rss);
    arrayBuffers = Math.max(arrayBuffers, now.arrayBuffers);
  }, 5);
  try {
    await work();
  } finally {
    clearInterval(timer);
  }
  const after = process.memoryUsage();
  return { rss: Math.max(rss, after.rss) - before.rss, arrayBuffers: Math.max(arrayBuffers, after.arrayBuffers) - before.arrayBuffers };
}

describe("photo uploads: the size limit holds while the body streams", () => {
  let server: NextLikeServer;
  let photo: Buffer;
  const limit = PHOTO_LIMITS.maxBytes + 64 * 1024;

  beforeAll(async () => {
    photo = await readFile(path.join(__dirname, "..", "fixtures", "photos", "gps.jpg"));
    // What the photo route does with the body (app/api/jobs/[job]/photos/route.ts), minus storage.
    server = await startNextLikeServer(async (req) => {
      const upload = await receivePhotoFile(req);
      try {
        const processed = await processPhoto(Buffer.from(await upload.file.arrayBuffer()), { name: upload.file.name });
        return { name: upload.file.name, bytes: upload.bytes, width: processed.display.width };
      } finally {
        await upload.dispose();
      }
    });
  });
  afterAll(async () => server?.close());

  it("takes a real photo sent in chunks with no Content-Length", async () => {
    const result = await sendStreamed(server.url, { total: 0, prefix: Buffer.concat([multipartHead("bench.jpg"), photo]), suffix: multipartTail, headers: MULTIPART });
    expect(result.status).toBe(200);
    expect(JSON.parse(result.body)).toMatchObject({ name: "bench.jpg", bytes: photo.length });
  });

  it("refuses a 30 MB chunked body with 413 after reading only about the limit", async () => {
    const before = server.records.length;
    const result = await sendStreamed(server.url, { total: 30 * MiB, prefix: multipartHead(), headers: MULTIPART });
    expect(result.status).toBe(413);
    expect(JSON.parse(result.body)).toEqual({ error: { code: "too_large", message: "Photos can be at most 20 MB each." } });
    const record = server.records[before]!;
    // Read up to the limit, plus at most one socket chunk past it; never the other 10 MB.
    expect(record.consumed).toBeGreaterThan(PHOTO_LIMITS.maxBytes);
    expect(record.consumed).toBeLessThan(limit + 256 * 1024);
    expect(result.sent).toBeLessThan(30 * MiB);
  });

  it("refuses at once when Content-Length already says too much (nothing read)", async () => {
    const before = server.records.length;
    const result = await sendStreamed(server.url, { total: 25 * MiB, prefix: multipartHead(), headers: { ...MULTIPART, "content-length": String(25 * MiB + multipartHead().length) } });
    expect(result.status).toBe(413);
    expect(server.records[before]!.consumed).toBe(0);
  });

  it("answers a broken or empty upload with a clear 4xx", async () => {
    const cut = await sendStreamed(server.url, { total: 0, prefix: Buffer.concat([multipartHead(), photo.subarray(0, 1000)]), headers: MULTIPART });
    expect(cut.status).toBe(400);
    const noPhoto = await sendStreamed(server.url, { total: 0, prefix: Buffer.concat([multipartHead("x.jpg", "other"), photo]), suffix: multipartTail, headers: MULTIPART });
    expect(noPhoto.status).toBe(422);
    expect(JSON.parse(noPhoto.body).error.fields).toEqual({ photo: ["Attach a photo."] });
    const notMultipart = await sendStreamed(server.url, { total: 0, prefix: photo, headers: { "content-type": "image/jpeg" } });
    expect(notMultipart.status).toBe(400);
  });

  it("keeps memory flat for ten concurrent 30 MB uploads with no Content-Length (≤ 64 MiB growth)", async () => {
    // DESIGN.md §5 budget: server memory growth ≤ 64 MiB for ten concurrent over-size photo uploads.
    const before = server.records.length;
    let results: Awaited<ReturnType<typeof sendStreamed>>[] = [];
    const growth = await peakGrowth(async () => {
      results = await Promise.all(Array.from({ length: 10 }, () => sendStreamed(server.url, { total: 30 * MiB, prefix: multipartHead(), headers: MULTIPART })));
    });
    expect(results.map((r) => r.status)).toEqual(Array(10).fill(413));
    for (const record of server.records.slice(before)) expect(record.consumed).toBeLessThan(limit + 256 * 1024);
    expect(growth.rss).toBeLessThanOrEqual(64 * MiB);
    expect(growth.arrayBuffers).toBeLessThanOrEqual(64 * MiB);
  }, 60_000);

  it("the measurement sees a body that is held whole (control: reading 30 MB at once)", async () => {
    const whole = await startNextLikeServer(async (req) => ({ bytes: (await req.arrayBuffer()).byteLength }));
    try {
      let result: Awaited<ReturnType<typeof sendStreamed>> | null = null;
      const growth = await peakGrowth(async () => {
        result = await sendStreamed(whole.url, { total: 30 * MiB });
      });
      expect(result, JSON.stringify(result)).toMatchObject({ status: 200 });
      expect(growth.arrayBuffers, JSON.stringify(growth)).toBeGreaterThan(25 * MiB);
    } finally {
      await whole.close();
    }
  }, 60_000);
});

describe("JSON, text and small forms: capped while read", () => {
  let server: NextLikeServer;
  beforeAll(async () => {
    server = await startNextLikeServer(async (req) => {
      const kind = new URL(req.url).searchParams.get("kind");
      if (kind === "json") return { json: await readJsonCapped(req, 1024) };
      if (kind === "text") return { text: await readTextCapped(req, 1024) };
      if (kind === "form") return { fields: Object.fromEntries(await readFormDataCapped(req, 1024)) };
      return { bytes: (await readBodyCapped(req, 1024)).length };
    }, { closeOnRefusal: true });
  });
  afterAll(async () => server?.close());

  it("parses what fits", async () => {
    const json = await sendStreamed(`${server.url}/?kind=json`, { total: 0, prefix: Buffer.from('{"note":"torque to spec"}'), headers: { "content-type": "application/json" } });
    expect(JSON.parse(json.body)).toEqual({ json: { note: "torque to spec" } });
    // Exactly as sent: a webhook signature is computed over these characters.
    const text = await sendStreamed(`${server.url}/?kind=text`, { total: 0, prefix: Buffer.from("\uFEFFraw é") });
    expect(JSON.parse(text.body)).toEqual({ text: "\uFEFFraw é" });
    const form = await sendStreamed(`${server.url}/?kind=form`, { total: 0, prefix: Buffer.from("a=1&b=two"), headers: { "content-type": "application/x-www-form-urlencoded" } });
    expect(JSON.parse(form.body)).toEqual({ fields: { a: "1", b: "two" } });
    const exact = await sendStreamed(`${server.url}/?kind=bytes`, { total: 1024 });
    expect(JSON.parse(exact.body)).toEqual({ bytes: 1024 });
  });

  it("refuses bad JSON and empty bodies with 400, over-size ones with 413 (closing the connection)", async () => {
    const bad = await sendStreamed(`${server.url}/?kind=json`, { total: 0, prefix: Buffer.from("{not json"), headers: { "content-type": "application/json" } });
    expect(bad.status).toBe(400);
    const empty = await sendStreamed(`${server.url}/?kind=json`, { total: 0, headers: { "content-type": "application/json" } });
    expect(empty.status).toBe(400);
    for (const kind of ["json", "text", "form", "bytes"]) {
      const before = server.records.length;
      const big = await sendStreamed(`${server.url}/?kind=${kind}`, { total: 5 * MiB, headers: { "content-type": kind === "form" ? "application/x-www-form-urlencoded" : "application/json" } });
      expect(big.status, kind).toBe(413);
      expect(server.records[before]!.consumed, kind).toBeLessThan(1024 + 256 * 1024);
      // Answered while the client was still sending, not after it sent all 5 MB.
      expect(big.sent, kind).toBeLessThan(5 * MiB);
    }
  });
});

describe("the Auth.js route caps what it reads", () => {
  it("passes a small form on, refuses a declared or streamed body over 64 KB with a 4xx", async () => {
    connectTestDatabase(); // the app's settings (AUTH_SECRET, DATABASE_URL) for Auth.js
    process.env.AUTH_TRUST_HOST = "true";
    const { POST } = await import("@/app/api/auth/[...nextauth]/route");
    const form = { "content-type": "application/x-www-form-urlencoded" };
    // A small form reaches Auth.js (which wants its CSRF token here and sends the visitor on).
    const small = await POST(new NextRequest("http://localhost:3000/api/auth/signout", { method: "POST", headers: form, body: "csrfToken=abc" }));
    expect(small.status).toBe(302);
    const declared = await POST(new NextRequest("http://localhost:3000/api/auth/signout", { method: "POST", headers: { ...form, "content-length": String(10 * MiB) }, body: "a=1" }));
    expect(declared.status).toBe(413);
    // No length given and no end: reading stops at the cap and Auth.js answers its broken read with 400.
    let pulled = 0;
    const endless = new ReadableStream<Uint8Array>({
      pull(controller) {
        pulled += 64 * 1024;
        controller.enqueue(new Uint8Array(64 * 1024));
      },
    });
    const streamed = await POST(new NextRequest("http://localhost:3000/api/auth/signout", { method: "POST", headers: form, body: endless, duplex: "half" } as ConstructorParameters<typeof NextRequest>[1]));
    expect(streamed.status).toBe(400);
    expect(pulled).toBeLessThan(4 * 64 * 1024);
  });
});
