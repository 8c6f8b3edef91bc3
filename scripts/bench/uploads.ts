// DESIGN.md §5 upload memory budget through the app's own upload route: ten over-size photo uploads at
// once (POST /api/jobs/:job/photos, multipart, 100 MB each against the 20 MB limit) grow the app
// server's memory by at most 64 MiB, because the limit is enforced while the body streams in. Each must
// be refused with 413. (Clips never pass through the app: the browser sends them to the video service,
// whose upload is the clip-upload part.)
import { randomFillSync } from "node:crypto";
import fs from "node:fs";
import net from "node:net";
import { ceilingBudget, type Part } from "./budget";
import { sampleMemory } from "./proc";
import type { BenchData } from "./seed";
import { signIn } from "./sessions";
import type { Stack } from "./stack";

const MIB = 1024 * 1024;
const UPLOADS = 10;
const BYTES_EACH = 100 * MIB;
const LIMIT_MIB = 64;

/** The process that serves HTTP: `next start` itself, or the child it started for the server. */
function serverPid(pid: number): number {
  const children = fs
    .readdirSync(`/proc/${pid}/task`)
    .flatMap((tid) => fs.readFileSync(`/proc/${pid}/task/${tid}/children`, "utf8").trim().split(/\s+/).filter(Boolean))
    .map(Number)
    .filter((child) => fs.readFileSync(`/proc/${child}/cmdline`, "utf8").includes("next"));
  return children.length === 1 ? children[0]! : pid;
}

/**
 * Streams a multipart body of `bytes` random bytes in 1 MiB pieces over a plain socket and resolves with
 * the status line's code. A plain socket, because the server closes the connection once it has refused
 * the body, and Node's HTTP client drops an answer that came before a failed write (EPIPE).
 */
type Outcome = { status: number; sent: number }; // status 0: cut off before its answer could be read

function oversizeUpload(url: URL, cookie: string, bytes: number): Promise<Outcome> {
  const boundary = `----bench${Date.now().toString(16)}`;
  const head = Buffer.from(`--${boundary}\r\ncontent-disposition: form-data; name="photo"; filename="big.jpg"\r\ncontent-type: image/jpeg\r\n\r\n`);
  const tail = Buffer.from(`\r\n--${boundary}--\r\n`);
  const piece = Buffer.alloc(MIB);
  randomFillSync(piece);
  piece[0] = 0xff; // starts like a JPEG, so only the size can refuse it
  piece[1] = 0xd8;
  piece[2] = 0xff;
  const request = [
    `POST ${url.pathname} HTTP/1.1`,
    `host: ${url.host}`,
    `cookie: ${cookie}`,
    `origin: ${url.origin}`,
    `content-type: multipart/form-data; boundary=${boundary}`,
    `content-length: ${head.length + bytes + tail.length}`,
    "connection: close",
    "",
    "",
  ].join("\r\n");
  return new Promise((resolve, reject) => {
    let sent = 0;
    let answer = "";
    const socket = net.connect(Number(url.port), url.hostname);
    const status = () => Number(/^HTTP\/1\.1 (\d{3})/.exec(answer)?.[1] ?? 0);
    socket.on("data", (chunk: Buffer) => {
      answer += chunk.toString("latin1");
      if (status()) socket.end();
    });
    // A server that answers before reading the whole body and then closes races our next write: the
    // reset (EPIPE / ECONNRESET) can discard its answer unread. Such an upload is counted as cut off.
    let reset: Error | null = null;
    socket.on("error", (error) => (reset = error));
    socket.on("close", () => {
      if (status()) resolve({ status: status(), sent });
      else if (reset && sent > 0) resolve({ status: 0, sent });
      else reject(reset ?? new Error("the app closed the connection without an answer"));
    });
    // One piece at a time, letting the answer's bytes be read between pieces.
    const write = () => {
      if (status() || socket.destroyed) return;
      if (sent >= bytes) return void socket.write(tail);
      const n = Math.min(piece.length, bytes - sent);
      sent += n;
      const more = socket.write(n === piece.length ? piece : piece.subarray(0, n));
      if (more) setImmediate(write);
      else socket.once("drain", write);
    };
    socket.once("connect", () => {
      socket.write(request);
      socket.write(head);
      write();
    });
  });
}

/**
 * Throughput of accepted photos through the same route: a 12 MP camera JPEG (scripts/bench/story.ts)
 * sent RUNS times one after another, each timed from the first byte sent to the answer — receiving,
 * checking, re-encoding and storing, as a phone's upload waits for it. DESIGN §5 sets no budget for
 * it; it is reported beside the memory budget. The photos stay pending (never posted to the timeline).
 */
