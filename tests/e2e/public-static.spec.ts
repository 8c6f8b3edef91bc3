import fs from "node:fs";
import path from "node:path";
import { type APIRequestContext, type APIResponse, expect, test } from "@playwright/test";
import { sql } from "./db";
import { storageStatePath } from "./personas";

// The shops' public pages are static (issue 17): rendered on the first visit, then answered from
// Next's cache (ISR) until a change drops them (lib/server/portfolio-cache.ts). Here: a repeat
// visit is a cache hit with a shared-cache lifetime; the policy of these pages carries no nonce
// and still lets the page run (the booking form, a client component and a server action, works);
// a change made in the app shows on the very next request. Publishing, taking down and a
// withdrawn consent are in portfolio.spec.ts.

const SHOP = "copper-gulch";

/** Asks until the page is answered from the cache (the first visit after a change renders it). */
async function cachedAnswer(api: APIRequestContext, path: string) {
  await expect.poll(async () => (await api.get(path)).headers()["x-nextjs-cache"], { message: path }).toBe("HIT");
  return api.get(path);
}

test("the shop's public page comes from the cache on a repeat visit, with a policy that has no nonce", async ({ request }) => {
  const res = await cachedAnswer(request, `/s/${SHOP}`);
  expect(res.status()).toBe(200);
  const h = res.headers();
  expect(h["x-nextjs-cache"]).toBe("HIT");
  // PUBLIC_PAGE_SECONDS: shared caches may keep it that long; the app drops its own copy on a change.
  expect(h["cache-control"]).toMatch(/(^|,\s*)s-maxage=300\b/);
  const csp = h["content-security-policy"] ?? "";
  expect(csp).toContain("script-src 'self' 'unsafe-inline';");
  expect(csp).toContain("script-src-attr 'none'");
  expect(csp).toContain("object-src 'none'");
  expect(csp).toContain("frame-ancestors 'none'");
  expect(csp).not.toContain("'nonce-");
  // Every visitor gets the same bytes: no nonce, no booking ticket baked in.
  const html = await res.text();
  expect(html).not.toMatch(/<script\b[^>]*\bnonce=/);
  expect(html).not.toMatch(/name="ticket" value="[A-Za-z0-9_-]{24,}"/);
  // An address that is no story is a 404, under the same policy.
  const missing = await request.get(`/s/${SHOP}/no-such-story-here`);
  expect(missing.status()).toBe(404);
  expect(missing.headers()["content-security-policy"]).not.toContain("'nonce-");
});

test("the booking form runs on the cached page: it fetches its own ticket, and the request reaches the desk", async ({ browser }) => {
  test.setTimeout(60_000);
  const id = Date.now().toString(36);
  const name = `Static Page Visitor ${id}`;
  const context = await browser.newContext();
  const page = await context.newPage();
  await page.addInitScript(() => {
    const seen: string[] = [];
    (window as unknown as { __cspViolations: string[] }).__cspViolations = seen;
    document.addEventListener("securitypolicyviolation", (e) => {
      if (e.blockedURI !== "eval") seen.push(`${e.violatedDirective} ${e.blockedURI}`);
    });
  });
  try {
    await cachedAnswer(page.request, `/s/${SHOP}`);
    const ticket = page.waitForResponse((r) => r.url().endsWith(`/api/public/shops/${SHOP}/booking-ticket`) && r.status() === 200);
    const res = await page.goto(`/s/${SHOP}`);
    expect(res?.headers()["x-nextjs-cache"]).toBe("HIT");
    // Only a hydrated form asks for a ticket: the page's scripts ran under this policy.
    await ticket;
    const form = page.getByRole("region", { name: "Ask for a booking" });
    await form.getByLabel(/^Your name/).fill(name);
    await form.getByLabel(/^E-mail/).fill(`static.${id}@visitor.test`);
    await form.getByLabel(/^Machine/).fill("Trailcrest 450 quad, 2019");
    await form.getByLabel(/^What it needs/).fill("Front brakes squeal and pull to the left.");
    // The ticket counts from when the form asked for it; a person takes longer than 3 s anyway.
    await page.waitForTimeout(3_200);
    await form.getByRole("button", { name: "Ask for a booking" }).click();
    await expect(form.getByText("Thanks: your request is with the shop.")).toBeVisible();
    const rows = await sql("SELECT e.id FROM shop_events e JOIN shops s ON s.id = e.shop_id WHERE s.slug = ? AND e.kind = 'booking_request' AND JSON_VALUE(e.payload, '$.summary') LIKE ?", [SHOP, `${name}%`]);
    expect(rows).toHaveLength(1);
    const state = await page.evaluate(() => (window as unknown as { __cspViolations: string[] }).__cspViolations);
    expect(state).toEqual([]);
  } finally {
    // The demo shop's inbox keeps only the seed's items (its reads go with it: ON DELETE CASCADE).
    await sql("DELETE e FROM shop_events e JOIN shops s ON s.id = e.shop_id WHERE s.slug = ? AND e.kind = 'booking_request' AND JSON_VALUE(e.payload, '$.summary') LIKE ?", [SHOP, `${name}%`]);
    await context.close();
  }
});

/** For a failure message: how the cache answered, and when. */
const answered = (res: APIResponse) => {
  const h = res.headers();
  return `answered ${res.status()} at ${new Date().toISOString()}, x-nextjs-cache ${h["x-nextjs-cache"] ?? "none"}, age ${h.age ?? "none"}, date ${h.date ?? "none"}`;
};

