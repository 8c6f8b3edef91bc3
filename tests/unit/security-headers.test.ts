import { describe, expect, it } from "vitest";
import { API_CSP, badPathSegment, isStaticPage, needsNonce, pageCsp, paymentsOrigin, permissionsPolicy, securityHeaders, staticPageCsp, videoUploadOrigins } from "@/lib/security-headers";

// What proxy.ts puts on every answer. Directive names and syntax: W3C Content Security Policy
// Level 3 (§6); Permissions-Policy: W3C Permissions Policy (structured header, allowlists "()"
// and "(self)"); Strict-Transport-Security: RFC 6797 §6.1.
const LOCAL = {
  NODE_ENV: "production",
  APP_URL: "http://localhost:3110",
  MUX_BASE_URL: "http://127.0.0.1:4120",
  STRIPE_API_HOST: "127.0.0.1",
  STRIPE_API_PORT: "4130",
  STRIPE_API_PROTOCOL: "http",
};

const directives = (csp: string) => Object.fromEntries(csp.split(";").map((d) => d.trim().split(/\s+/)).map(([name, ...values]) => [name, values]));

describe("the page Content-Security-Policy", () => {
  it("runs only scripts carrying this request's nonce, and whatever they load", () => {
    const csp = directives(pageCsp("abc123", LOCAL));
    expect(csp["script-src"]).toEqual(["'self'", "'nonce-abc123'", "'strict-dynamic'"]);
    expect(csp["object-src"]).toEqual(["'none'"]);
    expect(csp["base-uri"]).toEqual(["'self'"]);
    expect(csp["frame-ancestors"]).toEqual(["'none'"]);
  });

  it("lets pages talk only to our origin and the configured video upload host, and post forms only to us and the checkout host", () => {
    const csp = directives(pageCsp("n", LOCAL));
    expect(csp["default-src"]).toEqual(["'self'"]);
    expect(csp["connect-src"]).toEqual(["'self'", "http://127.0.0.1:4120"]);
    expect(csp["form-action"]).toEqual(["'self'", "http://127.0.0.1:4130"]);
    expect(csp["upgrade-insecure-requests"]).toBeUndefined();
  });

  it("allows eval only in development, and upgrades requests only when the app is served over https", () => {
    expect(directives(pageCsp("n", { ...LOCAL, NODE_ENV: "development" }))["script-src"]).toContain("'unsafe-eval'");
    expect(directives(pageCsp("n", LOCAL))["script-src"]).not.toContain("'unsafe-eval'");
    expect(directives(pageCsp("n", { ...LOCAL, APP_URL: "https://bench.example.test" }))["upgrade-insecure-requests"]).toEqual([]);
  });

  it("hosted services: an extra upload host from VIDEO_UPLOAD_ORIGINS, the hosted checkout without a local host; junk is ignored", () => {
    expect(videoUploadOrigins({ VIDEO_UPLOAD_ORIGINS: "https://uploads.video.test/path, not a url, ftp://x.test" })).toEqual(["https://uploads.video.test"]);
    // Hosted service, nothing configured: its upload storage host (from memory, unverified).
    expect(videoUploadOrigins({})).toEqual(["https://storage.googleapis.com"]);
    expect(paymentsOrigin({})).toBe("https://checkout.stripe.com");
    expect(paymentsOrigin({ PAYMENTS_CHECKOUT_ORIGIN: "https://pay.example.test/x" })).toBe("https://pay.example.test");
  });
});

