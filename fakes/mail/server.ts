// Local stand-in for the Resend API: the real `resend` SDK talks to it via `baseUrl` / RESEND_BASE_URL.
// Run: npx tsx fakes/mail/server.ts   (env MAIL_FAKE_PORT, MAIL_FAKE_DIR, MAIL_FAKE_API_KEY)
import http from "node:http";
import path from "node:path";
import { portFromEnv, runIfMain } from "../shared/run";
import { FailureSwitch, handleApi, type ApiContext, type JsonResponse } from "./api";
import { handleControl } from "./control";
import { PAGE_CSP, renderIndex, renderMessage, renderNotFound } from "./pages";
import { Mailbox } from "./store";

/** Bounds memory per request; the app's mail is far smaller than this. */
const MAX_BODY_BYTES = 10 * 1024 * 1024;

export type MailFakeOptions = { port?: number; host?: string; dir: string; apiKey?: string };
export type MailFake = { url: string; port: number; close(): Promise<void> };

const BASE_HEADERS = { "cache-control": "no-store", "x-content-type-options": "nosniff" };

function isLoopbackHost(host: string): boolean {
  return host === "localhost" || host === "::1" || /^127(\.\d{1,3}){3}$/.test(host);
}

function isLoopbackPeer(address: string | undefined): boolean {
  return address !== undefined && (address === "::1" || /^(::ffff:)?127\./.test(address));
}

function sendJson(res: http.ServerResponse, response: JsonResponse): void {
  const text = JSON.stringify(response.body);
  res.writeHead(response.status, {
    ...BASE_HEADERS,
    ...response.headers,
    "content-type": "application/json; charset=utf-8",
    "content-length": Buffer.byteLength(text),
  });
  res.end(text);
}

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

/** Resolves null once the cap is passed; the rest is drained unbuffered so the client still reads our 413. */
function readBody(req: http.IncomingMessage, limit: number): Promise<Buffer | null> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    let overLimit = false;
    req.on("data", (chunk: Buffer) => {
      if (overLimit) return;
      size += chunk.length;
      if (size > limit) {
        overLimit = true;
        chunks.length = 0;
        resolve(null);
        return;
      }
      chunks.push(chunk);
    });
    req.on("end", () => {
      if (!overLimit) resolve(Buffer.concat(chunks));
    });
    req.on("error", reject);
  });
}

async function handle(req: http.IncomingMessage, res: http.ServerResponse, ctx: ApiContext): Promise<void> {
  if (!isLoopbackPeer(req.socket.remoteAddress)) {
    sendJson(res, errorBody(403, "invalid_access", "The mail fake only answers loopback clients."));
    return;
  }
  // A web page whose name was re-pointed at 127.0.0.1 (DNS rebinding) arrives with its own
  // host name: refuse it, or it could read sign-in links out of the mailbox.
  if (!/^(127\.0\.0\.1|localhost|\[::1\])(:\d+)?$/i.test(req.headers.host ?? "")) {
    sendJson(res, errorBody(403, "invalid_access", "The mail fake only answers requests addressed to 127.0.0.1 or localhost."));
    return;
  }
  const method = req.method ?? "GET";
  const url = new URL(req.url ?? "/", "http://127.0.0.1");
  const declared = Number(req.headers["content-length"] ?? 0);
  const body = declared > MAX_BODY_BYTES ? null : await readBody(req, MAX_BODY_BYTES);
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
  // The control routes have no auth, so the fake must never be reachable from the network.
  if (!isLoopbackHost(host)) throw new Error(`mail fake: refusing to bind to ${host}; use a loopback address such as 127.0.0.1`);
  const ctx: ApiContext = {
    mailbox: await Mailbox.open(path.resolve(opts.dir)),
    apiKey: opts.apiKey || undefined,
    failures: new FailureSwitch(),
    stats: { accepted: 0, failed: 0 },
  };
  const server = http.createServer((req, res) => {
    handle(req, res, ctx).catch((error: unknown) => {
      console.error("mail fake: request failed", error);
      if (!res.headersSent) sendJson(res, errorBody(500, "internal_server_error", "The mail fake hit an unexpected error."));
      else res.destroy();
    });
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.port ?? 4010, host, () => {
      server.off("error", reject);
      resolve();
    });
  });
  const address = server.address();
  if (address === null || typeof address === "string") throw new Error("mail fake: server has no TCP address");
  const urlHost = address.family === "IPv6" || address.address.includes(":") ? `[${address.address}]` : address.address;

  let closing: Promise<void> | null = null;
  return {
    url: `http://${urlHost}:${address.port}`,
    port: address.port,
    close() {
      closing ??= new Promise<void>((resolve, reject) => {
        server.close((error) => (error ? reject(error) : resolve()));
        // Keep-alive sockets from fetch would otherwise hold close() open for seconds.
        server.closeAllConnections();
      });
      return closing;
    },
  };
}

runIfMain(import.meta.url, "mail fake", async () => {
  const fake = await createMailFake({
    port: portFromEnv("MAIL_FAKE_PORT", 4010),
    dir: process.env.MAIL_FAKE_DIR || path.join(".data", "dev", "mail"),
    apiKey: process.env.MAIL_FAKE_API_KEY || undefined,
  });
  console.log(`mail fake listening on ${fake.url}`);
  return fake;
});
