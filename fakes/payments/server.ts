// Local stand-in for the hosted payments API: the official `stripe` SDK talks to it unchanged with
// `new Stripe(key, { host: "127.0.0.1", port, protocol: "http" })`, the owner pays on its page at the
// session's `url`, and it POSTs signed events to the app. Run: npx tsx fakes/payments/server.ts
// (env PAYMENTS_FAKE_PORT, PAYMENTS_FAKE_DIR, STRIPE_SECRET_KEY, STRIPE_WEBHOOK_URL, STRIPE_WEBHOOK_SECRET)
import http from "node:http";
import path from "node:path";
import { portFromEnv, runIfMain } from "../shared/run";
import { handleApi, type JsonResponse } from "./api";
import { handleControl } from "./control";
import { PaymentsApiError } from "./errors";
import { FailureSwitch, type FakeContext } from "./ledger";
import { type HtmlResponse, showPayPage, submitPayPage } from "./page";
import { PaymentsStore } from "./store";
import { WebhookSender } from "./webhooks";

export type PaymentsFakeOptions = {
  port?: number;
  host?: string;
  dir: string;
  /** The one secret key the API accepts; without it any `sk_test_…` key is accepted. */
  secretKey?: string;
  /** The app's webhook endpoint; needs `webhookSecret`. Without it events are only recorded. */
  webhookUrl?: string;
  webhookSecret?: string;
  /** Delay before the first retry (doubles after each); default 1000 ms. */
  webhookRetryBaseMs?: number;
  /** Default 8 (about 2 minutes of retries at the default base). */
  webhookMaxAttempts?: number;
  webhookTimeoutMs?: number;
};

export type PaymentsFake = { url: string; port: number; close(): Promise<void> };

/** The API version the SDK pins (node_modules/stripe/cjs/apiVersion.js); events carry it. */
const API_VERSION = "2026-10-28.endive";
const BODY_LIMIT = 256 * 1024;
const BASE_HEADERS = { "cache-control": "no-store", "x-content-type-options": "nosniff" };
const LOOPBACK_HOST_HEADER = /^(127\.0\.0\.1|localhost|\[::1\])(:\d+)?$/i;

function sendJson(res: http.ServerResponse, response: JsonResponse): void {
  const text = JSON.stringify(response.body);
  res.writeHead(response.status, { ...BASE_HEADERS, ...response.headers, "content-type": "application/json; charset=utf-8", "content-length": Buffer.byteLength(text) });
  res.end(text);
}

function sendHtml(res: http.ServerResponse, response: HtmlResponse): void {
  if ("location" in response) {
    res.writeHead(303, { ...BASE_HEADERS, location: response.location, "content-length": 0 });
    res.end();
    return;
  }
  res.writeHead(response.status, { ...BASE_HEADERS, "content-type": "text/html; charset=utf-8", "content-security-policy": response.csp, "x-frame-options": "DENY", "content-length": Buffer.byteLength(response.html) });
  res.end(response.html);
}

const problem = (status: number, message: string): JsonResponse => ({ status, body: new PaymentsApiError(status, "invalid_request_error", message).toBody() });

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
  if (!(peer === "::1" || /^(::ffff:)?127\./.test(peer))) return sendJson(res, problem(403, "The payments fake only answers loopback clients."));
  // A page whose name was re-pointed at 127.0.0.1 (DNS rebinding) arrives with its own host name.
  if (!LOOPBACK_HOST_HEADER.test(req.headers.host ?? "")) return sendJson(res, problem(403, "The payments fake only answers requests addressed to 127.0.0.1 or localhost."));
  const method = req.method ?? "GET";
  const url = new URL(req.url ?? "/", "http://127.0.0.1");
  const body = await readSmallBody(req, BODY_LIMIT);
  if (body === null) {
    res.setHeader("connection", "close");
    return sendJson(res, problem(413, "The request body is larger than 256 KB."));
  }
  const pay = /^\/pay\/([\w]+)$/.exec(url.pathname);
  if (pay) {
    if (method === "GET") return sendHtml(res, showPayPage(ctx, pay[1]!));
    if (method === "POST") return sendHtml(res, submitPayPage(ctx, pay[1]!, body.toString("utf8")));
  }
  if (url.pathname === "/_fake" || url.pathname.startsWith("/_fake/")) return sendJson(res, await handleControl(method, url.pathname, url.searchParams, body, ctx));
  if (url.pathname.startsWith("/v1/")) return sendJson(res, handleApi({ method, pathname: url.pathname, headers: req.headers, body }, ctx));
  sendJson(res, problem(404, `The payments fake serves /v1/…, /pay/… and /_fake/…, not ${url.pathname}.`));
}

