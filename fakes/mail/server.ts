// Local stand-in for the Resend API: the real `resend` SDK talks to it via `baseUrl` / RESEND_BASE_URL.
// Run: npx tsx fakes/mail/server.ts   (env MAIL_FAKE_PORT, MAIL_FAKE_DIR, MAIL_FAKE_API_KEY)
import type http from "node:http";
import path from "node:path";
import { type ApiFailure, FailureSwitch } from "../shared/control";
import { BASE_HEADERS, checkBindHost, type FakeServer, type FakeServerOptions, loopbackRefusal, readSmallBody, sendJson, startServer } from "../shared/http";
import { runIfMain, serverEnv } from "../shared/run";
import { handleApi, type ApiContext } from "./api";
import { handleControl } from "./control";
import { PAGE_CSP, renderIndex, renderMessage, renderNotFound } from "./pages";
import { Mailbox } from "./store";

/** Bounds memory per request; the app's mail is far smaller than this. */
const MAX_BODY_BYTES = 10 * 1024 * 1024;
const LABEL = "mail fake";

export type MailFakeOptions = FakeServerOptions & { apiKey?: string };
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

async function handle(req: http.IncomingMessage, res: http.ServerResponse, ctx: ApiContext): Promise<void> {
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
    sendHtml(res, message ? 200 : 404, message ? renderMessage(message) : renderNotFound(page[1]));
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
  const ctx: ApiContext = {
    mailbox: await Mailbox.open(path.resolve(opts.dir)),
    apiKey: opts.apiKey || undefined,
    failures: new FailureSwitch<ApiFailure>({ status: 500, message: null }),
    stats: { accepted: 0, failed: 0 },
  };
  return startServer({
    label: LABEL,
    host,
    port: opts.port ?? 4010,
    handle: (req, res) => handle(req, res, ctx),
    internalError: errorBody(500, "internal_server_error", "The mail fake hit an unexpected error."),
  });
}

runIfMain(import.meta.url, LABEL, async () => {
  const fake = await createMailFake({ ...serverEnv("MAIL_FAKE", 4010, "mail"), apiKey: process.env.MAIL_FAKE_API_KEY || undefined });
  console.log(`mail fake listening on ${fake.url}`);
  return fake;
});
