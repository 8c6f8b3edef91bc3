import http from "node:http";
import type { AddressInfo } from "node:net";
import { type APIResponse, type Browser, type Page, request as apiRequest, expect, test } from "@playwright/test";
import bcrypt from "bcryptjs";
import { publicIdOf, sql } from "./db";
import { SignInPage } from "./pages/sign-in-page";
import { CUSTOMERS, FORMER_STAFF, type Persona, STAFF, storageStatePath } from "./personas";

// Security headers on every page for every visitor (proxy.ts, lib/security-headers.ts,
// next.config.mjs), and what they are for: the signed-in approval page can't be framed by a
// same-site page on another port, the nonce CSP doesn't break any page (nor does the no-nonce
// policy of the cached public pages under /s/), a forged
// X-Forwarded-Host never becomes a redirect, a copied session cookie stops working after
// sign-out, and a malformed %-escape in a path is a clear 400.

type Visitor = "anonymous" | Persona;
const VISITORS: Visitor[] = ["anonymous", ...(Object.keys({ ...STAFF, ...FORMER_STAFF, ...CUSTOMERS }) as Persona[])];
const BASE = process.env.APP_URL ?? "http://localhost:3110";

let jobPublicId = "";
let demoRequest = "";
let demoFinding = 0;

test.beforeAll(async () => {
  jobPublicId = await publicIdOf(5);
  const [request] = await sql(
    "SELECT r.public_id, r.finding_id FROM approval_requests r JOIN jobs j ON j.id = r.job_id JOIN shops s ON s.id = j.shop_id WHERE s.slug = 'copper-gulch' AND j.number = 5 ORDER BY r.id LIMIT 1",
  );
  demoRequest = String(request!.public_id);
  demoFinding = Number(request!.finding_id);
});

// Every page, with the visitor who sees it in full (the browser check); `capture`: photos and clips are taken there.
const PAGES: { path: () => string; as?: Persona; capture?: true }[] = [
  { path: () => "/" },
  { path: () => "/sign-in" },
  { path: () => "/sign-in/check-email" },
  { path: () => `/sign-in/link?token=${"A".repeat(43)}` },
  { path: () => "/s/copper-gulch" },
  { path: () => "/s/copper-gulch/no-such-story" },
  { path: () => "/unsubscribe/not-a-token" },
  { path: () => "/shop", as: "owner" },
  { path: () => "/shop/copper-gulch", as: "owner" },
  { path: () => "/shop/copper-gulch/jobs/2", as: "technician", capture: true },
  { path: () => "/shop/copper-gulch/jobs/2/bench", as: "technician", capture: true },
  { path: () => "/shop/copper-gulch/jobs/new", as: "technician" },
  { path: () => "/shop/copper-gulch/specs", as: "owner" },
  { path: () => "/shop/copper-gulch/outbox", as: "writer" },
  { path: () => "/shop/copper-gulch/jobs/5/mail", as: "writer" },
  { path: () => "/shop/copper-gulch/jobs/5/findings/new", as: "technician" },
  { path: () => `/shop/copper-gulch/jobs/5/findings/${demoFinding}`, as: "writer" },
  { path: () => "/shop/copper-gulch/jobs/5/invoice", as: "writer" },
  { path: () => "/shop/copper-gulch/portfolio", as: "writer" },
  { path: () => "/shop/copper-gulch/portfolio/profile", as: "owner" },
  { path: () => "/my", as: "jobCustomer" },
  { path: () => `/my/jobs/${jobPublicId}`, as: "jobCustomer" },
  { path: () => `/my/jobs/${jobPublicId}/approvals/${demoRequest}`, as: "jobCustomer" },
  { path: () => `/my/approvals/${demoRequest}`, as: "jobCustomer" },
  { path: () => `/my/jobs/${jobPublicId}/invoice`, as: "jobCustomer" },
  { path: () => `/my/jobs/${jobPublicId}/portfolio`, as: "jobCustomer" },
];

const APIS = ["/api/health", "/api/shops/copper-gulch/jobs", () => `/api/jobs/${jobPublicId}/timeline`, () => `/api/approvals/${demoRequest}`];

