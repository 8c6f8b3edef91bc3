import { NextResponse, type NextRequest } from "next/server";
import { actionRefusal } from "@/lib/action-guard";
import { badPathSegment, securityHeaders } from "@/lib/security-headers";

// Runs before every page and API request (not static files, photo uploads or webhooks: see the
// matcher). It never decides access; that is done inside each page, handler and action. It:
// - answers 400 for a path that isn't valid percent-encoding (Next would answer a bare 500);
// - screens server-action posts (lib/action-guard.ts): a foreign origin, a body that isn't a
//   readable multipart form of at most 6 MB gets a 4xx before Next decodes it (Next: 500);
// - sends visitors with no session cookie to sign-in first, for the shop and owner areas;
// - gives each request a fresh CSP nonce (request header `x-nonce`, and the request's
//   Content-Security-Policy, from which Next puts the nonce on its own scripts), and sets the
//   security headers of lib/security-headers.ts on the answer.
// A nonce on every page means every page is rendered per request (app/layout.tsx); cached
// HTML would carry a stale nonce and its scripts would be refused.

// (Large sessions are split into "….0", "….1" cookies, hence the prefix match.)
const SESSION_COOKIES = ["authjs.session-token", "__Secure-authjs.session-token"];
const SIGNED_IN_AREAS = /^\/(shop|my)(\/|$)/;

export async function proxy(request: NextRequest) {
  const { pathname } = new URL(request.url);
  if (badPathSegment(pathname) !== null) {
    return NextResponse.json({ error: { code: "bad_request", message: "The address has a malformed %-escape; encode it again (UTF-8)." } }, { status: 400 });
  }
  const ownOrigins = new Set([request.nextUrl.origin, ...(process.env.APP_URL && URL.canParse(process.env.APP_URL) ? [new URL(process.env.APP_URL).origin] : [])]);
  // /api/… and /u/… (one-click unsubscribe) are route handlers: Next never decodes them as actions.
  const refusedAction = await actionRefusal(request, ownOrigins, { page: !/^\/(api|u)\//.test(pathname) });
  if (refusedAction) return NextResponse.json({ error: { code: refusedAction.code, message: refusedAction.message } }, { status: refusedAction.status });
  if (SIGNED_IN_AREAS.test(pathname) && !request.cookies.getAll().some((c) => SESSION_COOKIES.some((name) => c.name.startsWith(name)))) {
    const url = request.nextUrl.clone();
    url.pathname = "/sign-in";
    url.search = `?next=${encodeURIComponent(request.nextUrl.pathname)}`;
    return NextResponse.redirect(url);
  }

  const nonce = btoa(crypto.randomUUID());
  const headers = securityHeaders(pathname, nonce, process.env);
  const forward = new Headers(request.headers);
  forward.set("x-nonce", nonce);
  forward.set("content-security-policy", headers["Content-Security-Policy"]!);
  const response = NextResponse.next({ request: { headers: forward } });
  for (const [name, value] of Object.entries(headers)) response.headers.set(name, value);
  return response;
}

export const config = {
  // Everything but build assets, fonts, photo uploads and webhooks: the proxy reads at most 10 MB
  // of a body, and those two take large or raw bodies. An upload path whose job segment is
  // malformed still comes here (the exclusion names only well-formed ids) and gets its 400.
  matcher: ["/((?!_next/static/|_next/image|fonts/|favicon\\.ico|api/webhooks/|api/jobs/[A-Za-z0-9_-]+/photos(?:/|$)).*)"],
};
