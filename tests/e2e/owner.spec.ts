import { expect, test } from "@playwright/test";
import mysql from "mysql2/promise";
import { SignInPage, mailBaseUrl } from "./pages/sign-in-page";
import { waitForMail } from "../support/mailbox";

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

test("an address the shops don't know gets a clear answer, and no e-mail", async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.open();
  const owners = page.getByRole("region", { name: "Machine owners" });
  await owners.getByLabel("E-mail you gave the shop").fill("someone.else@mail.test");
  await owners.getByRole("button", { name: "E-mail me a sign-in link" }).click();
  await expect(owners.getByText("We don't have a job under that e-mail address")).toBeVisible();
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
  const signIn = new SignInPage(page);
  // Ask for a link, then let 20 minutes pass in the database.
  const since = new Date();
  await signIn.open();
  const owners = page.getByRole("region", { name: "Machine owners" });
  await owners.getByLabel("E-mail you gave the shop").fill("imani.reyes@mail.test");
  await owners.getByRole("button", { name: "E-mail me a sign-in link" }).click();
  const message = await waitForMail({ baseUrl: mailBaseUrl(), to: "imani.reyes@mail.test", since, subjectIncludes: "sign-in link" });
  const db = await mysql.createConnection(process.env.DATABASE_URL!);
  await db.query("UPDATE sign_in_links SET expires_at = NOW() - INTERVAL 1 MINUTE WHERE email = ?", ["imani.reyes@mail.test"]);
  await db.end();

  await page.goto(message.links.find((l) => l.includes("/sign-in/link?token="))!);
  await page.getByRole("button", { name: "Sign in and see my jobs" }).click();
  await expect(page.getByRole("main").getByRole("alert")).toContainText("This sign-in link has expired");
  await page.getByRole("link", { name: "Ask for a new link" }).click();
  await expect(page).toHaveURL(/\/sign-in$/);
});
