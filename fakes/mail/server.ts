// Local stand-in for the Resend API: the real `resend` SDK talks to it via `baseUrl` / RESEND_BASE_URL.
// Run: npx tsx fakes/mail/server.ts   (env MAIL_FAKE_PORT, MAIL_FAKE_DIR, MAIL_FAKE_API_KEY)
import type http from "node:http";
import path from "node:path";
import { type ApiFailure, FailureSwitch } from "../shared/control";
import { BASE_HEADERS, checkBindHost, type FakeServer, type FakeServerOptions, loopbackRefusal, readSmallBody, sendJson, startServer } from "../shared/http";
import { runIfMain, serverEnv } from "../shared/run";
import { handleApi, type ApiContext } from "./api";
import { handleControl } from "./control";
import { InboundWebhooks, openInbound, replyTo } from "./inbound";
import { checkWebhookOptions, webhookEnv, webhookOptions, type WebhookFakeOptions } from "../shared/webhooks";
import { PAGE_CSP, renderIndex, renderMessage, renderNotFound } from "./pages";
import { Mailbox } from "./store";

/** Bounds memory per request; the app's mail is far smaller than this. */
const MAX_BODY_BYTES = 10 * 1024 * 1024;
const LABEL = "mail fake";

/** With a webhook URL and secret (`whsec_…`), replies to messages reach the app as `email.received` events. */
export type MailFakeOptions = FakeServerOptions & WebhookFakeOptions & { apiKey?: string };
export type MailFake = FakeServer;

function sendHtml(res: http.ServerResponse, status: number, html: string): void {
  res.writeHead(status, {
    ...BASE_HEADERS,
    "content-type": "text/html; charset=utf-8",
    "content-security-policy": PAGE_CSP,
    "referrer-policy": "no-referrer",
    "x-frame-options": "DENY",
    "content-length": Buffer.byteLength(html),
  });
  res.end(html);
}

const errorBody = (statusCode: number, name: string, message: string) => ({ status: statusCode, body: { statusCode, name, message } });

type Ctx = ApiContext & { webhooks: InboundWebhooks };

/** The mailbox page's reply form: same-origin only, so another site can't post replies through a tester's browser. */
function crossSiteForm(req: http.IncomingMessage): boolean {
  const site = req.headers["sec-fetch-site"];
  if (site && site !== "same-origin" && site !== "none") return true;
  const origin = req.headers.origin;
  if (origin === undefined || origin === "null") return false;
  return !URL.canParse(origin) || new URL(origin).host !== req.headers.host;
}

/** Replies as the message's recipient; answers the inbound e-mail, or why not. */
async function reply(ctx: Ctx, id: string, text: unknown) {
  const original = ctx.mailbox.get(id);
  if (!original) return { status: 404, error: `No message with id ${id}.` };
  if (typeof text !== "string" || !text.trim() || text.length > 20_000) return { status: 400, error: "`text` must be the reply's text (1 to 20,000 characters)." };
  const email = replyTo(original, text.replace(/\r\n?/g, "\n").trim());
  if ("error" in email) return { status: 400, error: email.error };
  const store = ctx.webhooks.received;
  store.emails.push(email);
  const delivery = ctx.webhooks.announce(email);
  await store.save();
  return { status: 200, email, delivery: { id: delivery.id, state: delivery.state } };
}

