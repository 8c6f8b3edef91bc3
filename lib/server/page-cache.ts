import "server-only";
import { createHash, randomBytes, randomUUID } from "node:crypto";
import { getToken } from "next-auth/jwt";
import { NextResponse, type NextRequest } from "next/server";
import { LRUCache } from "lru-cache";
import { jobPageVersions, type JobPageRef } from "@/db/queries/page-versions";
import { countUnread } from "@/db/queries/inbox";
import type { Actor } from "@/lib/permissions";
import { actorOfSession } from "@/lib/server/actor";

// The job pages, rendered once and served again while nothing they show has changed (issue 17).
//
// A job page is rendered per request for its viewer (their roles, their follow settings, their
// name in the header) and costs tens of milliseconds of server time; a page served from memory
// costs a fraction of one. proxy.ts asks servePageFromCache for a signed-in person's page load
// (GET, HTML, not a client-side navigation):
// - the session is checked as every page checks it (lib/server/actor.ts: live, not ended, roles
//   read fresh), and the page's counters are read (db/page-versions.ts: every write to anything a
//   page shows moves one, by triggers, whoever writes);
// - the key is the address, the request's cookies, the actor and the counters (and, on the staff
//   pages, the person's unread count in the shop's inbox, which the navigation shows): the same
//   person in the same session, seeing the same data, gets the same page; anything else renders again;
// - on a miss the proxy has the page rendered by this same server (a request to itself, marked
//   with this process's secret and carrying a one-off placeholder as its CSP nonce), keeps the
//   HTML, and answers with it; every answer, first or later, gets a fresh nonce in place of the
//   placeholder, so the page's policy stays "scripts with this response's nonce only";
// - entries live at most TTL_MS (a backstop for what a counter can't see: the clock) and the
//   cache holds at most PAGE_CACHE_MB of HTML (least recently used out first).
// A hard reload (Cache-Control: no-cache) renders afresh. PAGE_CACHE=off turns the cache off.

const TTL_MS = 60_000;
const RENDER_TIMEOUT_MS = 30_000;
export const RENDER_HEADER = "x-benchside-render";
export const CACHE_STATE_HEADER = "x-benchside-page";
/** The request's CSP nonce in the inner render: the placeholder the cache swaps for each answer's own. */
const PLACEHOLDER_HEADER = "x-benchside-nonce-placeholder";

type Entry = { body: string; placeholder: string; status: number; headers: [string, string][] };
type State = { secret: string; cache: LRUCache<string, Entry>; pending: Map<string, Promise<Entry | null>> };

// On globalThis: the proxy and the pages are bundled apart in one process and share the secret.
const KEY = Symbol.for("benchside.page-cache");
const holder = globalThis as typeof globalThis & { [KEY]?: State };
function state(): State {
  return (holder[KEY] ??= {
    secret: randomBytes(32).toString("base64url"),
    cache: new LRUCache<string, Entry>({
      maxSize: Math.max(1, Number(process.env.PAGE_CACHE_MB ?? 64)) * 1024 * 1024,
      sizeCalculation: (e) => e.body.length * 2 + 2048,
      ttl: TTL_MS,
    }),
    pending: new Map(),
  });
}

const OWNER_JOB = /^\/my\/jobs\/([A-Za-z0-9_-]{1,64})\/?$/;
const STAFF_JOB = /^\/shop\/([a-z0-9-]{1,80})\/jobs\/(\d{1,9})\/?$/;

/** The job page an address names, if it is one the cache serves. */
export function jobPageOf(pathname: string): JobPageRef | null {
  const owner = OWNER_JOB.exec(pathname);
  if (owner) return { area: "owner", publicId: owner[1]! };
  const staff = STAFF_JOB.exec(pathname);
  if (staff) return { area: "staff", shopSlug: staff[1]!, number: Number(staff[2]) };
  return null;
}

function enabled(): boolean {
  return process.env.NODE_ENV === "production" && process.env.PAGE_CACHE !== "off" && !!process.env.__NEXT_PRIVATE_ORIGIN;
}

/** The placeholder nonce of this process's own inner render, or null for every other request. */
export function innerRenderNonce(request: NextRequest): string | null {
  const mark = request.headers.get(RENDER_HEADER);
  if (!mark || mark !== state().secret) return null;
  const placeholder = request.headers.get(PLACEHOLDER_HEADER);
  return placeholder && /^[A-Za-z0-9+/=]{16,}$/.test(placeholder) ? placeholder : null;
}

/** A page load a person makes (not a client-side navigation, prefetch, action or hard reload). */
function cacheable(request: NextRequest): boolean {
  const h = request.headers;
  return (
    request.method === "GET" &&
    !h.has(RENDER_HEADER) &&
    !h.has("rsc") &&
    !h.has("next-action") &&
    !h.has("next-router-prefetch") &&
    !h.has("next-router-state-tree") &&
    (h.get("accept") ?? "").includes("text/html") &&
    !/no-cache|no-store/i.test(`${h.get("cache-control") ?? ""} ${h.get("pragma") ?? ""}`)
  );
}

