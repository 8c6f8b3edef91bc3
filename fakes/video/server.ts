// Local stand-in for Mux Video: the real @mux/mux-node SDK talks to it via `baseURL` / MUX_BASE_URL, and
// @mux/upchunk uploads to the URL it hands out. Run: npx tsx fakes/video/server.ts
// (env VIDEO_FAKE_PORT, VIDEO_FAKE_DIR, MUX_TOKEN_ID, MUX_TOKEN_SECRET, MUX_WEBHOOK_SECRET, VIDEO_WEBHOOK_URL)
import http from "node:http";
import path from "node:path";
import { portFromEnv, runIfMain } from "../shared/run";
import { handleApi, type JsonResponse } from "./api";
import { FailureSwitch, type ApiFailure, type ChunkFailure, type FakeContext } from "./context";
import { handleControl } from "./control";
import { MuxApiError } from "./errors";
import { serveMedia } from "./media";
import { Processor } from "./processor";
import { VideoStore } from "./store";
import { handleUpload } from "./upload";
import { WebhookSender } from "./webhooks";

export type VideoFakeOptions = {
  port?: number;
  host?: string;
  dir: string;
  /** Both or neither; without them any non-empty Basic credentials are accepted. */
  tokenId?: string;
  tokenSecret?: string;
  /** The app's webhook endpoint; needs `webhookSecret`. Without it events are only recorded. */
  webhookUrl?: string;
  webhookSecret?: string;
  /** Delay before the first retry (doubles after each); default 1000 ms. */
  webhookRetryBaseMs?: number;
  /** Default 8 (about 2 minutes of retries at the default base). */
  webhookMaxAttempts?: number;
  webhookTimeoutMs?: number;
  /** Largest file an upload may declare; default 8 GiB. */
  maxUploadBytes?: number;
  ffmpegPath?: string;
  ffprobePath?: string;
  /** Per ffmpeg/ffprobe run; default 60 minutes. */
  processTimeoutMs?: number;
};

export type VideoFake = { url: string; port: number; close(): Promise<void> };

const API_BODY_LIMIT = 1024 * 1024;
const BASE_HEADERS = { "cache-control": "no-store", "x-content-type-options": "nosniff" };
const LOOPBACK_HOST_HEADER = /^(127\.0\.0\.1|localhost|\[::1\])(:\d+)?$/i;

function sendJson(res: http.ServerResponse, response: JsonResponse): void {
  if (response.status === 204) {
    res.writeHead(204, { ...BASE_HEADERS, ...response.headers });
    res.end();
    return;
  }
  const text = JSON.stringify(response.body);
  res.writeHead(response.status, { ...BASE_HEADERS, ...response.headers, "content-type": "application/json; charset=utf-8", "content-length": Buffer.byteLength(text) });
  res.end(text);
}

const problem = (status: number, type: MuxApiError["type"], message: string): JsonResponse => ({ status, body: new MuxApiError(status, type, message).toBody() });

/** Resolves null past the limit; the rest is left for Node to discard after our 413. */
function readSmallBody(req: http.IncomingMessage, limit: number): Promise<Buffer | null> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    const onData = (chunk: Buffer) => {
      size += chunk.length;
      if (size > limit) {
        req.off("data", onData);
        req.resume();
        resolve(null);
      } else chunks.push(chunk);
    };
    req.on("data", onData);
    req.on("end", () => resolve(Buffer.concat(chunks)));
    req.on("error", reject);
  });
}

async function handle(req: http.IncomingMessage, res: http.ServerResponse, ctx: FakeContext): Promise<void> {
  const peer = req.socket.remoteAddress ?? "";
  if (!(peer === "::1" || /^(::ffff:)?127\./.test(peer))) return sendJson(res, problem(403, "forbidden", "The video fake only answers loopback clients."));
  // A page whose name was re-pointed at 127.0.0.1 (DNS rebinding) arrives with its own host name.
  if (!LOOPBACK_HOST_HEADER.test(req.headers.host ?? "")) {
    return sendJson(res, problem(403, "forbidden", "The video fake only answers requests addressed to 127.0.0.1 or localhost."));
  }
  const method = req.method ?? "GET";
  const url = new URL(req.url ?? "/", "http://127.0.0.1");
  const { pathname } = url;

  const upload = /^\/upload\/([A-Za-z0-9]+)$/.exec(pathname);
  if (upload?.[1] !== undefined) return handleUpload(req, res, ctx, upload[1], url.searchParams.get("token"));
  const media = /^\/media\/([A-Za-z0-9]+)\/([a-z0-9.]+)$/.exec(pathname);
  if (media?.[1] !== undefined && media[2] !== undefined) return serveMedia(req, res, ctx, media[1], media[2]);

  const isControl = pathname === "/_fake" || pathname.startsWith("/_fake/");
  if (!isControl && !pathname.startsWith("/video/")) {
    return sendJson(res, problem(404, "not_found", `The video fake serves /video/v1/…, /upload/…, /media/… and /_fake/…, not ${pathname}.`));
  }
  const body = await readSmallBody(req, API_BODY_LIMIT);
  if (body === null) {
    res.setHeader("connection", "close");
    return sendJson(res, problem(413, "invalid_parameters", "The request body is larger than 1 MB."));
  }
  if (isControl) return sendJson(res, await handleControl(method, pathname, url.searchParams, body, ctx));
  sendJson(res, await handleApi({ method, pathname, query: url.searchParams, headers: req.headers, body }, ctx));
}