async function handle(req: http.IncomingMessage, res: http.ServerResponse, ctx: Ctx): Promise<void> {
  // Loopback only, or a rebound web page could read sign-in links out of the mailbox.
  const refusal = loopbackRefusal(req, LABEL);
  if (refusal) return sendJson(res, errorBody(403, "invalid_access", refusal));
  const method = req.method ?? "GET";
  const url = new URL(req.url ?? "/", "http://127.0.0.1");
  const declared = Number(req.headers["content-length"] ?? 0);
  const body = declared > MAX_BODY_BYTES ? null : await readSmallBody(req, MAX_BODY_BYTES);
  if (body === null) {
    res.setHeader("connection", "close");
    req.resume();
    sendJson(res, errorBody(413, "validation_error", `The request body exceeds ${MAX_BODY_BYTES / 1024 / 1024} MB.`));
    return;
  }
  const { pathname } = url;

  const fakeReply = method === "POST" ? /^\/_fake\/messages\/([^/]+)\/reply$/.exec(pathname) : null;
  if (fakeReply?.[1] !== undefined) {
    let text: unknown;
    try {
      text = (JSON.parse(body.toString("utf8")) as { text?: unknown }).text;
    } catch {
      text = undefined;
    }
    const done = await reply(ctx, fakeReply[1], text);
    sendJson(res, "error" in done ? errorBody(done.status, done.status === 404 ? "not_found" : "validation_error", done.error!) : { status: 200, body: { email: done.email, delivery: done.delivery } });
    return;
  }
  if (method === "GET" && pathname === "/_fake/inbound") {
    sendJson(res, { status: 200, body: { data: ctx.webhooks.received.emails, deliveries: ctx.webhooks.received.deliveries } });
    return;
  }
  const pageReply = method === "POST" ? /^\/m\/([^/]+)\/reply$/.exec(pathname) : null;
  if (pageReply?.[1] !== undefined) {
    if (crossSiteForm(req)) return sendJson(res, errorBody(403, "invalid_access", "Replies are sent from the mailbox page itself."));
    const done = await reply(ctx, pageReply[1], new URLSearchParams(body.toString("utf8")).get("text"));
    if ("error" in done) return sendHtml(res, done.status, renderNotFound(pageReply[1]));
    res.writeHead(303, { ...BASE_HEADERS, location: `/m/${encodeURIComponent(pageReply[1])}?replied=${encodeURIComponent(done.email.id)}` }).end();
    return;
  }
  if (pathname === "/_fake" || pathname.startsWith("/_fake/")) {
    sendJson(res, await handleControl(method, pathname, url.searchParams, body, ctx));
    return;
  }
  if (method === "GET" && pathname === "/") {
    sendHtml(res, 200, renderIndex(ctx.mailbox.list()));
    return;
  }
  const page = method === "GET" ? /^\/m\/([^/]+)$/.exec(pathname) : null;
  if (page?.[1] !== undefined) {
    const message = ctx.mailbox.get(page[1]);
    sendHtml(res, message ? 200 : 404, message ? renderMessage(message, url.searchParams.get("replied")) : renderNotFound(page[1]));
    return;
  }
  if (method === "GET" && pathname === "/favicon.ico") {
    res.writeHead(204, BASE_HEADERS).end();
    return;
  }
  sendJson(res, await handleApi({ method, pathname, query: url.searchParams, headers: req.headers, body }, ctx));
}

export async function createMailFake(opts: MailFakeOptions): Promise<MailFake> {
  const host = opts.host ?? "127.0.0.1";
  checkBindHost(LABEL, host);
  checkWebhookOptions(LABEL, opts, "MAIL_FAKE_WEBHOOK_SECRET");
  const inbound = await openInbound(path.resolve(opts.dir));
  const webhooks = new InboundWebhooks(inbound, webhookOptions(opts));
  webhooks.resumePending();
  const ctx: Ctx = {
    mailbox: await Mailbox.open(path.resolve(opts.dir)),
    apiKey: opts.apiKey || undefined,
    failures: new FailureSwitch<ApiFailure>({ status: 500, message: null }),
    stats: { accepted: 0, failed: 0 },
    inbound,
    webhooks,
  };
  return startServer({
    label: LABEL,
    host,
    port: opts.port ?? 4010,
    handle: (req, res) => handle(req, res, ctx),
    internalError: errorBody(500, "internal_server_error", "The mail fake hit an unexpected error."),
    beforeClose: () => webhooks.close(),
  });
}

runIfMain(import.meta.url, LABEL, async () => {
  const fake = await createMailFake({ ...serverEnv("MAIL_FAKE", 4010, "mail"), ...webhookEnv("MAIL_FAKE_WEBHOOK_URL", "MAIL_FAKE_WEBHOOK_SECRET"), apiKey: process.env.MAIL_FAKE_API_KEY || undefined });
  console.log(`mail fake listening on ${fake.url}`);
  return fake;
});