/** The headers next.config.mjs puts on every answer, redirects and JSON included. */
function expectFixedHeaders(res: APIResponse, what: string) {
  const h = res.headers();
  expect(h["x-content-type-options"], what).toBe("nosniff");
  expect(h["x-frame-options"], what).toBe("DENY");
  expect(h["referrer-policy"], what).toBe("strict-origin-when-cross-origin");
}

/** The shops' public pages are served from the cache (ISR): their policy has no nonce (lib/security-headers.ts says why). */
const cachedPage = (path: string) => path.startsWith("/s/");

function expectPageHeaders(res: APIResponse, what: string, capture: boolean, cached = false) {
  expectFixedHeaders(res, what);
  const h = res.headers();
  const csp = h["content-security-policy"] ?? "";
  if (cached) {
    expect(csp, what).toContain("script-src 'self' 'unsafe-inline';");
    expect(csp, what).toContain("script-src-attr 'none'");
    expect(csp, what).not.toMatch(/'nonce-|'strict-dynamic'/);
  } else expect(csp, what).toMatch(/script-src 'self' 'nonce-[A-Za-z0-9+/=]{20,}' 'strict-dynamic'/);
  expect(csp, what).toContain("frame-ancestors 'none'");
  expect(csp, what).toContain("object-src 'none'");
  expect(csp, what).not.toContain("unsafe-eval");
  expect(h["permissions-policy"], what).toContain(capture ? "camera=(self)" : "camera=()");
  // APP_URL is plain http here: no HSTS (it is set when APP_URL is https; unit-tested).
  expect(h["strict-transport-security"], what).toBeUndefined();
}

async function contextFor(visitor: Visitor) {
  return apiRequest.newContext({ baseURL: BASE, ...(visitor === "anonymous" ? {} : { storageState: storageStatePath(visitor) }) });
}

for (const visitor of VISITORS) {
  test(`every page and API answer has the security headers, for ${visitor}`, async () => {
    test.setTimeout(120_000);
    const api = await contextFor(visitor);
    const nonces = new Set<string>();
    let pages = 0;
    for (const page of PAGES) {
      const path = page.path();
      const res = await api.get(path, { maxRedirects: 0 });
      const what = `${visitor} ${path} (${res.status()})`;
      if (res.status() >= 300 && res.status() < 400) {
        // Sent to sign in (no session cookie): the proxy answers before the page.
        expectFixedHeaders(res, what);
        continue;
      }
      expectPageHeaders(res, what, page.capture === true, cachedPage(path));
      if (cachedPage(path)) continue;
      nonces.add(/'nonce-([^']+)'/.exec(res.headers()["content-security-policy"]!)![1]!);
      pages++;
    }
    // A new nonce for every answer.
    expect(nonces.size).toBe(pages);
    for (const entry of APIS) {
      const path = typeof entry === "function" ? entry() : entry;
      const res = await api.get(path, { maxRedirects: 0 });
      const what = `${visitor} ${path} (${res.status()})`;
      expectFixedHeaders(res, what);
      expect(res.headers()["content-security-policy"], what).toBe("frame-ancestors 'none'");
    }
    await api.dispose();
  });
}

test("every page renders and runs its scripts under its policy (nonce, or the cached pages' own): no violation, hydrated", async ({ browser }) => {
  test.setTimeout(240_000);
  for (const { path, as } of PAGES) {
    const context = await browser.newContext(as ? { storageState: storageStatePath(as) } : {});
    const page = await context.newPage();
    await page.addInitScript(() => {
      const seen: string[] = [];
      (window as unknown as { __cspViolations: string[] }).__cspViolations = seen;
      // A library probing whether eval is allowed (zod 4 does, then parses without it) is the
      // policy working, not a page broken by it.
      document.addEventListener("securitypolicyviolation", (e) => {
        if (e.blockedURI !== "eval") seen.push(`${e.violatedDirective} ${e.blockedURI}`);
      });
    });
    const res = await page.goto(path());
    expect(res, path()).not.toBeNull();
    const tags = (await res!.text()).match(/<script\b[^>]*>/g) ?? [];
    expect(tags.length, path()).toBeGreaterThan(0);
    if (cachedPage(path())) {
      // Cached HTML: no nonce on any script (none was made for it), and none in the policy.
      expect(res!.headers()["content-security-policy"], path()).not.toContain("'nonce-");
      expect(tags.filter((tag) => tag.includes("nonce=")), path()).toEqual([]);
    } else {
      // Every script tag the server sent carries this answer's nonce (scripts those load later
      // need none: 'strict-dynamic' trusts them).
      const nonce = /'nonce-([^']+)'/.exec(res!.headers()["content-security-policy"] ?? "")?.[1];
      expect(nonce, path()).toBeTruthy();
      expect(
        tags.filter((tag) => !/type="application\/(ld\+)?json"/.test(tag) && !tag.includes(`nonce="${nonce}"`)),
        path(),
      ).toEqual([]);
    }
    await page.waitForLoadState("load");
    await page.waitForTimeout(300);
    const state = await page.evaluate(() => ({
      violations: (window as unknown as { __cspViolations: string[] }).__cspViolations,
      // Next's inline scripts fill this; a refused nonce would leave it undefined.
      flight: Array.isArray((self as unknown as { __next_f?: unknown[] }).__next_f),
    }));
    expect(state, path()).toEqual({ violations: [], flight: true });
    await context.close();
  }
});

