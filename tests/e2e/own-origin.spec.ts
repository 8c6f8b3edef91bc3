import { type Page, type Request, expect, test } from "@playwright/test";
import { APP_ORIGIN, APP_URL } from "./access/client";
import { type Outcome, type PageTarget, TARGETS, VISITORS, type Visitor, loadPageIds } from "./access/pages";
import { storageStatePath } from "./personas";

// Issue 20 §4: a page asks nothing of any host but the app's own origin and the configured video
// and payments services (in this run, the local fakes scripts/test.mjs starts). Every page of
// ./access/pages.ts is opened in Chromium as every visitor; every request the page makes (scripts,
// fonts, images, posters, clips, icons, fetches) is collected, and any to another origin fails.

/** The origins a page may reach: ours, and where configured, the video host and the payments service. */
function allowedOrigins(): Set<string> {
  const allowed = new Set([APP_ORIGIN]);
  const add = (url: string | undefined) => {
    if (!url) return;
    try {
      allowed.add(new URL(url.replace("{id}", "x")).origin);
    } catch {
      // Not an address: nothing to allow.
    }
  };
  add(process.env.VIDEO_PLAYBACK_URL);
  add(process.env.VIDEO_POSTER_URL);
  add(process.env.MUX_BASE_URL);
  if (process.env.STRIPE_API_HOST) add(`${process.env.STRIPE_API_PROTOCOL ?? "https"}://${process.env.STRIPE_API_HOST}:${process.env.STRIPE_API_PORT ?? 443}`);
  return allowed;
}

const ALLOWED = allowedOrigins();

/** Off-origin requests and missing icons seen by one page, as "page name: URL" lines. */
function watch(page: Page, current: () => string) {
  const problems: string[] = [];
  page.on("request", (req: Request) => {
    const url = new URL(req.url());
    // data:, blob: and about: never leave the browser.
    if (!/^(https?|wss?):$/.test(url.protocol)) return;
    if (!ALLOWED.has(url.origin)) problems.push(`${current()}: ${req.method()} ${req.url()}`);
  });
  page.on("response", (res) => {
    const { pathname } = new URL(res.url());
    if (res.status() === 404 && /^\/(favicon\.ico|icon[^/]*|apple-icon[^/]*)$/.test(pathname)) problems.push(`${current()}: icon missing (404) ${res.url()}`);
  });
  return problems;
}

/**
 * The pages to open as one visitor: every page they get into, and one page for each other outcome
 * (the sign-in page, the refusal and the not-found shells are the same shell on every path).
 */
function pagesFor(visitor: Visitor): PageTarget[] {
  const seen = new Set<Outcome>();
  return TARGETS.filter((t) => {
    const outcome = t.expect[visitor];
    if (outcome === "in") return true;
    if (seen.has(outcome)) return false;
    seen.add(outcome);
    return true;
  });
}

test.beforeAll(loadPageIds);

test.describe("no request to another origin", () => {
  for (const visitor of VISITORS) {
    test(`every page as ${visitor} asks only our own origin`, async ({ browser }) => {
      const targets = pagesFor(visitor);
      test.setTimeout(20_000 + targets.length * 8_000);
      const context = await browser.newContext({ baseURL: APP_URL, ...(visitor === "anonymous" ? {} : { storageState: storageStatePath(visitor) }) });
      const page = await context.newPage();
      let current = "";
      const problems = watch(page, () => current);
      try {
        for (const target of targets) {
          current = `${target.name} (${target.path()})`;
          await page.goto(target.path(), { waitUntil: "load" });
          // Scroll through, so what loads near the screen (posters, clips, photos) loads too.
          await page.evaluate(() => window.scrollTo(0, document.body.scrollHeight));
          // Live pages keep an event stream open, so "network idle" may never come: wait briefly.
          await page.waitForLoadState("networkidle", { timeout: 3_000 }).catch(() => undefined);
        }
      } finally {
        await context.close();
      }
      expect(problems).toEqual([]);
    });
  }
});

test("the favicon and app icons are ours and answer", async ({ request }) => {
  for (const [path, type] of [
    ["/favicon.ico", /^image\/(x-icon|vnd\.microsoft\.icon)/],
    ["/icon.svg", /^image\/svg\+xml/],
    ["/apple-icon.png", /^image\/png/],
  ] as const) {
    const res = await request.get(path);
    expect(res.status(), path).toBe(200);
    expect(res.headers()["content-type"], path).toMatch(type);
  }
});

test("the root layout links our icons", async ({ page }) => {
  await page.goto("/s/copper-gulch");
  await expect(page.locator('link[rel="icon"][href^="/icon.svg"]')).toHaveCount(1);
  await expect(page.locator('link[rel="apple-touch-icon"][href^="/apple-icon.png"]')).toHaveCount(1);
});