function checkOptions(opts: PaymentsFakeOptions): void {
  const host = opts.host ?? "127.0.0.1";
  // The control routes have no auth, so the fake must never be reachable from the network.
  if (!(host === "localhost" || host === "::1" || /^127(\.\d{1,3}){3}$/.test(host))) throw new Error(`payments fake: refusing to bind to ${host}; use a loopback address such as 127.0.0.1`);
  if (opts.secretKey !== undefined && !/^sk_test_\w+$/.test(opts.secretKey)) throw new Error("payments fake: STRIPE_SECRET_KEY must be a test key (sk_test_…)");
  if (opts.webhookUrl) {
    if (!/^https?:\/\//.test(opts.webhookUrl) || !URL.canParse(opts.webhookUrl)) throw new Error(`payments fake: the webhook URL "${opts.webhookUrl}" is not an http(s) URL`);
    if (!opts.webhookSecret) throw new Error("payments fake: a webhook URL needs STRIPE_WEBHOOK_SECRET to sign the events");
  }
}

export async function createPaymentsFake(opts: PaymentsFakeOptions): Promise<PaymentsFake> {
  checkOptions(opts);
  const store = await PaymentsStore.open(path.resolve(opts.dir));
  const webhooks = new WebhookSender(store, {
    url: opts.webhookUrl || undefined,
    secret: opts.webhookSecret || undefined,
    retryBaseMs: opts.webhookRetryBaseMs ?? 1000,
    maxAttempts: opts.webhookMaxAttempts ?? 8,
    timeoutMs: opts.webhookTimeoutMs ?? 10_000,
    apiVersion: API_VERSION,
  });
  const ctx: FakeContext = { store, webhooks, publicUrl: "", secretKey: opts.secretKey ?? null, failures: new FailureSwitch({ status: 500, message: null as string | null }) };
  const server = http.createServer((req, res) => {
    handle(req, res, ctx).catch((error: unknown) => {
      console.error("payments fake: request failed", error);
      if (!res.headersSent) sendJson(res, { status: 500, body: new PaymentsApiError(500, "api_error", "The payments fake hit an unexpected error.").toBody() });
      else res.destroy();
    });
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.port ?? 4030, opts.host ?? "127.0.0.1", () => {
      server.off("error", reject);
      resolve();
    });
  });
  const address = server.address();
  if (address === null || typeof address === "string") throw new Error("payments fake: server has no TCP address");
  const urlHost = address.address.includes(":") ? `[${address.address}]` : address.address;
  ctx.publicUrl = `http://${urlHost}:${address.port}`;
  // Events still owed from the last run.
  webhooks.resumePending();

  let closing: Promise<void> | null = null;
  return {
    url: ctx.publicUrl,
    port: address.port,
    close() {
      closing ??= new Promise<void>((resolve, reject) => {
        webhooks.close();
        server.close((error) => (error ? reject(error) : resolve()));
        // Keep-alive sockets from the SDK would otherwise hold close() open for seconds.
        server.closeAllConnections();
      }).then(() => store.save());
      return closing;
    },
  };
}

runIfMain(import.meta.url, "payments fake", async () => {
  const env = process.env;
  const fake = await createPaymentsFake({
    port: portFromEnv("PAYMENTS_FAKE_PORT", 4030),
    dir: env.PAYMENTS_FAKE_DIR || path.join(".data", "dev", "payments"),
    secretKey: env.STRIPE_SECRET_KEY || undefined,
    webhookUrl: env.STRIPE_WEBHOOK_URL || undefined,
    webhookSecret: env.STRIPE_WEBHOOK_SECRET || undefined,
  });
  console.log(`payments fake listening on ${fake.url}${env.STRIPE_WEBHOOK_URL ? `, webhooks to ${env.STRIPE_WEBHOOK_URL}` : " (no STRIPE_WEBHOOK_URL: events are only recorded)"}`);
  return fake;
});
