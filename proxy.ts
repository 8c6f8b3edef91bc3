import { NextResponse, type NextRequest } from "next/server";

// Redirect only: a visitor without a session cookie goes to sign-in first. Whether a
// signed-in person may see a page is decided inside the page, handler or action.
// (Large sessions are split into "….0", "….1" cookies, hence the prefix match.)
const SESSION_COOKIES = ["authjs.session-token", "__Secure-authjs.session-token"];

export function proxy(request: NextRequest) {
  if (request.cookies.getAll().some((c) => SESSION_COOKIES.some((name) => c.name.startsWith(name)))) return NextResponse.next();
  const url = request.nextUrl.clone();
  url.pathname = "/sign-in";
  url.search = `?next=${encodeURIComponent(request.nextUrl.pathname)}`;
  return NextResponse.redirect(url);
}

export const config = { matcher: ["/shop/:path*", "/my/:path*"] };
