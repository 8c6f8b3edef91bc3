import crypto from "node:crypto";
import http from "node:http";
import https from "node:https";

// Who is on the other end of the connection, and which forwarded headers to believe.
//
// TRUSTED_PROXY_HOPS says how many reverse proxies of ours stand in front of the app (default 0:
// none, browsers connect straight to `next start`). Next fills X-Forwarded-For/-Host/-Proto
// from the socket only when a request doesn't carry them (`??=` in next/dist/server/base-server.js),
// so with no proxy a client could name any address or host it liked: rotate X-Forwarded-For past
// the per-address sign-in limits, or send X-Forwarded-Host with a matching Origin to get
// redirected to a host of its choosing. So, at the socket, before Next sees the request
// (installForwardedHeaderGuard, from instrumentation.ts): with 0 hops the forwarded headers
// are removed (Next then fills them from the connection itself), and in every case the socket's
// address is recorded in a header no client can forge, because it carries a secret of this process.

const PEER_HEADER = "x-benchside-peer";
const FORWARDED_HEADERS = ["x-forwarded-for", "x-forwarded-host", "x-forwarded-proto", "x-forwarded-port", "forwarded", "x-real-ip"];
const SECRET = Symbol.for("benchside.peer-guard.secret");
type Holder = { [SECRET]?: string };

/** How many proxies of ours are in front of the app: TRUSTED_PROXY_HOPS, a whole number 0–10, default 0. */
export function trustedProxyHops(): number {
  const raw = process.env.TRUSTED_PROXY_HOPS?.trim();
  const n = Number(raw);
  return raw && Number.isInteger(n) && n >= 0 && n <= 10 ? n : 0;
}

/** What the guard does to one incoming request (exported for the integration test's plain server). */
export function guardIncomingHeaders(req: http.IncomingMessage, secret: string, hops = trustedProxyHops()): void {
  if (hops === 0) for (const name of FORWARDED_HEADERS) delete req.headers[name];
  req.headers[PEER_HEADER] = `${secret} ${req.socket?.remoteAddress ?? "unknown"}`;
}

/**
 * Runs guardIncomingHeaders on every request any HTTP server of this process receives, before
 * its handlers do. Called once from instrumentation.ts `register()` (Node runtime); repeated
 * calls do nothing. Requests that arrived before it ran carry no verified address.
 */
export function installForwardedHeaderGuard(): void {
  const holder = globalThis as Holder;
  if (holder[SECRET]) return;
  const secret = crypto.randomBytes(18).toString("base64url");
  for (const proto of [http.Server.prototype, https.Server.prototype] as { emit: (event: string | symbol, ...args: unknown[]) => boolean }[]) {
    const emit = proto.emit;
    proto.emit = function guardedEmit(this: unknown, event: string | symbol, ...args: unknown[]) {
      if (event === "request" && args[0] instanceof http.IncomingMessage) guardIncomingHeaders(args[0], secret);
      return emit.call(this, event, ...args);
    };
  }
  holder[SECRET] = secret;
}

/** The socket's address as the guard recorded it, or null when the header is missing or forged. */
export function peerAddress(headers: Headers): string | null {
  const secret = (globalThis as Holder)[SECRET];
  const value = headers.get(PEER_HEADER);
  if (!secret || !value) return null;
  const space = value.indexOf(" ");
  if (space <= 0) return null;
  const given = Buffer.from(value.slice(0, space));
  const address = value.slice(space + 1);
  const expected = Buffer.from(secret);
  return address && given.length === expected.length && crypto.timingSafeEqual(given, expected) ? address : null;
}

let warned = false;

/**
 * The client's network address for the per-address sign-in limits. With no trusted proxy, the
 * socket's address. Behind N trusted proxies, the entry the outermost one appended to
 * X-Forwarded-For (entries to its left were written by the client and can't be believed); a
 * request that bypassed them (shorter chain) counts by its socket. Without a verified address
 * (the guard not installed, or a request from before it was) every such request shares one
 * bucket, so rotating headers still gains nothing.
 */
export function clientIp(headers: Headers): string {
  const hops = trustedProxyHops();
  const peer = peerAddress(headers);
  if (hops > 0) {
    const chain = (headers.get("x-forwarded-for") ?? "")
      .split(",")
      .map((part) => part.trim())
      .filter(Boolean);
    if (chain.length >= hops) return chain[chain.length - hops]!;
  }
  if (peer) return peer;
  if (!warned && !(globalThis as Holder)[SECRET]) {
    warned = true;
    console.warn("client-ip: the forwarded-header guard is not installed (instrumentation.ts); per-address limits count all such requests as one address");
  }
  return "unverified";
}
