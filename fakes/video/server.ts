// Local stand-in for Mux Video: the real @mux/mux-node SDK talks to it via `baseURL` / MUX_BASE_URL, and
// @mux/upchunk uploads to the URL it hands out. Run: npx tsx fakes/video/server.ts
// (env VIDEO_FAKE_PORT, VIDEO_FAKE_DIR, MUX_TOKEN_ID, MUX_TOKEN_SECRET, MUX_WEBHOOK_SECRET, VIDEO_WEBHOOK_URL)
import type http from "node:http";
import path from "node:path";
import { type ApiFailure, FailureSwitch } from "../shared/control";
import { checkBindHost, type FakeServer, type FakeServerOptions, type JsonResponse, loopbackRefusal, readSmallBody, sendJson, startServer } from "../shared/http";
import { runIfMain, serverEnv } from "../shared/run";
import { checkWebhookOptions, type WebhookFakeOptions, webhookEnv, webhookOptions, webhookTarget } from "../shared/webhooks";
import { handleApi } from "./api";
import type { ChunkFailure, FakeContext } from "./context";
import { handleControl } from "./control";
import { MuxApiError } from "./errors";
import { serveMedia } from "./media";
import { Processor } from "./processor";
import { VideoStore } from "./store";
import { handleUpload } from "./upload";
import { VideoWebhooks } from "./webhooks";

export type VideoFakeOptions = FakeServerOptions &
  WebhookFakeOptions & {
    /** Both or neither; without them any non-empty Basic credentials are accepted. */
    tokenId?: string;
    tokenSecret?: string;
    /** Largest file an upload may declare; default 8 GiB. */
    maxUploadBytes?: number;
    ffmpegPath?: string;
    ffprobePath?: string;
    /** Per ffmpeg/ffprobe run; default 60 minutes. */
    processTimeoutMs?: number;
  };

export type VideoFake = FakeServer;

const LABEL = "video fake";
const API_BODY_LIMIT = 1024 * 1024;

const problem = (status: number, type: MuxApiError["type"], message: string): JsonResponse => ({ status, body: new MuxApiError(status, type, message).toBody() });

async function handle(req: http.IncomingMessage, res: http.ServerResponse, ctx: FakeContext): Promise<void> {
  const refusal = loopbackRefusal(req, LABEL);
  if (refusal) return sendJson(res, problem(403, "forbidden", refusal));
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
  checkBindHost(LABEL, opts.host ?? "127.0.0.1");
  if (Boolean(opts.tokenId) !== Boolean(opts.tokenSecret)) throw new Error("video fake: set both MUX_TOKEN_ID and MUX_TOKEN_SECRET, or neither");
  checkWebhookOptions(LABEL, opts, "MUX_WEBHOOK_SECRET");
}

export async function createVideoFake(opts: VideoFakeOptions): Promise<VideoFake> {
  checkOptions(opts);
  const store = await VideoStore.open(path.resolve(opts.dir));
  const webhooks = new VideoWebhooks(store, webhookOptions(opts));
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
  return startServer({
    label: LABEL,
    host: opts.host ?? "127.0.0.1",
    port: opts.port ?? 4020,
    handle: (req, res) => handle(req, res, ctx),
    internalError: problem(500, "internal_error", "The video fake hit an unexpected error."),
    // A large chunk on a slow link can take longer than Node's 5-minute default.
    requestTimeoutMs: 30 * 60 * 1000,
    onListening: (url) => {
      ctx.publicUrl = url;
      // Work left over from the last run: assets still preparing, webhooks still owed.
      for (const asset of store.assets.values()) if (asset.status === "preparing") processor.enqueue(asset.id);
      webhooks.resumePending();
    },
    beforeClose: () => {
      processor.close();
      webhooks.close();
    },
    afterClose: () => store.save(),
  });
}

runIfMain(import.meta.url, LABEL, async () => {
  const fake = await createVideoFake({
    ...serverEnv("VIDEO_FAKE", 4020, "video"),
    tokenId: process.env.MUX_TOKEN_ID || undefined,
    tokenSecret: process.env.MUX_TOKEN_SECRET || undefined,
    ...webhookEnv("VIDEO_WEBHOOK_URL", "MUX_WEBHOOK_SECRET"),
  });
  console.log(`video fake listening on ${fake.url}${webhookTarget("VIDEO_WEBHOOK_URL", "webhooks")}`);
  return fake;
});
