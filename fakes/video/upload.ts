// The upload URL: resumable chunked PUTs with Content-Range, the protocol @mux/upchunk speaks to the
// storage bucket behind a hosted direct upload. Bytes stream straight to disk; nothing is buffered whole.
import { createWriteStream } from "node:fs";
import type http from "node:http";
import { Transform } from "node:stream";
import { pipeline } from "node:stream/promises";
import { completeUpload, expireIfStale, persist, type FakeContext } from "./context";
import type { StoredUpload } from "./types";

/** Every chunk but the last must be a whole number of these, as the storage service requires. */
export const CHUNK_MULTIPLE = 256 * 1024;

type ContentRange = { kind: "query"; total: number | null } | { kind: "bytes"; start: number; end: number; total: number | null };

class UploadProblem extends Error {
  readonly status: number;
  constructor(status: number, message: string) {
    super(message);
    this.status = status;
  }
}

// `bytes 0-262143/1000000`, `bytes 262144-524287/*`, or `bytes */1000000` (where did I get to?).
export function parseContentRange(header: string | undefined, contentLength: number | null): ContentRange {
  if (header === undefined) {
    // A plain PUT of the whole file, as curl would send it.
    if (!contentLength) throw new UploadProblem(400, "Send Content-Range (bytes START-END/TOTAL) or a non-empty body with Content-Length.");
    return { kind: "bytes", start: 0, end: contentLength - 1, total: contentLength };
  }
  const query = /^bytes \*\/(\d+|\*)$/.exec(header.trim());
  if (query) return { kind: "query", total: query[1] === "*" ? null : Number(query[1]) };
  const match = /^bytes (\d+)-(\d+)\/(\d+|\*)$/.exec(header.trim());
  if (!match) throw new UploadProblem(400, `Content-Range "${header}" is not of the form "bytes START-END/TOTAL".`);
  const [start, end] = [Number(match[1]), Number(match[2])];
  const total = match[3] === "*" ? null : Number(match[3]);
  if (end < start) throw new UploadProblem(400, `Content-Range "${header}" ends before it starts.`);
  if (total !== null && end >= total) throw new UploadProblem(400, `Content-Range "${header}" goes past the end of the file.`);
  return { kind: "bytes", start, end, total };
}

const locks = new Map<string, Promise<unknown>>();

/** One chunk at a time per upload; a retry waits for the dropped attempt's bytes to settle. */
function withLock<T>(id: string, work: () => Promise<T>): Promise<T> {
  const run = (locks.get(id) ?? Promise.resolve()).then(work, work);
  const tail = run.catch(() => undefined);
  locks.set(id, tail);
  void tail.then(() => {
    if (locks.get(id) === tail) locks.delete(id);
  });
  return run;
}

function corsOrigin(upload: StoredUpload | undefined): string {
  const origin = upload?.cors_origin.trim() ?? "";
  if (origin === "" || origin === "*") return "*";
  try {
    // Browsers send the origin without a path or trailing slash; the API accepts "https://shop.test/".
    return new URL(origin).origin;
  } catch {
    return origin;
  }
}

/** 308 "resume incomplete" with the bytes we hold, the way resumable storage uploads answer. */
function rangeHeader(upload: StoredUpload): Record<string, string> {
  return upload.received > 0 ? { range: `bytes=0-${upload.received - 1}` } : {};
}

async function writeChunk(req: http.IncomingMessage, ctx: FakeContext, upload: StoredUpload, start: number, length: number, drop: boolean) {
  const file = ctx.store.sourcePath(upload.id);
  const out = createWriteStream(file, { flags: upload.received > 0 ? "r+" : "w", start });
  let seen = 0;
  const dropAt = drop ? Math.max(1, Math.floor(length / 2)) : Infinity;
  const guard = new Transform({
    transform(chunk: Buffer, _encoding, done) {
      if (seen + chunk.length >= dropAt) {
        this.push(chunk.subarray(0, dropAt - seen));
        seen = dropAt;
        done(new Error("injected connection drop"));
        return;
      }
      seen += chunk.length;
      if (seen > length) done(new UploadProblem(400, `The body is longer than the ${length} bytes its Content-Range announced.`));
      else done(null, chunk);
    },
  });
  let failure: unknown = null;
  try {
    await pipeline(req, guard, out);
  } catch (error) {
    failure = error;
  }
  // Not events.once: it would reject on the stream's own "error", which we already hold in `failure`.
  if (!out.closed) await new Promise<void>((resolve) => out.once("close", () => resolve()));
  // Whatever reached the disk counts, so a client that lost its connection can ask and carry on.
  upload.received = Math.max(upload.received, start + out.bytesWritten);
  return { failure, complete: failure === null && seen === length };
}