describe("the policy of the cached public pages (/s/…)", () => {
  it("allows inline scripts (Next's data scripts in cached HTML) but no nonce, no 'strict-dynamic', no inline handlers", () => {
    const csp = directives(staticPageCsp(LOCAL));
    expect(csp["script-src"]).toEqual(["'self'", "'unsafe-inline'"]);
    // A nonce or hash in the list would make browsers ignore 'unsafe-inline', and 'strict-dynamic' would drop 'self' (CSP Level 3).
    expect(staticPageCsp(LOCAL)).not.toMatch(/'nonce-|'sha\d+-|'strict-dynamic'/);
    expect(csp["script-src-attr"]).toEqual(["'none'"]);
    expect(staticPageCsp(LOCAL)).not.toContain("unsafe-eval");
  });

  it("keeps everything else as strict as the per-request policy", () => {
    const csp = directives(staticPageCsp(LOCAL));
    const strict = directives(pageCsp("n", LOCAL));
    for (const name of ["default-src", "style-src", "img-src", "media-src", "font-src", "connect-src", "worker-src", "frame-src", "object-src", "base-uri", "form-action", "frame-ancestors"]) {
      expect(csp[name], name).toEqual(strict[name]);
    }
    expect(csp["object-src"]).toEqual(["'none'"]);
    expect(csp["base-uri"]).toEqual(["'self'"]);
    expect(csp["form-action"]).toEqual(["'self'", "http://127.0.0.1:4130"]);
    expect(csp["frame-ancestors"]).toEqual(["'none'"]);
    // The per-request policy has no inline scripts at all, so it needs no script-src-attr.
    expect(strict["script-src-attr"]).toBeUndefined();
  });

  it("eval only in development; upgrade only over https", () => {
    expect(directives(staticPageCsp({ ...LOCAL, NODE_ENV: "development" }))["script-src"]).toEqual(["'self'", "'unsafe-inline'", "'unsafe-eval'"]);
    expect(directives(staticPageCsp({ ...LOCAL, APP_URL: "https://bench.example.test" }))["upgrade-insecure-requests"]).toEqual([]);
  });

  it("is the policy of /s/… only; every other page gets this request's nonce, and the API its own", () => {
    for (const path of ["/s/copper-gulch", "/s/copper-gulch/ridgeline-front-end", "/s/copper-gulch/opengraph-image-1y4kbw", "/s"]) {
      expect(isStaticPage(path), path).toBe(true);
      expect(needsNonce(path), path).toBe(false);
      expect(securityHeaders(path, null, LOCAL)["Content-Security-Policy"], path).toBe(staticPageCsp(LOCAL));
      // A nonce handed in by mistake never reaches a cached page's policy.
      expect(securityHeaders(path, "n", LOCAL)["Content-Security-Policy"], path).not.toContain("nonce");
    }
    for (const path of ["/", "/sitemap.xml", "/start", "/shop/copper-gulch", "/sign-in", "/my/jobs/abc", "/ss/x"]) {
      expect(isStaticPage(path), path).toBe(false);
      expect(needsNonce(path), path).toBe(true);
      expect(securityHeaders(path, "n", LOCAL)["Content-Security-Policy"], path).toBe(pageCsp("n", LOCAL));
    }
    expect(needsNonce("/api/jobs/abc/timeline")).toBe(false);
    expect(securityHeaders("/api/health", null, LOCAL)["Content-Security-Policy"]).toBe(API_CSP);
  });

  it("a page rendered per request without a nonce is a programming error, not a page without a policy", () => {
    expect(() => securityHeaders("/shop/copper-gulch", null, LOCAL)).toThrow(/needs this request's nonce/);
  });
});

describe("per-path headers", () => {
  it("API answers get only frame-ancestors (a PDF must still open in the browser's viewer)", () => {
    expect(securityHeaders("/api/jobs/abc/timeline", "n", LOCAL)["Content-Security-Policy"]).toBe(API_CSP);
    expect(securityHeaders("/apiary", "n", LOCAL)["Content-Security-Policy"]).toContain("'nonce-n'");
  });

  it("the camera (and the clip's sound) only on the staff job page and its bench tools", () => {
    for (const path of ["/shop/copper-gulch/jobs/5", "/shop/copper-gulch/jobs/5/bench", "/shop/copper-gulch/jobs/12/"]) {
      expect(permissionsPolicy(path), path).toBe("camera=(self), microphone=(self), geolocation=(), payment=(), usb=()");
    }
    for (const path of ["/", "/shop/copper-gulch", "/shop/copper-gulch/jobs/new", "/shop/copper-gulch/jobs/5/invoice", "/my/jobs/abc", "/s/copper-gulch"]) {
      expect(permissionsPolicy(path), path).toBe("camera=(), microphone=(), geolocation=(), payment=(), usb=()");
    }
  });

  it("HSTS only when APP_URL is https (RFC 6797: ignored over plain http anyway)", () => {
    expect(securityHeaders("/", "n", LOCAL)["Strict-Transport-Security"]).toBeUndefined();
    expect(securityHeaders("/", "n", { ...LOCAL, APP_URL: "https://bench.example.test" })["Strict-Transport-Security"]).toBe("max-age=31536000");
  });
});

describe("malformed escapes in the path", () => {
  it.each(["/api/jobs/%ZZ/timeline", "/api/jobs/%FF/timeline", "/api/jobs/%C0%AE/timeline", "/shop/%E2%82/jobs", "/x/%"])("%s is refused", (path) => {
    expect(badPathSegment(path)).not.toBeNull();
  });
  it.each(["/api/jobs/abc/timeline", "/s/caf%C3%A9/story", "/a%20b", "/"])("%s passes", (path) => {
    expect(badPathSegment(path)).toBeNull();
  });
});
