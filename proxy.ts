import { NextResponse, type NextRequest } from "next/server";
import { actionRefusal } from "@/lib/action-guard";
import { badPathSegment, needsNonce, securityHeaders } from "@/lib/security-headers";
import { DATABASE_UNAVAILABLE_MESSAGE } from "@/lib/errors";
import { databaseAnswers } from "@/lib/server/db-health";
import { MISSING_PUBLIC_PAGE, publicPageAddress } from "@/lib/public-pages";
import { publicPageShown } from "@/lib/server/public-gate";
import { SESSION_COOKIES, innerRenderNonce, servePageFromCache } from "@/lib/server/page-cache";

// Runs before every page and API request (not static files, photo uploads or webhooks: see the
// matcher). It never decides access; that is done inside each page, handler and action. It:
// - answers 400 for a path that isn't valid percent-encoding (Next would answer a bare 500);
// - screens server-action posts (lib/action-guard.ts): a foreign origin, a body that isn't a
//   readable multipart form of at most 6 MB gets a 4xx before Next decodes it (Next: 500);
// - sends visitors with no session cookie to sign-in first, for the shop and owner areas;
// - serves a signed-in person's job page from the page cache while nothing it shows has changed
//   (lib/server/page-cache.ts: the session is checked as the page checks it, the rest of access
//   is the page's own, decided when it was rendered for this same session and data);
// - gives each request for a page rendered per request a fresh CSP nonce (request header
//   `x-nonce`, and the request's Content-Security-Policy, from which Next puts the nonce on its
//   own scripts), and sets the security headers of lib/security-headers.ts on the answer.
// The shops' public pages (/s/…) are served from Next's cache (ISR), so they get a policy
// without a nonce (lib/security-headers.ts says why) and no nonce reaches their render: the
// signed-in areas and every other page stay per request (the layouts call connection()). A
// public page that isn't shown (unknown shop, story not published) is sent to one 404 address
// before Next renders it, so made-up addresses don't fill the page cache (lib/public-pages.ts).

const SIGNED_IN_AREAS = /^\/(shop|my)(\/|$)/;

export async function proxy(request: NextRequest) {
  const { pathname } = new URL(request.url);
  if (badPathSegment(pathname) !== null) {
    return NextResponse.json({ error: { code: "bad_request", message: "The address has a malformed %-escape; encode it again (UTF-8)." } }, { status: 400 });
  }
  const ownOrigins = new Set([request.nextUrl.origin, ...(process.env.APP_URL && URL.canParse(process.env.APP_URL) ? [new URL(process.env.APP_URL).origin] : [])]);
  // Any other path may end at a page (a not-found one, say), which Next decodes a multipart POST
  // for as a possible no-JS form action; /u/<token> is the one-click route handler, which mail
  // services post to as a form from elsewhere (RFC 8058).
  const refusedAction = await actionRefusal(request, ownOrigins, { page: !/^\/u\/[^/]+$/.test(pathname) });
  if (refusedAction) return NextResponse.json({ error: { code: refusedAction.code, message: refusedAction.message } }, { status: refusedAction.status });
  // Pages and form posts while the database is down: a real 503 (route handlers answer their own).
  if (!pathname.startsWith("/api/") && !(await databaseAnswers())) return databaseDown(request);
  if (SIGNED_IN_AREAS.test(pathname) && !request.cookies.getAll().some((c) => SESSION_COOKIES.some((name) => c.name.startsWith(name)))) {
    const url = request.nextUrl.clone();
    url.pathname = "/sign-in";
    url.search = `?next=${encodeURIComponent(request.nextUrl.pathname)}`;
    return NextResponse.redirect(url);
  }

  // A job page a person loads again, unchanged: from the page cache, with a fresh nonce (lib/server/page-cache.ts).
  const cached = await servePageFromCache(request, (fresh) => securityHeaders(pathname, fresh, process.env));
  if (cached) return cached;

  // The page cache's own render of a page carries its placeholder as the nonce, swapped for a fresh one in every answer.
  const nonce = innerRenderNonce(request) ?? (needsNonce(pathname) ? btoa(crypto.randomUUID()) : null);
  const headers = securityHeaders(pathname, nonce, process.env);
  const forward = new Headers(request.headers);
  if (nonce) {
    forward.set("x-nonce", nonce);
    forward.set("content-security-policy", headers["Content-Security-Policy"]!);
  } else {
    // Next takes a nonce from the request's policy: none may come from the visitor into a cached page.
    forward.delete("x-nonce");
    forward.delete("content-security-policy");
  }
  const address = request.method === "GET" || request.method === "HEAD" ? publicPageAddress(pathname) : null;
  const response =
    address && !(await publicPageShown(address))
      ? NextResponse.rewrite(new URL(MISSING_PUBLIC_PAGE, request.url), { request: { headers: forward } })
      : NextResponse.next({ request: { headers: forward } });
  for (const [name, value] of Object.entries(headers)) response.headers.set(name, value);
  return response;
}

/** 503 with Retry-After: a short page for a person, the usual error body for a form post or a client fetch. */
function databaseDown(request: NextRequest) {
  const headers = { "retry-after": "5", "cache-control": "no-store" };
  if (request.method !== "GET" || !(request.headers.get("accept") ?? "").includes("text/html")) {
    return NextResponse.json({ error: { code: "unavailable", message: DATABASE_UNAVAILABLE_MESSAGE } }, { status: 503, headers });
  }
  const page = `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><meta http-equiv="refresh" content="5"><title>Back in a moment · Benchside</title></head><body style="font-family:system-ui,sans-serif;max-width:32rem;margin:4rem auto;padding:0 1rem;line-height:1.5"><h1>Back in a moment</h1><p>${DATABASE_UNAVAILABLE_MESSAGE}</p><p>This page tries again by itself every few seconds; nothing you saved is lost.</p></body></html>`;
  return new NextResponse(page, { status: 503, headers: { ...headers, "content-type": "text/html; charset=utf-8" } });
}

export const config = {
  // Everything but build assets, fonts, photo uploads and webhooks: the proxy reads at most 10 MB
  // of a body, and those two take large or raw bodies. Only their exact paths are left out: an
  // upload path whose job segment is malformed still comes here and gets its 400, and one with
  // more segments (no route: the not-found page) gets its form post screened.
  matcher: ["/((?!_next/static/|_next/image|fonts/|favicon\\.ico|api/webhooks/(?:payments|video)/?$|api/jobs/[A-Za-z0-9_-]+/photos/?$).*)"],
};