export async function handleUpload(req: http.IncomingMessage, res: http.ServerResponse, ctx: FakeContext, uploadId: string, token: string | null): Promise<void> {
  const upload = ctx.store.uploads.get(uploadId);
  // Held now: once the body has been read, req.socket may already be detached.
  const socket = req.socket;
  const cors = { "access-control-allow-origin": corsOrigin(upload), "access-control-expose-headers": "Range", vary: "Origin", "cache-control": "no-store" };
  const reply = (status: number, headers: Record<string, string> = {}, message = "") => {
    if (res.headersSent) return;
    req.resume();
    res.writeHead(status, { ...cors, ...headers, "content-type": "text/plain; charset=utf-8", "content-length": Buffer.byteLength(message) });
    res.end(message);
  };
  if (!upload) return reply(404, {}, "No such upload.");
  if (req.method === "OPTIONS") {
    return reply(204, { "access-control-allow-methods": "PUT, OPTIONS", "access-control-allow-headers": "content-type, content-range", "access-control-max-age": "3600" });
  }
  if (token !== upload.token) return reply(403, {}, "The upload URL's token does not match this upload.");
  if (req.method !== "PUT") return reply(405, { allow: "PUT, OPTIONS" }, "Upload chunks with PUT.");

  try {
    const declared = req.headers["content-length"] === undefined ? null : Number(req.headers["content-length"]);
    const range = parseContentRange(req.headers["content-range"], declared);
    await withLock(upload.id, async () => {
      expireIfStale(ctx, upload);
      if (upload.status === "asset_created") return reply(200, {}, "The upload is already complete.");
      if (upload.status !== "waiting") return reply(410, { connection: "close" }, `This upload is ${upload.status.replace("_", " ")}.`);
      if (range.kind === "query") return reply(308, rangeHeader(upload));

      const length = range.end - range.start + 1;
      if (declared !== null && declared !== length) throw new UploadProblem(400, `Content-Length ${declared} does not match Content-Range (${length} bytes).`);
      if (range.total !== null) {
        if (upload.total !== null && range.total !== upload.total) throw new UploadProblem(400, `The file size changed from ${upload.total} to ${range.total} bytes.`);
        if (range.total > ctx.maxUploadBytes) throw new UploadProblem(413, `The file is larger than the ${ctx.maxUploadBytes} bytes this fake accepts.`);
      }
      const final = range.total !== null && range.end + 1 === range.total;
      if (!final && length % CHUNK_MULTIPLE !== 0) throw new UploadProblem(400, `Chunks other than the last must be a multiple of ${CHUNK_MULTIPLE} bytes (256 KiB); got ${length}.`);
      if (range.start > upload.received) {
        throw new UploadProblem(400, `The chunk starts at byte ${range.start} but only ${upload.received} bytes have arrived; ask with "Content-Range: bytes */TOTAL" and resume from there.`);
      }
      if (range.total !== null) upload.total = range.total;

      const injected = ctx.chunkFailures.take();
      if (injected && "status" in injected) return reply(injected.status, {}, "Injected failure (video fake switch).");
      const { failure, complete } = await writeChunk(req, ctx, upload, range.start, length, injected !== null);
      await persist(ctx);
      if (injected !== null) {
        socket.destroy();
        return;
      }
      if (failure instanceof UploadProblem) throw failure;
      if (failure !== null || !complete) return reply(308, rangeHeader(upload));
      if (upload.total !== null && upload.received >= upload.total) {
        completeUpload(ctx, upload);
        return reply(200, {}, "Upload complete.");
      }
      return reply(308, rangeHeader(upload));
    });
  } catch (error) {
    if (!(error instanceof UploadProblem)) throw error;
    reply(error.status, { ...rangeHeader(upload), connection: "close" }, error.message);
  }
}
