import { type APIRequestContext, expect, test } from "@playwright/test";
import { APP_URL, pool } from "./access/client";
import { type Outcome, TARGETS, VISITORS, loadPageIds } from "./access/pages";
import { storageStatePath } from "./personas";

// The pages and who may open them live in ./access/pages.ts (own-origin.spec.ts opens the same list).
test.beforeAll(loadPageIds);

// The pages' own answers over HTTP, as the browser receives them. A refused page is Next's
// error shell whose RSC payload names the fallback it renders (app/forbidden.tsx or
// app/not-found.tsx) by its digest, "NEXT_HTTP_ERROR_FALLBACK;403" / ";404"; a page that let the
// visitor in has none at all (so nor was one thrown after it began streaming). One test per
// visitor, its pages fetched a few at a time.
const FALLBACK = /NEXT_HTTP_ERROR_FALLBACK;(\d{3})/g;

async function outcomeProblem(ctx: APIRequestContext, target: (typeof TARGETS)[number], outcome: Outcome): Promise<string | null> {
  const res = await ctx.get(target.path(), { failOnStatusCode: false });
  const fallbacks = [...new Set([...(await res.text()).matchAll(FALLBACK)].map((m) => m[1]))];
  const url = new URL(res.url());
  const only = (code: string) => fallbacks.length === 1 && fallbacks[0] === code;
  const ok =
    outcome === "sign-in"
      ? url.pathname === "/sign-in" && url.searchParams.has("next")
      : outcome === "in"
        ? res.status() === 200 && fallbacks.length === 0 && url.pathname !== "/sign-in"
        : res.status() === Number(outcome) && only(outcome);
  const seen = `${res.status()} at ${url.pathname}${fallbacks.length ? ` (fallback ${fallbacks.join(", ")})` : ""}`;
  return ok ? null : `${target.name} (${target.path()}): expected ${outcome}, got ${seen}`;
}

for (const visitor of VISITORS) {
  test(`every page as ${visitor}`, async ({ playwright }) => {
    const ctx = await playwright.request.newContext({ baseURL: APP_URL, ...(visitor === "anonymous" ? {} : { storageState: storageStatePath(visitor) }) });
    try {
      const problems = await pool(TARGETS, 4, (target) => outcomeProblem(ctx, target, target.expect[visitor]));
      expect(problems.filter(Boolean)).toEqual([]);
    } finally {
      await ctx.dispose();
    }
  });
}

test.describe("missing and malformed", () => {
  test.use({ storageState: storageStatePath("owner") });
  test("a malformed job-list query is a 422 naming each bad field", async ({ page }) => {
    const res = await page.request.get("/api/shops/copper-gulch/jobs?status=lost&pageSize=7&q=" + "x".repeat(200));
    expect(res.status()).toBe(422);
    const body = await res.json();
    expect(body.error.code).toBe("invalid");
    expect(Object.keys(body.error.fields).sort()).toEqual(["pageSize", "q", "status"]);
  });

  test("a customer or machine the shop doesn't have is a real 404", async ({ page }) => {
    for (const path of ["/shop/copper-gulch/customers/999999", "/shop/copper-gulch/customers/x1", "/shop/copper-gulch/machines/999999", "/shop/copper-gulch/machines/0"]) {
      expect((await page.goto(path))?.status(), path).toBe(404);
    }
  });

  test("a job number the shop doesn't have is a real 404", async ({ page }) => {
    expect((await page.goto("/shop/copper-gulch/jobs/999"))?.status()).toBe(404);
    expect((await page.goto("/shop/copper-gulch/jobs/not-a-number"))?.status()).toBe(404);
  });
});

test.describe("same job number, other shop", () => {
  test.use({ storageState: storageStatePath("otherShopTechnician") });
  test("a technician's own shop's job 1 opens while another shop's job 1 is refused", async ({ page }) => {
    expect((await page.goto("/shop/copper-gulch/jobs/1"))?.status()).toBe(403);
    await expect(page.getByText("Yearly service")).toHaveCount(0);
    await page.goto("/shop/saltmarsh/jobs/1");
    await expect(page.getByRole("heading", { name: /J-0001 · 2016 Brumal Drift 600/ })).toBeVisible();
  });
});