function checkOptions(opts: VideoFakeOptions): void {
  const host = opts.host ?? "127.0.0.1";
  // The control routes have no auth, so the fake must never be reachable from the network.
  if (!(host === "localhost" || host === "::1" || /^127(\.\d{1,3}){3}$/.test(host))) {
    throw new Error(`video fake: refusing to bind to ${host}; use a loopback address such as 127.0.0.1`);
  }
  if (Boolean(opts.tokenId) !== Boolean(opts.tokenSecret)) throw new Error("video fake: set both MUX_TOKEN_ID and MUX_TOKEN_SECRET, or neither");
  if (opts.webhookUrl) {
    if (!/^https?:\/\//.test(opts.webhookUrl) || !URL.canParse(opts.webhookUrl)) throw new Error(`video fake: the webhook URL "${opts.webhookUrl}" is not an http(s) URL`);
    if (!opts.webhookSecret) throw new Error("video fake: a webhook URL needs MUX_WEBHOOK_SECRET to sign the events");
  }
}

export async function createVideoFake(opts: VideoFakeOptions): Promise<VideoFake> {
  checkOptions(opts);
  const store = await VideoStore.open(path.resolve(opts.dir));
  const webhooks = new WebhookSender(store, {
    url: opts.webhookUrl || undefined,
    secret: opts.webhookSecret || undefined,
    retryBaseMs: opts.webhookRetryBaseMs ?? 1000,
    maxAttempts: opts.webhookMaxAttempts ?? 8,
    timeoutMs: opts.webhookTimeoutMs ?? 10_000,
  });
  const tools = { ffmpeg: opts.ffmpegPath ?? "ffmpeg", ffprobe: opts.ffprobePath ?? "ffprobe", timeoutMs: opts.processTimeoutMs ?? 60 * 60 * 1000 };
  const processor = new Processor({ store, webhooks, tools });
  const ctx: FakeContext = {
    store,
    webhooks,
    processor,
    publicUrl: "",
    credentials: opts.tokenId && opts.tokenSecret ? { tokenId: opts.tokenId, tokenSecret: opts.tokenSecret } : null,
    maxUploadBytes: opts.maxUploadBytes ?? 8 * 1024 ** 3,
    apiFailures: new FailureSwitch<ApiFailure>({ status: 500, message: null }),
    chunkFailures: new FailureSwitch<ChunkFailure>({ status: 503 }),
  };
  const server = http.createServer((req, res) => {
    handle(req, res, ctx).catch((error: unknown) => {
      console.error("video fake: request failed", error);
      if (!res.headersSent) sendJson(res, problem(500, "internal_error", "The video fake hit an unexpected error."));
      else res.destroy();
    });
  });
  // A large chunk on a slow link can take longer than Node's 5-minute default.
  server.requestTimeout = 30 * 60 * 1000;
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.port ?? 4020, opts.host ?? "127.0.0.1", () => {
      server.off("error", reject);
      resolve();
    });
  });
  const address = server.address();
  if (address === null || typeof address === "string") throw new Error("video fake: server has no TCP address");
  const urlHost = address.address.includes(":") ? `[${address.address}]` : address.address;
  ctx.publicUrl = `http://${urlHost}:${address.port}`;

  // Work left over from the last run: assets still preparing, webhooks still owed.
  for (const asset of store.assets.values()) if (asset.status === "preparing") processor.enqueue(asset.id);
  webhooks.resumePending();

  let closing: Promise<void> | null = null;
  return {
    url: ctx.publicUrl,
    port: address.port,
    close() {
      closing ??= new Promise<void>((resolve, reject) => {
        processor.close();
        webhooks.close();
        server.close((error) => (error ? reject(error) : resolve()));
        // Keep-alive sockets from fetch would otherwise hold close() open for seconds.
        server.closeAllConnections();
      }).then(() => store.save());
      return closing;
    },
  };
}

runIfMain(import.meta.url, "video fake", async () => {
  const env = process.env;
  const fake = await createVideoFake({
    port: portFromEnv("VIDEO_FAKE_PORT", 4020),
    dir: env.VIDEO_FAKE_DIR || path.join(".data", "dev", "video"),
    tokenId: env.MUX_TOKEN_ID || undefined,
    tokenSecret: env.MUX_TOKEN_SECRET || undefined,
    webhookUrl: env.VIDEO_WEBHOOK_URL || undefined,
    webhookSecret: env.MUX_WEBHOOK_SECRET || undefined,
  });
  console.log(`video fake listening on ${fake.url}${env.VIDEO_WEBHOOK_URL ? `, webhooks to ${env.VIDEO_WEBHOOK_URL}` : " (no VIDEO_WEBHOOK_URL: webhooks are only recorded)"}`);
  return fake;
});
