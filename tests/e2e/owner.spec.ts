import { expect, test } from "@playwright/test";
import mysql from "mysql2/promise";
import { listMail } from "../support/mailbox";
import { SignInPage, mailBaseUrl } from "./pages/sign-in-page";

test("a machine owner signs in through the e-mailed link and sees only their own jobs", async ({ page }) => {
  const signIn = new SignInPage(page);
  const link = await signIn.signInAsOwner("ruth.calloway@mail.test");
  await expect(page).toHaveURL(/\/my$/);
  await expect(page.getByRole("heading", { name: "My machines" })).toBeVisible();
  const jobs = page.getByTestId("my-job");
  await expect(jobs).toHaveCount(2);
  for (const text of await jobs.allInnerTexts()) expect(text).toContain("Tessaro Ridgeline 570");
  await expect(page.getByRole("list", { name: "My jobs" })).not.toContainText("Corvane");
  await expect(page.getByRole("list", { name: "My jobs" })).not.toContainText("Gravik");

  // Open one job.
  await jobs.filter({ hasText: "Grinding" }).getByRole("link").click();
  await expect(page.getByText("Grinding from the front left")).toBeVisible();

  // The link works once: in a fresh browser it is refused with its own message.
  await page.context().clearCookies();
  await page.goto(link);
  await page.getByRole("button", { name: "Sign in and see my jobs" }).click();
  await expect(page.getByRole("main").getByRole("alert")).toContainText("already been used");
});

test("an address the shops don't know gets the same answer as a known one, and no e-mail", async ({ page }) => {
  const since = new Date();
  await new SignInPage(page).askForLink("someone.else@mail.test");
  await expect(page.getByRole("heading", { name: "Check your e-mail" })).toBeVisible();
  await expect(page.getByText("If a shop knows that address, a sign-in link is on its way.")).toBeVisible();
  // The worker sends a link within a second or two; give it longer, then check nothing came.
  await page.waitForTimeout(3_000);
  expect(await listMail(mailBaseUrl(), { to: "someone.else@mail.test", since })).toHaveLength(0);
});

test("a link sign-in opens the owner's area only, even for someone who is also staff", async ({ page }) => {
  // Priya is a service writer at Copper Gulch and a customer of Saltmarsh.
  await new SignInPage(page).signInAsOwner("priya@coppergulch.test");
  await expect(page.getByTestId("my-job")).toHaveCount(1);
  await expect(page.getByTestId("my-job")).toContainText("Pellard P160");
  const response = await page.goto("/shop/copper-gulch");
  expect(response?.status()).toBe(403);
  await expect(page.getByText("Corvane")).toHaveCount(0);
});

test("an expired link says so and offers a new one", async ({ page }) => {
  // Ask for a link, then let 20 minutes pass in the database.
  const link = await new SignInPage(page).requestLink("imani.reyes@mail.test");
  const db = await mysql.createConnection(process.env.DATABASE_URL!);
  await db.query("UPDATE sign_in_links SET expires_at = NOW() - INTERVAL 1 MINUTE WHERE email = ?", ["imani.reyes@mail.test"]);
  await db.end();

  await page.goto(link);
  await page.getByRole("button", { name: "Sign in and see my jobs" }).click();
  await expect(page.getByRole("main").getByRole("alert")).toContainText("This sign-in link has expired");
  await page.getByRole("link", { name: "Ask for a new link" }).click();
  await expect(page).toHaveURL(/\/sign-in$/);
});