test("a change made in the app shows on the public page at once, although the page was cached", async ({ browser, request }) => {
  const context = await browser.newContext({ storageState: storageStatePath("owner") });
  const desk = await context.newPage();
  const about = desk.getByLabel("About the shop");
  await desk.goto(`/shop/${SHOP}/portfolio/profile`);
  const before = await about.inputValue();
  const changed = `${before}\nStatic page check ${Date.now().toString(36)}.`;
  // Typed, saved, and read back from a fresh load of the form: text typed before the page has
  // hydrated can be put back to the stored value, and the old text saved again, so until the
  // form shows the text after a reload, type it and save it again.
  const save = async (text: string) => {
    await expect(async () => {
      await desk.goto(`/shop/${SHOP}/portfolio/profile`);
      // Hydrated: React has claimed the field (its own key on the element). Not "networkidle": the
      // staff area keeps a live connection open, so the network is never idle for long.
      await about.evaluate((el) => new Promise<void>((resolve) => {
        const claimed = () => Object.keys(el).some((k) => k.startsWith("__react"));
        const poll = () => (claimed() ? resolve() : setTimeout(poll, 50));
        poll();
      }));
      await about.fill(text);
      await desk.getByRole("button", { name: "Save the profile" }).click();
      await expect(desk.getByRole("status").filter({ hasText: "Saved. The public page shows it now." })).toBeVisible();
      await desk.goto(`/shop/${SHOP}/portfolio/profile`);
      expect(await about.inputValue()).toBe(text);
    }).toPass({ timeout: 30_000 });
  };
  try {
    await cachedAnswer(request, `/s/${SHOP}`);
    await save(changed);
    const after = await request.get(`/s/${SHOP}`);
    expect(after.headers()["x-nextjs-cache"], answered(after)).not.toBe("HIT");
    expect(await after.text(), answered(after)).toContain(changed.split("\n").pop()!);
  } finally {
    await save(before);
    // Put back, and the public page says so at once too.
    const back = await request.get(`/s/${SHOP}`);
    expect(await back.text(), answered(back)).not.toContain("Static page check");
    await context.close();
  }
});

/** Every file below `dir`, as paths relative to it. */
function filesBelow(dir: string): string[] {
  return fs.readdirSync(dir, { withFileTypes: true, recursive: true }).filter((d) => d.isFile()).map((d) => path.relative(dir, path.join(d.parentPath, d.name)));
}

test("a made-up public address is a 404 and leaves nothing in the page cache", async ({ request }) => {
  // The test app's build folder (scripts/test.mjs); Next keeps cached pages under server/.
  const server = path.join(process.cwd(), process.env.NEXT_DIST_DIR ?? ".next-test", "server");
  const id = Date.now().toString(36);
  const madeUp = [0, 1, 2].map((i) => `made-up-${id}-${i}`);
  await cachedAnswer(request, `/s/${SHOP}`);
  for (const name of madeUp) {
    for (const address of [`/s/${SHOP}/${name}`, `/s/${name}`, `/s/${name}/${name}`, `/s/${SHOP}/${name}/opengraph-image`]) {
      const res = await request.get(address);
      expect(res.status(), address).toBe(404);
      expect(res.headers()["content-security-policy"], address).not.toContain("'nonce-");
    }
  }
  await new Promise((r) => setTimeout(r, 1000));
  const files = filesBelow(server);
  // Where Next keeps a cached page: the real one is there (so the look below looks in the right place)…
  expect(files.filter((f) => f.endsWith(path.join("s", `${SHOP}.html`))).length, "the shop's cached page on disk").toBeGreaterThan(0);
  // …and no made-up address left one.
  expect(files.filter((f) => madeUp.some((name) => f.includes(name)))).toEqual([]);
});

test("a public page carries its styles inside it, so nothing delays its first paint; the app's screens link theirs, and both look the same", async ({ browser, request }) => {
  // scripts/lib/public-css.mjs: on a slow line a linked stylesheet costs a whole request before anything paints.
  const shopHtml = await (await cachedAnswer(request, `/s/${SHOP}`)).text();
  const head = shopHtml.slice(0, shopHtml.indexOf("<body"));
  expect(head).toMatch(/<style[^>]*data-href="benchside-public"[^>]*>[^<]*--font-archivo/);
  expect(shopHtml).not.toMatch(/<link[^>]*rel="stylesheet"/);
  const signInHtml = await (await request.get("/sign-in")).text();
  expect(signInHtml).toMatch(/<link[^>]*rel="stylesheet"/);
  expect(signInHtml).not.toContain('data-href="benchside-public"');

  // Drawn the same way: the palette's paper behind the page, Archivo in front (once it has loaded).
  const context = await browser.newContext({ colorScheme: "light" });
  const page = await context.newPage();
  const look = async () => {
    await page.evaluate(() => document.fonts.ready);
    return page.evaluate(() => {
      const first = (getComputedStyle(document.querySelector("h1, h2")!).fontFamily.split(",")[0] ?? "").replace(/["']/g, "").trim();
      return {
        paper: getComputedStyle(document.body).backgroundColor,
        // The heading asks for Archivo first (next/font calls its copy "archivo", the public pages
        // "Archivo"), and that face was loaded from our own files.
        archivo: /^archivo$/i.test(first) && [...document.fonts].some((f) => f.family.replace(/["']/g, "") === first && f.status === "loaded"),
      };
    });
  };
  try {
    await page.goto(`/s/${SHOP}`);
    expect(await look()).toEqual({ paper: "rgb(245, 242, 236)", archivo: true });
    await page.goto("/sign-in");
    expect(await look()).toEqual({ paper: "rgb(245, 242, 236)", archivo: true });
  } finally {
    await context.close();
  }
});
