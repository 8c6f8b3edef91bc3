// Playback on loopback: /media/<playback id>/video.mp4 and /poster.jpg (thumbnail.jpg is an alias),
// streamed from disk with CORS and byte ranges so a <video> element in the app's page can seek.
import { createReadStream } from "node:fs";
import { stat } from "node:fs/promises";
import type http from "node:http";
import path from "node:path";
import { pipeline } from "node:stream/promises";
import type { FakeContext } from "./context";
import { POSTER_FILE, RENDITION_FILE } from "./processor";

const FILES: Record<string, { file: string; type: string }> = {
  "video.mp4": { file: RENDITION_FILE, type: "video/mp4" },
  "poster.jpg": { file: POSTER_FILE, type: "image/jpeg" },
  "thumbnail.jpg": { file: POSTER_FILE, type: "image/jpeg" },
};

const CORS = {
  "access-control-allow-origin": "*",
  "access-control-expose-headers": "Content-Range, Content-Length, Accept-Ranges, ETag",
  "cross-origin-resource-policy": "cross-origin",
  "timing-allow-origin": "*",
};

export type ByteRange = { start: number; end: number };

/**
 * One range of `bytes=a-b`, `bytes=a-` or `bytes=-n` (RFC 9110 §14.1.2). null: serve the whole file
 * (no header, a form we ignore, or several ranges). "unsatisfiable": answer 416.
 */
export function parseRange(header: string | undefined, size: number): ByteRange | "unsatisfiable" | null {
  const match = /^bytes=(\d*)-(\d*)$/.exec(header?.trim() ?? "");
  if (!match || (match[1] === "" && match[2] === "")) return null;
  if (match[1] === "") {
    const suffix = Number(match[2]);
    if (suffix === 0 || size === 0) return "unsatisfiable";
    return { start: Math.max(0, size - suffix), end: size - 1 };
  }
  const start = Number(match[1]);
  const end = match[2] === "" ? size - 1 : Number(match[2]);
  if (start >= size) return "unsatisfiable";
  if (end < start) return null;
  return { start, end: Math.min(end, size - 1) };
}

export async function serveMedia(req: http.IncomingMessage, res: http.ServerResponse, ctx: FakeContext, playbackId: string, name: string): Promise<void> {
  const fail = (status: number, message: string, headers: Record<string, string> = {}) => {
    res.writeHead(status, { ...CORS, ...headers, "content-type": "text/plain; charset=utf-8", "content-length": Buffer.byteLength(message) });
    res.end(message);
  };
  if (req.method === "OPTIONS") {
    res.writeHead(204, { ...CORS, "access-control-allow-methods": "GET, HEAD, OPTIONS", "access-control-allow-headers": "range", "access-control-max-age": "3600" });
    res.end();
    return;
  }
  if (req.method !== "GET" && req.method !== "HEAD") return fail(405, "Media is read with GET or HEAD.", { allow: "GET, HEAD, OPTIONS" });
  const kind = FILES[name];
  const asset = kind ? ctx.store.assetByPlaybackId(playbackId) : undefined;
  if (!kind || !asset) return fail(404, "No such media.");
  if (asset.status !== "ready") return fail(404, `The asset is ${asset.status}, not ready.`);
  const file = path.join(ctx.store.mediaDir(asset.id), kind.file);
  const info = await stat(file).catch(() => null);
  if (!info) return fail(404, "No such media.");

  const etag = `"${info.size.toString(16)}-${Math.floor(info.mtimeMs).toString(16)}"`;
  const headers: Record<string, string> = {
    ...CORS,
    "content-type": kind.type,
    "accept-ranges": "bytes",
    etag,
    "last-modified": info.mtime.toUTCString(),
    // Playback ids can be deleted, so caches must check back; the ETag makes that cheap.
    "cache-control": "no-cache",
  };
  const ifRange = req.headers["if-range"];
  const range = ifRange === undefined || ifRange === etag ? parseRange(req.headers.range, info.size) : null;
  if (range === "unsatisfiable") return fail(416, "The requested range is outside the file.", { "content-range": `bytes */${info.size}` });
  if (range === null && req.headers["if-none-match"] === etag) {
    res.writeHead(304, headers);
    res.end();
    return;
  }
  const { start, end } = range ?? { start: 0, end: info.size - 1 };
  res.writeHead(range ? 206 : 200, {
    ...headers,
    "content-length": String(Math.max(0, end - start + 1)),
    ...(range ? { "content-range": `bytes ${start}-${end}/${info.size}` } : {}),
  });
  if (req.method === "HEAD" || info.size === 0) {
    res.end();
    return;
  }
  // A viewer seeking away closes the connection mid-stream; that is not an error worth reporting.
  await pipeline(createReadStream(file, { start, end }), res).catch(() => undefined);
}