/** A page on another port of the same host (same site: SameSite=Lax cookies go along) that frames `target`. */
async function attackerPage(target: string) {
  const server = http.createServer((_req, res) => {
    res.setHeader("content-type", "text/html");
    res.end(`<!doctype html><title>Win a prize</title><h1>Click the button</h1><iframe id="victim" src="${target}" width="800" height="600"></iframe>`);
  });
  // Every interface, so "localhost" reaches it over IPv4 or IPv6.
  await new Promise<void>((resolve) => server.listen(0, resolve));
  const host = new URL(BASE).hostname;
  return { url: `http://${host}:${(server.address() as AddressInfo).port}/`, close: () => new Promise((resolve) => server.close(resolve)) };
}

test("the signed-in approval page refuses to render in a frame on another port", async ({ browser }) => {
  const target = `${BASE}/my/approvals/${demoRequest}`;
  const attacker = await attackerPage(target);
  const context = await browser.newContext({ storageState: storageStatePath("jobCustomer") });
  const page = await context.newPage();
  try {
    // The same page opened directly does render, for this visitor.
    await page.goto(target);
    const title = await page.getByRole("heading", { level: 1 }).innerText();
    expect(title).not.toBe("");

    const framed = page.waitForResponse((r) => r.url() === target);
    await page.goto(attacker.url);
    const response = await framed;
    // The server did answer the framed request (the cookie went along) with both refusals…
    expect(response.headers()["content-security-policy"]).toContain("frame-ancestors 'none'");
    expect(response.headers()["x-frame-options"]).toBe("DENY");
    // …and the browser showed none of it.
    await page.waitForTimeout(1_000);
    const frame = page.frames().find((f) => f !== page.mainFrame());
    expect(frame, "the iframe exists").toBeDefined();
    expect(frame!.url()).not.toBe(target);
    expect(await page.frameLocator("#victim").getByText(title).count()).toBe(0);
  } finally {
    await context.close();
    await attacker.close();
  }
});

