// What the staff app's service worker (lib/offline/sw.ts) keeps, and what it never keeps. Pure and
// browser-free, so the worker, the page that registers it and the unit tests share one reading.

/** The worker's address (next.config.mjs rewrites it to this build's file) and the part of the site it controls. */
export const SW_URL = "/sw.js";
export const SW_SCOPE = "/shop/";

/** Staff job and bench pages: network first, the copy from the last visit when the network is gone. */
export const PAGES_CACHE = "benchside-pages";
/** Photos those pages show (app-served, checked per reader), kept beside the pages they belong to. */
export const PHOTOS_CACHE = "benchside-photos";
/** Build files (/_next/static/…: hashed names, never change) that weren't in the precache list. */
export const STATIC_CACHE = "benchside-static";

/**
 * The caches that hold what one signed-in person may see. Emptied when they sign out, when the
 * server sends a page request to sign-in (the session is gone) and when someone else signs in on
 * the same phone (components/service-worker.tsx).
 */
export const PRIVATE_CACHES: readonly string[] = [PAGES_CACHE, PHOTOS_CACHE];

/** Who the private caches were filled for, per browser (localStorage). */
export const CACHE_OWNER_KEY = "benchside:offline-owner";

// A job and its bench tools (the pages the camera is allowed on, lib/security-headers.ts). Not with a
// trailing slash: Next redirects that address, and a redirected page is never kept.
const OFFLINE_PAGE = /^\/shop\/[^/]+\/jobs\/\d+(?:\/bench)?$/;
const PHOTO = /^\/api\/photos\/[^/]+\/[^/]+\/?$/;

type RequestLike = { url: string; method: string; headers: { has(name: string): boolean } };

const own = (url: URL, origin: string) => url.origin === origin;

/** Next's client router asks for a page's React payload with an `RSC` header or `_rsc` query: never a cached page. */
function isReactPayload(req: RequestLike, url: URL): boolean {
  return req.headers.has("rsc") || req.headers.has("next-router-prefetch") || url.searchParams.has("_rsc");
}

/** Nothing of sign-in, and nothing but GET, is ever answered from or written to a cache. */
export function neverCached(req: RequestLike, origin: string): boolean {
  const url = new URL(req.url);
  return req.method !== "GET" || !own(url, origin) || url.pathname === "/api/auth" || url.pathname.startsWith("/api/auth/");
}

/** A staff job or bench page as a document (a navigation, or the page's own address sent by the window to be kept). */
export function isOfflinePage(req: RequestLike, origin: string): boolean {
  if (neverCached(req, origin)) return false;
  const url = new URL(req.url);
  return isOfflinePath(url.pathname) && !isReactPayload(req, url);
}

/** The path of a staff job or bench page. */
export function isOfflinePath(pathname: string): boolean {
  return OFFLINE_PAGE.test(pathname);
}

/** A build file: content-hashed names, so the first copy is good for as long as the build lives. */
export function isStaticAsset(req: RequestLike, origin: string): boolean {
  if (neverCached(req, origin)) return false;
  return new URL(req.url).pathname.startsWith("/_next/static/");
}

/** A journal photo rendition (GET /api/photos/:photo/:size). No other API answer is ever cached. */
export function isCachedPhoto(req: RequestLike, origin: string): boolean {
  if (neverCached(req, origin)) return false;
  return PHOTO.test(new URL(req.url).pathname);
}

/** A page request the server answered by sending the visitor to sign in: their session is over. */
export function endedSession(response: { redirected: boolean; url: string }): boolean {
  if (!response.redirected || !response.url) return false;
  try {
    return new URL(response.url).pathname.startsWith("/sign-in");
  } catch {
    return false;
  }
}

/** Only whole, first-hand pages are kept: a redirect (to sign-in, say) or an error page never is. */
export function keepable(response: { status: number; redirected: boolean; type?: string }): boolean {
  return response.status === 200 && !response.redirected && response.type !== "opaque";
}

