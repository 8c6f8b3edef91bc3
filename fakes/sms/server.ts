// Local stand-in for the hosted SMS API (Twilio-shaped, 2010-04-01 Messages): the official `twilio` SDK
// talks to it through the app's origin-rewriting http client (lib/server/sms.ts, TWILIO_API_BASE); it
// POSTs signed status callbacks and inbound texts to the app, and shows every text at / with a reply
// form. Run: npx tsx fakes/sms/server.ts (env SMS_FAKE_PORT, SMS_FAKE_DIR, TWILIO_ACCOUNT_SID,
// TWILIO_AUTH_TOKEN, SMS_INBOUND_WEBHOOK_URL)
import type http from "node:http";
import path from "node:path";
import { type ApiFailure, FailureSwitch } from "../shared/control";
import { BASE_HEADERS, checkBindHost, type FakeServer, type FakeServerOptions, loopbackRefusal, readSmallBody, sendJson, startServer } from "../shared/http";
import { runIfMain, serverEnv } from "../shared/run";
import { checkWebhookOptions, type WebhookFakeOptions, webhookOptions, webhookTarget } from "../shared/webhooks";
import { handleApi, type SmsContext } from "./api";
import { handleControl, receiveText } from "./control";
import { SmsApiError } from "./errors";
import { PAGE_CSP, renderIndex } from "./page";
import { SmsStore } from "./store";
import { SmsWebhooks } from "./webhooks";

export type SmsFakeOptions = FakeServerOptions &
  Pick<WebhookFakeOptions, "webhookRetryBaseMs" | "webhookMaxAttempts" | "webhookTimeoutMs"> & {
    accountSid: string;
    /** Basic-auth password of the API, and the key of every X-Twilio-Signature. */
    authToken: string;
    /** Where inbound texts are POSTed (the number's incoming-message webhook). */
    inboundUrl?: string;
    /** Time between a message's status changes; default 300 ms. */
    stepMs?: number;
  };

export type SmsFake = FakeServer;

const LABEL = "sms fake";
const BODY_LIMIT = 64 * 1024;

function sendHtml(res: http.ServerResponse, status: number, html: string): void {
  res.writeHead(status, { ...BASE_HEADERS, "content-type": "text/html; charset=utf-8", "content-security-policy": PAGE_CSP, "x-frame-options": "DENY", "content-length": Buffer.byteLength(html) });
  res.end(html);
}

async function handle(req: http.IncomingMessage, res: http.ServerResponse, ctx: SmsContext): Promise<void> {
  const refusal = loopbackRefusal(req, LABEL);
  if (refusal) return sendJson(res, new SmsApiError(403, 20003, refusal).toResponse());
  const method = req.method ?? "GET";
  const url = new URL(req.url ?? "/", "http://127.0.0.1");
  const body = await readSmallBody(req, BODY_LIMIT);
  if (body === null) {
    res.setHeader("connection", "close");
    return sendJson(res, new SmsApiError(413, 21100, "The request body is larger than 64 KB.").toResponse());
  }
  if (method === "GET" && url.pathname === "/") return sendHtml(res, 200, renderIndex(ctx.store.list()));
  if (method === "POST" && url.pathname === "/reply") {
    const form = new URLSearchParams(body.toString("utf8"));
    try {
      receiveText(ctx, { from: form.get("from") ?? "", to: form.get("to") ?? "", body: form.get("body") ?? "" });
    } catch (error) {
      if (error instanceof SmsApiError) return sendHtml(res, 400, `<p>${error.message.replace(/[<>&]/g, "")}</p><p><a href="/">Back</a></p>`);
      throw error;
    }
    res.writeHead(303, { ...BASE_HEADERS, location: "/", "content-length": 0 });
    return void res.end();
  }
  if (url.pathname === "/_fake" || url.pathname.startsWith("/_fake/")) return sendJson(res, await handleControl(method, url.pathname, url.searchParams, body, ctx));
  if (url.pathname.startsWith("/2010-04-01/")) return sendJson(res, handleApi({ method, pathname: url.pathname, query: url.searchParams, headers: req.headers, body }, ctx));
  if (method === "GET" && url.pathname === "/favicon.ico") return void res.writeHead(204, BASE_HEADERS).end();
  sendJson(res, new SmsApiError(404, 20404, `The SMS fake serves /2010-04-01/…, / and /_fake/…, not ${url.pathname}.`).toResponse());
}

export async function createSmsFake(opts: SmsFakeOptions): Promise<SmsFake> {
  checkBindHost(LABEL, opts.host ?? "127.0.0.1");
  if (!/^AC[0-9a-f]{32}$/.test(opts.accountSid)) throw new Error("sms fake: TWILIO_ACCOUNT_SID must look like AC + 32 hex digits");
  if (!opts.authToken) throw new Error("sms fake: TWILIO_AUTH_TOKEN is required (it signs every webhook)");
  const hooks = { webhookUrl: opts.inboundUrl, webhookSecret: opts.authToken, ...opts };
  checkWebhookOptions(LABEL, hooks, "TWILIO_AUTH_TOKEN");
  const store = await SmsStore.open(path.resolve(opts.dir));
  const webhooks = new SmsWebhooks(store, webhookOptions(hooks));
  const ctx: SmsContext = {
    store,
    webhooks,
    accountSid: opts.accountSid,
    authToken: opts.authToken,
    apiFailures: new FailureSwitch<ApiFailure>({ status: 500, message: null }),
    outcomes: [],
    loseAnswers: 0,
    stepMs: opts.stepMs ?? 300,
    timers: new Set(),
  };
  return startServer({
    label: LABEL,
    host: opts.host ?? "127.0.0.1",
    port: opts.port ?? 4040,
    handle: (req, res) => handle(req, res, ctx),
    internalError: new SmsApiError(500, 20500, "The SMS fake hit an unexpected error.").toResponse(),
    onListening: () => webhooks.resumePending(),
    beforeClose: () => {
      for (const timer of ctx.timers) clearTimeout(timer);
      webhooks.close();
    },
    afterClose: () => store.save(),
  });
}

runIfMain(import.meta.url, LABEL, async () => {
  const fake = await createSmsFake({
    ...serverEnv("SMS_FAKE", 4040, "sms"),
    accountSid: process.env.TWILIO_ACCOUNT_SID ?? "",
    authToken: process.env.TWILIO_AUTH_TOKEN ?? "",
    inboundUrl: process.env.SMS_INBOUND_WEBHOOK_URL || undefined,
  });
  console.log(`sms fake listening on ${fake.url}${webhookTarget("SMS_INBOUND_WEBHOOK_URL", "inbound texts")}`);
  return fake;
});