async function acceptedPhotoLines(url: URL, cookie: string, pid: number): Promise<string[]> {
  const { cameraJpeg } = await import("./story");
  const jpeg = await cameraJpeg(1);
  const RUNS = 3;
  const memory = sampleMemory(pid, 50);
  const times: number[] = [];
  for (let i = 0; i < RUNS; i += 1) {
    const form = new FormData();
    form.append("photo", new Blob([new Uint8Array(jpeg)], { type: "image/jpeg" }), "bench-camera.jpg");
    const began = performance.now();
    const res = await fetch(url, { method: "POST", body: form, headers: { cookie, origin: url.origin } });
    await res.arrayBuffer();
    if (!res.ok) throw new Error(`an accepted-size photo upload answered ${res.status}`);
    times.push(performance.now() - began);
  }
  const growth = memory.stop();
  const median = [...times].sort((a, b) => a - b)[Math.floor(RUNS / 2)]!;
  const mb = jpeg.length / 1e6;
  return [
    `Accepted photos through the same route (${mb.toFixed(1)} MB, 4032×3024 JPEG, ${RUNS} one after another; no budget in DESIGN §5):`,
    `  median ${(median / 1000).toFixed(2)} s each from first byte to answer (receive, check, re-encode, store) = ${(mb / (median / 1000)).toFixed(1)} MB/s; app memory growth ${(growth.growth / MIB).toFixed(1)} MiB`,
  ];
}

export async function photoUploadBudget(stack: Stack, data: BenchData, log: (s: string) => void): Promise<Part> {
  const cookie = await signIn(stack, "staff");
  const url = new URL(`/api/jobs/${data.pageJob.publicId}/photos`, stack.appUrl);
  const pid = serverPid(stack.appPid());
  // Let the server settle after the sign-in before the baseline is read.
  await new Promise((r) => setTimeout(r, 1000));
  const memory = sampleMemory(pid, 50);
  const began = performance.now();
  const settled = await Promise.allSettled(Array.from({ length: UPLOADS }, () => oversizeUpload(url, cookie, BYTES_EACH)));
  const growth = memory.stop();
  const failed = settled.find((s) => s.status === "rejected");
  if (failed) throw failed.reason;
  const results = settled.map((s) => (s as PromiseFulfilledResult<Outcome>).value);
  const health = await fetch(`${stack.appUrl}/api/health`).then((r) => r.status, () => 0);
  const ms = performance.now() - began;
  const count = (status: number) => results.filter((r) => r.status === status).length;
  const statuses = [...new Set(results.map((r) => r.status))].map((st) => `${count(st)}× ${st === 0 ? "cut off" : st}`);
  const sentMiB = results.reduce((s, r) => s + r.sent, 0) / MIB;
  // Refused while streaming: 413, or cut off by the server's close after it stopped reading; the app
  // must still answer afterwards (a crash would also cut connections off).
  const refused = results.every((r) => r.status === 413 || r.status === 0) && count(413) > 0 && health === 200;
  const budget = ceilingBudget("photo upload memory, 10 over-size at once", growth.growth / MIB, LIMIT_MIB, "MiB");
  const accepted = await acceptedPhotoLines(url, cookie, pid);
  log(`photo uploads: answers ${statuses.join(", ")}; app memory grew ${(growth.growth / MIB).toFixed(1)} MiB`);
  return {
    budgets: [{ ...budget, pass: budget.pass && refused }],
    lines: [
      `Photo upload through the app (${UPLOADS} × ${BYTES_EACH / MIB} MB multipart at once to POST /api/jobs/:job/photos, limit 20 MB):`,
      `  answers: ${statuses.join(", ")}${refused ? " (refused while streaming, as they must be)" : " — NOT all refused"}; ${sentMiB.toFixed(0)} MiB written by the clients before the refusals, ${(ms / 1000).toFixed(1)} s; /api/health afterwards: ${health}`,
      "  (cut off: the server answered and closed before the whole body was sent; the reset can discard the 413 unread)",
      `  app server (pid ${pid}) memory growth ${(growth.growth / MIB).toFixed(1)} MiB (baseline ${(growth.baseline / MIB).toFixed(0)} MiB, peak ${(growth.peak / MIB).toFixed(0)} MiB${growth.hwmReset ? ", kernel peak included" : ""}); budget ≤ ${LIMIT_MIB} MiB`,
      ...accepted,
    ],
  };
}
