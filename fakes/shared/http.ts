// The HTTP plumbing every fake's server.ts shares: loopback-only answers, small bodies read with a
// cap, JSON out, a server that starts on a loopback port and closes once. Each fake keeps its own
// routes and its own error envelope (FakeApiError's toBody).
import http from "node:http";

export type JsonResponse = { status: number; body: unknown; headers?: Record<string, string> };

/** Where and how a fake listens; `dir` holds what it keeps on disk. */
export type FakeServerOptions = { port?: number; host?: string; dir: string };
export type FakeServer = { url: string; port: number; close(): Promise<void> };

export const BASE_HEADERS = { "cache-control": "no-store", "x-content-type-options": "nosniff" };
const LOOPBACK_HOST_HEADER = /^(127\.0\.0\.1|localhost|\[::1\])(:\d+)?$/i;

/** An error in the hosted service's own envelope, with the headers it sends along (retry-after…). */
export abstract class FakeApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly headers: Record<string, string> = {},
  ) {
    super(message);
  }

  abstract toBody(): unknown;

  toResponse(): JsonResponse {
    return { status: this.status, body: this.toBody(), headers: this.headers };
  }
}

export function sendJson(res: http.ServerResponse, response: JsonResponse): void {
  if (response.status === 204) {
    res.writeHead(204, { ...BASE_HEADERS, ...response.headers });
    res.end();
    return;
  }
  const text = JSON.stringify(response.body);
  res.writeHead(response.status, { ...BASE_HEADERS, ...response.headers, "content-type": "application/json; charset=utf-8", "content-length": Buffer.byteLength(text) });
  res.end(text);
}

/** Resolves null past the limit; the rest is left for Node to discard after our 413. */
export function readSmallBody(req: http.IncomingMessage, limit: number): Promise<Buffer | null> {
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

/**
 * Why the fake called `label` must refuse this request (the message of its 403), or null. The control
 * routes have no auth, so only this machine may talk to a fake.
 */
export function loopbackRefusal(req: http.IncomingMessage, label: string): string | null {
  const peer = req.socket.remoteAddress ?? "";
  if (!(peer === "::1" || /^(::ffff:)?127\./.test(peer))) return `The ${label} only answers loopback clients.`;
  // A web page whose name was re-pointed at 127.0.0.1 (DNS rebinding) arrives with its own host name:
  // refuse it, or it could read the fake's state (sign-in links in the mailbox, for one).
  if (!LOOPBACK_HOST_HEADER.test(req.headers.host ?? "")) return `The ${label} only answers requests addressed to 127.0.0.1 or localhost.`;
  return null;
}

/** Throws unless `host` is a loopback address: the fake must never be reachable from the network. */
export function checkBindHost(label: string, host: string): void {
  if (!(host === "localhost" || host === "::1" || /^127(\.\d{1,3}){3}$/.test(host))) {
    throw new Error(`${label}: refusing to bind to ${host}; use a loopback address such as 127.0.0.1`);
  }
}

export type StartOptions = {
  label: string;
  host: string;
  port: number;
  handle(req: http.IncomingMessage, res: http.ServerResponse): Promise<void>;
  /** The answer to a request that threw (in the fake's error envelope). */
  internalError: JsonResponse;
  requestTimeoutMs?: number;
  /** Run once the server listens, with its base URL. */
  onListening?(url: string): void;
  /** Run once by close(), before and after the server stops. */
  beforeClose?(): void;
  afterClose?(): Promise<void>;
};

/** Listens on a loopback address; close() stops everything once, however often it is called. */
export async function startServer(opts: StartOptions): Promise<FakeServer> {
  checkBindHost(opts.label, opts.host);
  const server = http.createServer((req, res) => {
    opts.handle(req, res).catch((error: unknown) => {
      console.error(`${opts.label}: request failed`, error);
      if (!res.headersSent) sendJson(res, opts.internalError);
      else res.destroy();
    });
  });
  if (opts.requestTimeoutMs !== undefined) server.requestTimeout = opts.requestTimeoutMs;
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.port, opts.host, () => {
      server.off("error", reject);
      resolve();
    });
  });
  const address = server.address();
  if (address === null || typeof address === "string") throw new Error(`${opts.label}: server has no TCP address`);
  const urlHost = address.address.includes(":") ? `[${address.address}]` : address.address;
  const url = `http://${urlHost}:${address.port}`;
  opts.onListening?.(url);

  let closing: Promise<void> | null = null;
  return {
    url,
    port: address.port,
    close() {
      closing ??= new Promise<void>((resolve, reject) => {
        opts.beforeClose?.();
        server.close((error) => (error ? reject(error) : resolve()));
        // Keep-alive sockets from fetch or an SDK would otherwise hold close() open for seconds.
        server.closeAllConnections();
      }).then(() => opts.afterClose?.());
      return closing;
    },
  };
}
