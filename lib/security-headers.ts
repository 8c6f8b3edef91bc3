// The headers every page and API answer carries, worked out per request in proxy.ts (the nonce
// is new each time, on the pages rendered per request; the hosts come from the environment the
// app runs in, not the one it was built in). The fixed ones (nosniff, X-Frame-Options, Referrer-Policy) are in next.config.mjs
// for every path, static files and the routes the proxy leaves alone included.
// No Node or Next imports: proxy.ts and the unit tests use it as it is.

export type HeaderEnv = Partial<
  Record<
    | "NODE_ENV"
    | "APP_URL"
    | "MUX_BASE_URL"
    | "VIDEO_UPLOAD_ORIGINS"
    | "STRIPE_API_HOST"
    | "STRIPE_API_PORT"
    | "STRIPE_API_PROTOCOL"
    | "PAYMENTS_CHECKOUT_ORIGIN",
    string
  >
>;

function origin(url: string | undefined): string | null {
  if (!url) return null;
  try {
    const { protocol, origin } = new URL(url);
    return protocol === "http:" || protocol === "https:" ? origin : null;
  } catch {
    return null;
  }
}

/**
 * Where the browser sends a clip, in chunks (a direct upload of the video service). The local
 * fake takes uploads at MUX_BASE_URL itself; the hosted service hands out upload URLs on a
 * storage host of its own: VIDEO_UPLOAD_ORIGINS (comma-separated) names it, and without either
 * the hosted default is assumed (https://storage.googleapis.com, from memory, unverified).
 */
export function videoUploadOrigins(env: HeaderEnv): string[] {
  const listed = (env.VIDEO_UPLOAD_ORIGINS ?? "").split(",").map((s) => origin(s.trim()));
  const found = [...new Set([...listed, origin(env.MUX_BASE_URL)].filter((o): o is string => !!o))];
  return found.length ? found : ["https://storage.googleapis.com"];
}

/**
 * The payment service's checkout page, where a Pay button's form ends up (a redirect after a
 * form post is checked against form-action). The local fake serves it from its API address;
 * the hosted one from its checkout host (PAYMENTS_CHECKOUT_ORIGIN; https://checkout.stripe.com
 * by default, from memory, unverified).
 */
export function paymentsOrigin(env: HeaderEnv): string | null {
  if (env.PAYMENTS_CHECKOUT_ORIGIN) return origin(env.PAYMENTS_CHECKOUT_ORIGIN);
  if (env.STRIPE_API_HOST) {
    const protocol = env.STRIPE_API_PROTOCOL === "http" ? "http" : "https";
    return origin(`${protocol}://${env.STRIPE_API_HOST}${env.STRIPE_API_PORT ? `:${env.STRIPE_API_PORT}` : ""}`);
  }
  return "https://checkout.stripe.com";
}

const isHttps = (env: HeaderEnv) => origin(env.APP_URL)?.startsWith("https://") ?? false;

/** Everything but scripts, the same for every page: our own origin, plus the video upload host for connections and the checkout host for forms. */
function pagePolicy(scriptSrc: string[], env: HeaderEnv): string {
  const directives = [
    "default-src 'self'",
    `script-src ${scriptSrc.join(" ")}`,
    ...(scriptSrc.includes("'unsafe-inline'") ? ["script-src-attr 'none'"] : []),
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "media-src 'self' blob:",
    "font-src 'self'",
    ["connect-src 'self'", ...videoUploadOrigins(env)].join(" "),
    "worker-src 'self' blob:",
    "frame-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    ["form-action 'self'", paymentsOrigin(env)].filter(Boolean).join(" "),
    "frame-ancestors 'none'",
  ];
  if (isHttps(env)) directives.push("upgrade-insecure-requests");
  return directives.join("; ");
}

// React's development build evaluates code for its error overlay and stack traces.
const devEval = (env: HeaderEnv) => (env.NODE_ENV !== "production" ? ["'unsafe-eval'"] : []);

/**
 * The policy of a page rendered per request: scripts only with this request's nonce (and what
 * they load: 'strict-dynamic'), everything else from our own origin, plus the video upload host
 * for connections and the checkout host for forms. Inline style attributes stay allowed: React
 * renders them and the video player's shadow DOM needs them; a style can't run code.
 */
export function pageCsp(nonce: string, env: HeaderEnv): string {
  return pagePolicy(["'self'", `'nonce-${nonce}'`, "'strict-dynamic'", ...devEval(env)], env);
}

/**
 * The shops' public pages (/s/…) are prerendered on first visit and served from Next's cache
 * (ISR) until a change drops them, so their HTML can't carry a per-request nonce. Next's App
 * Router puts the page's data in inline <script> tags (self.__next_f.push(…)) that differ per page
 * and per render; its experimental SRI hashes only the external bundles, and hashes of the inline
 * ones would have to be worked out from each cached page. So these pages allow inline scripts,
 * the "without nonces" policy of Next's CSP guide, and nothing else is loosened: scripts only
 * from our own origin (no 'strict-dynamic', so nothing they load from elsewhere runs), no inline
 * event-handler attributes (script-src-attr 'none', CSP Level 3), no plugins, no <base>, forms
 * only to us and the checkout host, never framed. These pages show only what a shop published,
 * with no session of ours (proxy.ts sends no signed-in area here), and React escapes every text.
 */
export function staticPageCsp(env: HeaderEnv): string {
  return pagePolicy(["'self'", "'unsafe-inline'", ...devEval(env)], env);
}

/** Pages served from the static cache: the shops' public pages and what hangs off them (/s/…). */
export function isStaticPage(pathname: string): boolean {
  return pathname === "/s" || pathname.startsWith("/s/");
}

/** API answers (JSON, photos, PDFs) are never framed; anything more would get in the way of the PDF viewer. */
export const API_CSP = "frame-ancestors 'none'";

// The staff job page and its bench tools are where photos and clips are taken.
const CAPTURE_PAGES = /^\/shop\/[^/]+\/jobs\/\d+(?:\/bench)?\/?$/;

export function permissionsPolicy(pathname: string): string {
  const capture = CAPTURE_PAGES.test(pathname) ? "(self)" : "()";
  return `camera=${capture}, microphone=${capture}, geolocation=(), payment=(), usb=()`;
}

/** Whether the path is a page rendered per request, which needs a fresh nonce (proxy.ts makes one only then). */
export function needsNonce(pathname: string): boolean {
  return !(pathname === "/api" || pathname.startsWith("/api/")) && !isStaticPage(pathname);
}

/** The per-request security headers for a path, with `nonce` for pages rendered per request (null elsewhere). */
export function securityHeaders(pathname: string, nonce: string | null, env: HeaderEnv): Record<string, string> {
  const api = pathname === "/api" || pathname.startsWith("/api/");
  let csp = API_CSP;
  if (!api && isStaticPage(pathname)) csp = staticPageCsp(env);
  else if (!api) {
    if (!nonce) throw new Error(`${pathname} is rendered per request: its policy needs this request's nonce`);
    csp = pageCsp(nonce, env);
  }
  const headers: Record<string, string> = {
    "Content-Security-Policy": csp,
    "Permissions-Policy": permissionsPolicy(pathname),
  };
  if (isHttps(env)) headers["Strict-Transport-Security"] = "max-age=31536000";
  return headers;
}

/** The first path segment that isn't valid percent-encoded UTF-8 (`%ZZ`, `%FF`, `%C0%AE`), if any. */
export function badPathSegment(pathname: string): string | null {
  for (const segment of pathname.split("/")) {
    try {
      decodeURIComponent(segment);
    } catch {
      return segment;
    }
  }
  return null;
}
