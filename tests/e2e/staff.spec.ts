import { expect, test } from "@playwright/test";
import mysql from "mysql2/promise";
import { SignInPage } from "./pages/sign-in-page";
import { STAFF } from "./personas";

const OWNER = STAFF.owner;

test("staff signs in with a password and sees the shop's job table", async ({ page }) => {
  await new SignInPage(page).signInAsStaff(OWNER.email, OWNER.password);
  await expect(page).toHaveURL(/\/shop\/copper-gulch$/);
  await expect(page.getByRole("heading", { name: "Jobs" })).toBeVisible();
  const table = page.getByRole("table", { name: "Jobs in this shop" });
  await expect(table).toBeVisible();
  await expect(page.getByTestId("job-row")).toHaveCount(6);
  await expect(table).toContainText("Corvane Tarn 450");
  // Another shop's jobs are not in this table.
  await expect(table).not.toContainText("Brumal");

  // Search by owner, then filter by status: the server answers, the table follows.
  await page.getByLabel("Search").fill("Calloway");
  await expect(page.getByTestId("job-row")).toHaveCount(2);
  await expect(page).toHaveURL(/q=Calloway/);
  await page.getByLabel("Search").fill("");
  await expect(page.getByTestId("job-row")).toHaveCount(6);
  await page.getByRole("button", { name: "Waiting on parts" }).click();
  await expect(page.getByTestId("job-row")).toHaveCount(1);
  await expect(page.getByTestId("job-row").first()).toContainText("Overdue");
  await page.getByRole("button", { name: "Waiting on parts" }).click();

  // Sort by job number, ascending then descending.
  await page.getByRole("button", { name: /^Job/ }).click();
  await expect(page.getByTestId("job-row").first()).toContainText("J-0001");
  await page.getByRole("button", { name: /^Job/ }).click();
  await expect(page.getByTestId("job-row").first()).toContainText("J-0006");

  // A job page opens from the table.
  await page.getByRole("link", { name: "J-0006" }).click();
  await expect(page.getByRole("heading", { name: /J-0006/ })).toBeVisible();
  await expect(page.getByText("Clutch slips in third")).toBeVisible();

  // Signing out ends the session: the shop area asks for sign-in again.
  await page.getByRole("button", { name: `Sign out ${OWNER.email}` }).click();
  await expect(page).toHaveURL(/\/sign-in$/);
  await page.goto("/shop/copper-gulch");
  await expect(page).toHaveURL(/\/sign-in\?next=/);
});

test("a wrong password shows a clear error and signs nobody in", async ({ page }) => {
  await new SignInPage(page).signInAsStaff("priya@coppergulch.test", "not-the-password");
  await expect(page.getByRole("main").getByRole("alert")).toContainText("That e-mail address and password don't match a shop account");
  await expect(page).toHaveURL(/\/sign-in/);
  await page.goto("/shop");
  await expect(page).toHaveURL(/\/sign-in\?next=%2Fshop/);
});

test("an unknown staff e-mail gets the same answer as a wrong password: accounts can't be probed", async ({ page }) => {
  await new SignInPage(page).signInAsStaff("nobody@coppergulch.test", "whatever-it-is");
  await expect(page.getByRole("main").getByRole("alert")).toContainText("That e-mail address and password don't match a shop account");
});

test("the job list API needs a session and a membership", async ({ request }) => {
  const anonymous = await request.get("/api/shops/copper-gulch/jobs");
  expect(anonymous.status()).toBe(401);
  expect((await anonymous.json()).error.code).toBe("unauthenticated");
});

test("health check reports the database", async ({ request }) => {
  const res = await request.get("/api/health");
  expect(res.status()).toBe(200);
  expect(await res.json()).toMatchObject({ db: "ok", mail: "ok" });
});

test("after five wrong passwords the account says to wait, even for the right one", async ({ page }) => {
  // No other end-to-end test signs Wren in after auth.setup.ts (whose saved session a lock doesn't end), so locking her account affects nothing else.
  const wren = { email: "wren@saltmarsh.test", password: "saltmarsh-demo" };
  const signIn = new SignInPage(page);
  for (let i = 0; i < 5; i++) {
    await signIn.signInAsStaff(wren.email, `wrong-${i}`);
    await expect(page.getByRole("main").getByRole("alert")).toContainText("That e-mail address and password don't match");
  }
  await signIn.signInAsStaff(wren.email, wren.password);
  await expect(page.getByRole("main").getByRole("alert")).toContainText("Too many tries. Wait 15 minutes");
  await expect(page).toHaveURL(/\/sign-in/);
});

test("someone on the staff of two shops picks the shop, and each board shows only its own jobs", async ({ page }) => {
  // Give Sam (Saltmarsh) a second membership, at Copper Gulch, for this test only.
  const db = await mysql.createConnection(process.env.DATABASE_URL!);
  await db.query(
    "INSERT INTO memberships (shop_id, user_id, role) SELECT s.id, u.id, 'technician' FROM shops s, users u WHERE s.slug = 'copper-gulch' AND u.email = 'sam@saltmarsh.test'",
  );
  try {
    await new SignInPage(page).signInAsStaff("sam@saltmarsh.test", "saltmarsh-demo");
    await expect(page).toHaveURL(/\/shop$/);
    await expect(page.getByRole("heading", { name: "Your shops" })).toBeVisible();
    await page.getByRole("link", { name: /Copper Gulch Powersports/ }).click();
    await expect(page.getByTestId("job-row")).toHaveCount(6);
    await page.goto("/shop");
    await page.getByRole("link", { name: /Saltmarsh Small Engine/ }).click();
    await expect(page.getByTestId("job-row")).toHaveCount(2);
    await expect(page.getByRole("table", { name: "Jobs in this shop" })).not.toContainText("Corvane");
  } finally {
    await db.query(
      "DELETE m FROM memberships m JOIN shops s ON s.id = m.shop_id JOIN users u ON u.id = m.user_id WHERE s.slug = 'copper-gulch' AND u.email = 'sam@saltmarsh.test'",
    );
    await db.end();
  }
});
