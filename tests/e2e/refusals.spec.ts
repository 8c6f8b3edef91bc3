import { expect, test } from "@playwright/test";
import { SignInPage } from "./pages/sign-in-page";

const FORBIDDEN_HEADING = /isn.t yours to open/i;

test("a customer opening a staff page is refused", async ({ page }) => {
  await new SignInPage(page).signInAsOwner("jonah.pike@mail.test");
  await expect(page).toHaveURL(/\/my$/);
  for (const url of ["/shop/copper-gulch", "/shop/copper-gulch/jobs/1", "/shop"]) {
    const response = await page.goto(url);
    expect(response?.status(), url).toBe(403);
    await expect(page.getByRole("heading", { name: FORBIDDEN_HEADING })).toBeVisible();
    await expect(page.getByText("Tessaro")).toHaveCount(0);
  }
  const api = await page.request.get("/api/shops/copper-gulch/jobs");
  expect(api.status()).toBe(403);
});

test("a technician of another shop opening a job page is refused", async ({ page }) => {
  await new SignInPage(page).signInAsStaff("sam@saltmarsh.test", "saltmarsh-demo");
  await expect(page).toHaveURL(/\/shop\/saltmarsh$/);
  const response = await page.goto("/shop/copper-gulch/jobs/1");
  expect(response?.status()).toBe(403);
  await expect(page.getByRole("heading", { name: FORBIDDEN_HEADING })).toBeVisible();
  await expect(page.getByText("Yearly service")).toHaveCount(0);
  const api = await page.request.get("/api/shops/copper-gulch/jobs");
  expect(api.status()).toBe(403);
  // Their own shop's job with the same number opens.
  await page.goto("/shop/saltmarsh/jobs/1");
  await expect(page.getByRole("heading", { name: /J-0001 · 2016 Brumal Drift 600/ })).toBeVisible();
});

test("a customer cannot open another customer's job by its link", async ({ page, browser }) => {
  // Jonah's job page address, as Jonah sees it.
  const jonah = await browser.newPage();
  await new SignInPage(jonah).signInAsOwner("jonah.pike@mail.test");
  await jonah.getByTestId("my-job").first().getByRole("link").click();
  await expect(jonah).toHaveURL(/\/my\/jobs\//);
  const jonahsJob = new URL(jonah.url()).pathname;
  await jonah.close();

  await new SignInPage(page).signInAsOwner("imani.reyes@mail.test");
  const response = await page.goto(jonahsJob);
  expect(response?.status()).toBe(403);
  await expect(page.getByText("Corvane")).toHaveCount(0);
});