/** The session cookie's names (https and plain), as next-auth sets them; large ones are split into "….0", "….1". */
export const SESSION_COOKIES = ["__Secure-authjs.session-token", "authjs.session-token"];

async function sessionActor(request: NextRequest): Promise<Actor | null> {
  const cookieName = SESSION_COOKIES.find((name) => request.cookies.getAll().some((c) => c.name === name || c.name.startsWith(`${name}.`)));
  const secret = process.env.AUTH_SECRET;
  if (!cookieName || !secret) return null;
  const token = await getToken({ req: request, secret, cookieName, salt: cookieName, secureCookie: cookieName.startsWith("__Secure-") });
  if (!token) return null;
  return actorOfSession(token.uid, token.sid);
}

// Hop-by-hop and per-answer headers of the inner render, not kept with the page.
const DROPPED = new Set(["content-length", "content-encoding", "transfer-encoding", "connection", "keep-alive", "date", "content-security-policy", CACHE_STATE_HEADER]);

async function render(request: NextRequest): Promise<Entry | null> {
  const s = state();
  const placeholder = btoa(randomUUID());
  const headers = new Headers();
  for (const [name, value] of request.headers) {
    if (["host", "connection", "content-length", "transfer-encoding", "keep-alive", "expect", "upgrade", "accept-encoding"].includes(name)) continue;
    headers.set(name, value);
  }
  // Uncompressed from itself (the answer to the person is compressed as usual). The pages build
  // their links from APP_URL, never from the request's host, which here is the server's own.
  headers.set("accept-encoding", "identity");
  headers.set(RENDER_HEADER, s.secret);
  headers.set(PLACEHOLDER_HEADER, placeholder);
  const url = new URL(request.nextUrl.pathname + request.nextUrl.search, process.env.__NEXT_PRIVATE_ORIGIN);
  const res = await fetch(url, { headers, redirect: "manual", signal: AbortSignal.timeout(RENDER_TIMEOUT_MS) });
  const body = await res.text();
  // Only a page itself: not a redirect (to sign-in, say), an error, or an answer that sets a cookie.
  if (res.status !== 200 || res.headers.has("set-cookie") || !(res.headers.get("content-type") ?? "").startsWith("text/html")) return null;
  const kept: [string, string][] = [];
  res.headers.forEach((value, name) => {
    if (!DROPPED.has(name)) kept.push([name, value]);
  });
  return { body, placeholder, status: res.status, headers: kept };
}

/**
 * The page from the cache (rendered first on a miss), with `securityHeaders(nonce)` for this
 * answer's fresh nonce; null when the cache doesn't serve this request (the proxy then lets Next
 * render it as usual).
 */
export async function servePageFromCache(request: NextRequest, securityHeaders: (nonce: string) => Record<string, string>): Promise<NextResponse | null> {
  if (!enabled() || !cacheable(request)) return null;
  const page = jobPageOf(request.nextUrl.pathname);
  if (!page) return null;
  const [actor, found] = await Promise.all([sessionActor(request), jobPageVersions(page)]);
  if (!actor || !found) return null;
  // The staff navigation's unread count covers every job of the shop: read as the layout reads it.
  const unread = page.area === "staff" ? await countUnread({ shopId: found.shopId, userId: actor.userId }) : null;
  const key = createHash("sha256")
    .update([request.nextUrl.pathname + request.nextUrl.search, request.headers.get("cookie") ?? "", JSON.stringify(actor), found.versions, String(unread)].join("\n"))
    .digest("base64url");
  const s = state();
  let entry = s.cache.get(key) ?? null;
  const hit = entry !== null;
  if (!entry) {
    let pending = s.pending.get(key);
    if (!pending) {
      pending = render(request)
        .catch((error: unknown) => {
          console.warn(`page cache: rendering ${request.nextUrl.pathname} for the cache failed (${error instanceof Error ? error.message : String(error)}); rendered per request instead`);
          return null;
        })
        .then((made) => {
          if (made) s.cache.set(key, made);
          return made;
        })
        .finally(() => s.pending.delete(key));
      s.pending.set(key, pending);
    }
    entry = await pending;
    if (!entry) return null;
  }
  const nonce = btoa(randomUUID());
  const headers = new Headers(entry.headers);
  for (const [name, value] of Object.entries(securityHeaders(nonce))) headers.set(name, value);
  headers.set(CACHE_STATE_HEADER, hit ? "cached" : "rendered");
  return new NextResponse(entry.body.split(entry.placeholder).join(nonce), { status: entry.status, headers });
}