/** A technician of Saltmarsh made for this file only, so ending their sessions touches no other test. */
const temp = { email: `temp.tech.${Date.now().toString(36)}@saltmarsh.test`, password: "temporary-bench-pass" };
test.describe("sessions and forwarded headers", () => {
  test.beforeAll(async () => {
    await sql("INSERT INTO users (email, name, password_hash) VALUES (?, 'Temp Tech', ?)", [temp.email, await bcrypt.hash(temp.password, 10)]);
    await sql("INSERT INTO memberships (shop_id, user_id, role) SELECT s.id, u.id, 'technician' FROM shops s, users u WHERE s.slug = 'saltmarsh' AND u.email = ?", [temp.email]);
  });
  test.afterAll(async () => {
    await sql("DELETE FROM users WHERE email = ?", [temp.email]);
  });

  async function signedIn(browser: Browser): Promise<{ page: Page; cookie: string; close: () => Promise<void> }> {
    const context = await browser.newContext();
    const page = await context.newPage();
    await new SignInPage(page).signInAsStaff(temp.email, temp.password);
    await expect(page).toHaveURL(/\/shop\/saltmarsh$/);
    const cookie = (await context.cookies())
      .filter((c) => c.name.includes("authjs.session-token"))
      .map((c) => `${c.name}=${c.value}`)
      .join("; ");
    expect(cookie).not.toBe("");
    return { page, cookie, close: () => context.close() };
  }

  async function replay(cookie: string) {
    const api = await apiRequest.newContext({ baseURL: BASE, extraHTTPHeaders: { cookie } });
    const json = await api.get("/api/shops/saltmarsh/jobs");
    const page = await api.get("/shop/saltmarsh", { maxRedirects: 0 });
    const result = { api: json.status(), page: page.status(), location: page.headers()["location"] ?? "" };
    await api.dispose();
    return result;
  }

  test("after sign-out, a copy of the old session cookie is refused", async ({ browser }) => {
    const session = await signedIn(browser);
    expect((await replay(session.cookie)).api).toBe(200);
    await session.page.getByRole("button", { name: `Sign out ${temp.email}` }).click();
    await expect(session.page).toHaveURL(/\/sign-in$/);
    const after = await replay(session.cookie);
    expect(after.api).toBe(401);
    expect([303, 307, 308]).toContain(after.page);
    expect(after.location).toContain("/sign-in");
    await session.close();
  });

  test("sign out everywhere ends the sessions on other devices too", async ({ browser }) => {
    const phone = await signedIn(browser);
    const desk = await signedIn(browser);
    await desk.page.locator("summary").filter({ hasText: "Account" }).click();
    await desk.page.getByRole("button", { name: "Sign out everywhere" }).click();
    await expect(desk.page).toHaveURL(/\/sign-in\?signed-out=everywhere$/);
    await expect(desk.page.getByText("You're signed out on every device and browser.")).toBeVisible();
    expect((await replay(phone.cookie)).api).toBe(401);
    await phone.page.goto("/shop/saltmarsh");
    await expect(phone.page).toHaveURL(/\/sign-in\?next=/);
    await phone.close();
    await desk.close();
  });

  test("a sign-in with a forged X-Forwarded-Host never redirects to that host", async ({ page, request }) => {
    // The staff form's hidden fields (the server action's id), as the browser would post them without JavaScript.
    await page.goto("/sign-in");
    const form = page.getByRole("region", { name: "Shop staff" }).locator("form");
    const fields = await form.locator("input[type=hidden]").evaluateAll((inputs) => Object.fromEntries(inputs.map((i) => [(i as HTMLInputElement).name, (i as HTMLInputElement).value])));
    const post = (origin: string) =>
      request.post("/sign-in", {
        multipart: { ...fields, email: temp.email, password: temp.password },
        headers: { origin, "x-forwarded-host": "evil.test", "x-forwarded-proto": "https" },
        maxRedirects: 0,
      });
    // The forged host with an Origin to match: refused, since the app sees its own host.
    const forged = await post("http://evil.test");
    expect(forged.status()).toBeGreaterThanOrEqual(400);
    expect(`${forged.headers()["location"] ?? ""} ${forged.headers()["x-action-redirect"] ?? ""}`).not.toContain("evil.test");
    // The app's own Origin with the forged host: signed in, and sent to a path of this app.
    const own = await post(new URL(BASE).origin);
    expect(own.status()).toBe(303);
    const location = own.headers()["location"]!;
    expect(location).not.toContain("evil.test");
    expect(new URL(location, BASE).origin).toBe(new URL(BASE).origin);
    expect(new URL(location, BASE).pathname).toBe("/");
  });
});

test("a malformed %-escape in the path is a 400 with the usual error body, not a 500", async ({ request }) => {
  for (const path of ["/api/jobs/%ZZ/timeline", "/api/jobs/%FF/timeline", "/api/jobs/%C0%AE/timeline", "/api/jobs/%ZZ/photos", "/shop/copper-gulch/jobs/%E2%82"]) {
    const res = await request.get(path, { maxRedirects: 0 });
    expect(res.status(), path).toBe(400);
    expect(res.headers()["content-type"], path).toContain("application/json");
    expect((await res.json()).error, path).toMatchObject({ code: "bad_request", message: expect.stringContaining("%") });
  }
});
