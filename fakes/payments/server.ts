// Local stand-in for the hosted payments API: the official `stripe` SDK talks to it unchanged with
// `new Stripe(key, { host: "127.0.0.1", port, protocol: "http" })`, the owner pays on its page at the
// session's `url`, and it POSTs signed events to the app. Run: npx tsx fakes/payments/server.ts
// (env PAYMENTS_FAKE_PORT, PAYMENTS_FAKE_DIR, STRIPE_SECRET_KEY, STRIPE_WEBHOOK_URL, STRIPE_WEBHOOK_SECRET)
import type http from "node:http";
import path from "node:path";
import { type ApiFailure, FailureSwitch } from "../shared/control";
import { BASE_HEADERS, checkBindHost, type FakeServer, type FakeServerOptions, type JsonResponse, loopbackRefusal, readSmallBody, sendJson, startServer } from "../shared/http";
import { runIfMain, serverEnv } from "../shared/run";
import { checkWebhookOptions, type WebhookFakeOptions, webhookEnv, webhookOptions, webhookTarget } from "../shared/webhooks";
import { handleApi } from "./api";
import { handleControl } from "./control";
import { PaymentsApiError } from "./errors";
import type { FakeContext } from "./ledger";
import { type HtmlResponse, showPayPage, submitPayPage } from "./page";
import { PaymentsStore } from "./store";
import { PaymentsWebhooks } from "./webhooks";

export type PaymentsFakeOptions = FakeServerOptions &
  WebhookFakeOptions & {
    /** The one secret key the API accepts; without it any `sk_test_…` key is accepted. */
    secretKey?: string;
  };

export type PaymentsFake = FakeServer;

const LABEL = "payments fake";
/** The API version the SDK pins (node_modules/stripe/cjs/apiVersion.js); events carry it. */
const API_VERSION = "2026-10-28.endive";
const BODY_LIMIT = 256 * 1024;

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

async function handle(req: http.IncomingMessage, res: http.ServerResponse, ctx: FakeContext): Promise<void> {
  const refusal = loopbackRefusal(req, LABEL);
  if (refusal) return sendJson(res, problem(403, refusal));
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
  checkBindHost(LABEL, opts.host ?? "127.0.0.1");
  if (opts.secretKey !== undefined && !/^sk_test_\w+$/.test(opts.secretKey)) throw new Error("payments fake: STRIPE_SECRET_KEY must be a test key (sk_test_…)");
  checkWebhookOptions(LABEL, opts, "STRIPE_WEBHOOK_SECRET");
}

export async function createPaymentsFake(opts: PaymentsFakeOptions): Promise<PaymentsFake> {
  checkOptions(opts);
  const store = await PaymentsStore.open(path.resolve(opts.dir));
  const webhooks = new PaymentsWebhooks(store, webhookOptions(opts), API_VERSION);
  const ctx: FakeContext = { store, webhooks, publicUrl: "", secretKey: opts.secretKey ?? null, apiFailures: new FailureSwitch<ApiFailure>({ status: 500, message: null }) };
  return startServer({
    label: LABEL,
    host: opts.host ?? "127.0.0.1",
    port: opts.port ?? 4030,
    handle: (req, res) => handle(req, res, ctx),
    internalError: new PaymentsApiError(500, "api_error", "The payments fake hit an unexpected error.").toResponse(),
    onListening: (url) => {
      ctx.publicUrl = url;
      // Events still owed from the last run.
      webhooks.resumePending();
    },
    beforeClose: () => webhooks.close(),
    afterClose: () => store.save(),
  });
}

runIfMain(import.meta.url, LABEL, async () => {
  const fake = await createPaymentsFake({
    ...serverEnv("PAYMENTS_FAKE", 4030, "payments"),
    secretKey: process.env.STRIPE_SECRET_KEY || undefined,
    ...webhookEnv("STRIPE_WEBHOOK_URL", "STRIPE_WEBHOOK_SECRET"),
  });
  console.log(`payments fake listening on ${fake.url}${webhookTarget("STRIPE_WEBHOOK_URL", "events")}`);
  return fake;
});
