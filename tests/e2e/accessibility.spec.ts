import AxeBuilder from "@axe-core/playwright";
import { type Page, expect, test } from "@playwright/test";
import { sql } from "./db";
import { type Persona, storageStatePath } from "./personas";

// WCAG 2.2 AA (W3C Recommendation, 2023) through axe-core's rule tags; target-size (2.5.8)
// only runs with the wcag22aa tag selected.
const TAGS = ["wcag2a", "wcag2aa", "wcag21a", "wcag21aa", "wcag22aa"];

async function expectNoViolations(page: Page) {
  const { violations } = await new AxeBuilder({ page }).withTags(TAGS).analyze();
  expect(violations.map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`)).toEqual([]);
}

const SCREENS: { name: string; path: string; as?: Persona }[] = [
  { name: "landing", path: "/" },
  { name: "sign-in", path: "/sign-in" },
  { name: "job board", path: "/shop/copper-gulch", as: "owner" },
  { name: "staff job page", path: "/shop/copper-gulch/jobs/2", as: "technician" },
  { name: "check-in form", path: "/shop/copper-gulch/jobs/new", as: "technician" },
  { name: "bench tools", path: "/shop/copper-gulch/jobs/2/bench", as: "technician" },
  { name: "spec library", path: "/shop/copper-gulch/specs", as: "owner" },
  { name: "customer list", path: "/shop/copper-gulch/customers", as: "writer" },
  { name: "customer search, nothing found", path: "/shop/copper-gulch/customers?q=nobody-by-this-name", as: "technician" },
  { name: "shop settings", path: "/shop/copper-gulch/settings", as: "owner" },
  // The shop's parts on order (J-0002's seeded supplier order, one part back-ordered) above the form for needed parts.
  { name: "parts on order", path: "/shop/copper-gulch/parts", as: "writer" },
  { name: "draft a finding", path: "/shop/copper-gulch/jobs/5/findings/new", as: "technician" },
  // The demo seed's one finding (db/seeds/demo-approvals.ts), priced and sent: the desk's view.
  { name: "finding with a request out", path: "/shop/copper-gulch/jobs/5/findings/1", as: "writer" },
  { name: "owner's machines", path: "/my", as: "jobCustomer" },
  // The staff job page with the drop-off authorisation card (its prepare form on a job without one).
  { name: "staff job page, desk view", path: "/shop/copper-gulch/jobs/5", as: "writer" },
  { name: "shop outbox", path: "/shop/copper-gulch/outbox", as: "writer" },
  { name: "desk inbox", path: "/shop/copper-gulch/inbox", as: "writer" },
  { name: "desk inbox (technician, no amounts)", path: "/shop/copper-gulch/inbox", as: "technician" },
  { name: "inbox e-mail settings", path: "/shop/copper-gulch/inbox/settings", as: "technician" },
  { name: "job mail log", path: "/shop/copper-gulch/jobs/5/mail", as: "writer" },
  { name: "shop's public page", path: "/s/copper-gulch" },
  { name: "portfolio list", path: "/shop/copper-gulch/portfolio", as: "writer" },
  { name: "shop profile editor", path: "/shop/copper-gulch/portfolio/profile", as: "owner" },
  { name: "shop staff", path: "/shop/copper-gulch/staff", as: "owner" },
  { name: "your account", path: "/shop/copper-gulch/account", as: "technician" },
  { name: "forgot password", path: "/sign-in/forgot" },
  { name: "forgot password, link sent", path: "/sign-in/forgot?sent=1" },
  { name: "join a shop, link not valid", path: "/join" },
  { name: "choose a new password, link not valid", path: "/sign-in/reset" },
  { name: "start your shop", path: "/start" },
  { name: "start your shop, check your e-mail", path: "/start/check-email?to=new.owner%40shop.test" },
  { name: "start your shop, link not valid", path: "/start/confirm" },
  { name: "text link, not valid", path: `/t/${"A".repeat(43)}` },
];

// The seed queues no mail: give J-0005's sent log (and the failed-mail page) one sent and one
// failed e-mail to show, in states the worker leaves alone, and take them away afterwards.
const MAIL_KEY = "e2e-accessibility-mail-log";
test.beforeAll(async () => {
  const [job] = await sql("SELECT j.id, j.shop_id FROM jobs j JOIN shops s ON s.id = j.shop_id WHERE s.slug = 'copper-gulch' AND j.number = 5");
  const row = (n: number, state: "sent" | "dead") => [job!.shop_id, job!.id, job!.shop_id, `${MAIL_KEY}:${n}`, "progress", '"Copper Gulch" <no-reply@benchside.test>', "a.very.long.address.for.reflow@mail.test", "Two updates on your machine", "<p>x</p>", "x", crypto.randomUUID(), state, state === "sent" ? 1 : 5, state === "sent" ? "re_e2e_provider_id_0123456789" : null, state === "dead" ? "The mail service refused the address" : null];
  await sql("DELETE FROM outbox WHERE dedupe_key LIKE ?", [`${MAIL_KEY}:%`]);
  for (const [n, state] of [[1, "sent"], [2, "dead"]] as const) {
    await sql(
      "INSERT INTO outbox (shop_id, job_id, dedupe_scope, dedupe_key, kind, from_address, to_email, subject, html, text, idempotency_key, state, attempts, provider_id, last_error, sent_at) VALUES (?,?,?,?,?,?,?,?,?,?,?,?,?,?,?, IF(? = 'sent', NOW(3), NULL))",
      [...row(n, state), state],
    );
  }
});
test.afterAll(async () => {
  await sql("DELETE FROM outbox WHERE dedupe_key LIKE ?", [`${MAIL_KEY}:%`]);
});

for (const colorScheme of ["light", "dark"] as const) {
  test.describe(`${colorScheme} mode`, () => {
    test.use({ colorScheme });
    for (const screen of SCREENS) {
      test.describe(screen.name, () => {
        if (screen.as) test.use({ storageState: storageStatePath(screen.as) });
        test(`${screen.name} has no WCAG 2.2 AA violations axe can find`, async ({ page }) => {
          await page.goto(screen.path);
          await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
          await expectNoViolations(page);
        });
      });
    }

    test.describe("customer and machine pages", () => {
      test.use({ storageState: storageStatePath("writer") });
      test("J-0005's customer page (with the merge form) and machine history have no WCAG 2.2 AA violations axe can find", async ({ page }) => {
        const [job] = await sql("SELECT j.customer_id, j.machine_id FROM jobs j JOIN shops s ON s.id = j.shop_id WHERE s.slug = 'copper-gulch' AND j.number = 5");
        for (const path of [`/shop/copper-gulch/customers/${job!.customer_id}`, `/shop/copper-gulch/machines/${job!.machine_id}`]) {
          await page.goto(path);
          await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
          await expectNoViolations(page);
        }
      });
    });

    test.describe("owner's e-mail-or-texts page", () => {
      test.use({ storageState: storageStatePath("jobCustomer") });
      test("owner's texts page (issue 21) has no WCAG 2.2 AA violations axe can find", async ({ page }) => {
        const [job] = await sql("SELECT j.public_id FROM jobs j JOIN shops s ON s.id = j.shop_id WHERE s.slug = 'copper-gulch' AND j.number = 5");
        await page.goto(`/my/jobs/${job!.public_id}/texts`);
        await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
        await expectNoViolations(page);
      });
    });

    test.describe("owner's drop-off authorisation page", () => {
      test.use({ storageState: storageStatePath("jobCustomer") });
      test("owner's drop-off authorisation page has no WCAG 2.2 AA violations axe can find", async ({ page }) => {
        // J-0005's owner-facing address (the seed prepares no authorisation: the "nothing to sign" state).
        const [job] = await sql("SELECT j.public_id FROM jobs j JOIN shops s ON s.id = j.shop_id WHERE s.slug = 'copper-gulch' AND j.number = 5");
        await page.goto(`/my/jobs/${job!.public_id}/authorisation`);
        await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
        await expectNoViolations(page);
      });
    });

    test("phone width: job board cards, a job's sent log and sign-in reflow without sideways scrolling", async ({ browser }) => {
      // WCAG 2.2 SC 1.4.10 Reflow: content at 320 CSS px wide without two-way scrolling.
      const context = await browser.newContext({ viewport: { width: 320, height: 640 }, colorScheme, storageState: storageStatePath("owner") });
      const page = await context.newPage();
      for (const path of ["/shop/copper-gulch", "/shop/copper-gulch/jobs/5/mail", "/shop/copper-gulch/customers", "/sign-in"]) {
        await page.goto(path);
        await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
        // The sent log shows one card per message on a phone, not its table.
        if (path.endsWith("/mail")) expect(await page.getByTestId("message-card").count()).toBeGreaterThanOrEqual(2);
        // The customer list likewise: cards, not its table.
        if (path.endsWith("/customers")) expect(await page.getByTestId("customer-card").count()).toBeGreaterThanOrEqual(3);
        const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
        expect(overflow, path).toBeLessThanOrEqual(0);
      }
      await expectNoViolations(page);
      await context.close();
    });
  });
}
