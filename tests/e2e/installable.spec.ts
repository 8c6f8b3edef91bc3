import AxeBuilder from "@axe-core/playwright";
import path from "node:path";
import { type Browser, type BrowserContext, type Locator, type Page, expect, test } from "@playwright/test";
import { newDemoJob, sql } from "./db";
import { SignInPage } from "./pages/sign-in-page";
import { JobPage } from "./pages/job-page";
import { plantOutboxItem, staffUserId } from "./outbox";
import { STAFF, storageStatePath } from "./personas";
import { pageKept, workerReady } from "./service-worker";

// Issue 20 §1 and §3: the installable staff app (manifest, icons, a service worker that keeps job
// and bench pages for offline use and forgets them at sign-out) and the phone-first bench flow
// (the quick-post bar, cautions that fold once seen), at a phone's size: 390 × 844.

const PHONE = { width: 390, height: 844 };
const JOB = "/shop/copper-gulch/jobs/2";
const BENCH = `${JOB}/bench`;
const TAGS = ["wcag2a", "wcag2aa", "wcag21a", "wcag21aa", "wcag22aa"];
const PHOTO = path.join(__dirname, "..", "fixtures", "photos", "plain.png");

async function phone(browser: Browser, options: { colorScheme?: "light" | "dark"; signedIn?: boolean } = {}): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({
    viewport: PHONE,
    colorScheme: options.colorScheme ?? "light",
    ...(options.signedIn === false ? {} : { storageState: storageStatePath("technician") }),
  });
  return { context, page: await context.newPage() };
}

const quickPost = (page: Page) => page.getByRole("navigation", { name: "Quick post" });

test("the web app manifest is served, valid, and its icons answer", async ({ page, request }) => {
  await page.goto("/sign-in");
  const href = await page.locator('link[rel="manifest"]').getAttribute("href");
  expect(href).toMatch(/^\/manifest\.webmanifest/);
  const res = await request.get(href!);
  expect(res.status()).toBe(200);
  expect(res.headers()["content-type"]).toMatch(/^application\/manifest\+json/);
  const manifest = (await res.json()) as { name: string; start_url: string; display: string; icons: { src: string; sizes: string; type: string; purpose?: string }[] };
  expect(manifest).toMatchObject({ name: "Benchside", short_name: "Benchside", start_url: "/shop", display: "standalone", background_color: "#F5F2EC" });
  expect(manifest.icons.map((i) => `${i.sizes} ${i.purpose ?? "any"}`)).toEqual(expect.arrayContaining(["192x192 any", "512x512 any", "512x512 maskable"]));
  for (const icon of manifest.icons) {
    const got = await request.get(icon.src);
    expect(got.status(), icon.src).toBe(200);
    expect(got.headers()["content-type"], icon.src).toContain(icon.type);
  }
});

test("the service worker is served and registers on a staff job page, scoped to the shop area", async ({ browser, request }) => {
  const sw = await request.get("/sw.js");
  expect(sw.status()).toBe(200);
  expect(sw.headers()["content-type"]).toMatch(/javascript/);
  const source = await sw.text();
  // Built by scripts/build-sw.mjs for this build: its own files are in the precache list.
  expect(source).toContain("/_next/static/");
  expect(source).toContain("benchside-pages");

  const { context, page } = await phone(browser);
  await page.goto(JOB);
  await expect(page.getByRole("heading", { level: 1, name: /^J-0002/ })).toBeVisible();
  // The worker belongs to this build: the scripts this page loads are on its precache list.
  const scripts = await page.locator('script[src^="/_next/static/"]').evaluateAll((els) => els.map((el) => new URL((el as HTMLScriptElement).src).pathname));
  expect(scripts.length).toBeGreaterThan(0);
  for (const src of scripts) expect(source, src).toContain(`"${src}"`);
  const reg = await workerReady(page);
  expect(new URL(reg.scope).pathname).toBe("/shop/");
  expect(new URL(reg.script).pathname).toBe("/sw.js");
  await context.close();
});

test("no service worker on the owner's pages", async ({ browser }) => {
  const context = await browser.newContext({ viewport: PHONE, storageState: storageStatePath("jobCustomer") });
  const page = await context.newPage();
  await page.goto("/my");
  await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
  await page.waitForLoadState("load");
  await page.waitForTimeout(1_000);
  expect(await page.evaluate(async () => (await navigator.serviceWorker.getRegistrations()).length)).toBe(0);
  await context.close();
});

test("a staff job page opens offline from the cache after one visit", async ({ browser }) => {
  test.setTimeout(90_000);
  const { context, page } = await phone(browser);
  await page.goto(JOB);
  await expect(page.getByRole("heading", { level: 1, name: /^J-0002/ })).toBeVisible();
  await workerReady(page);
  // The page the worker started on is handed to it to keep (components/service-worker.tsx).
  await expect.poll(() => pageKept(page, page.url()), { timeout: 30_000 }).toBe(true);

  await context.setOffline(true);
  expect(await page.evaluate(() => fetch("/api/health").then(() => "online", () => "offline"))).toBe("offline");
  const answer = await page.reload();
  expect(answer?.fromServiceWorker()).toBe(true);
  await expect(page.getByRole("heading", { level: 1, name: /^J-0002/ })).toBeVisible();
  await expect(page.getByRole("heading", { name: "Journal", exact: true })).toBeVisible();
  // Its scripts came from the precache too: the page works, the quick-post bar opens the note box.
  await quickPost(page).getByRole("button", { name: "Note" }).click();
  await expect(page.getByRole("tab", { name: "Note" })).toHaveAttribute("aria-selected", "true");
  await expect(page.getByRole("textbox", { name: "Note", exact: true })).toBeFocused();
  await context.setOffline(false);
  await context.close();
});

test("signing out empties the offline copies", async ({ browser }) => {
  test.setTimeout(90_000);
  // A session of its own: signing out ends it on the server, and the persona's saved one must live on.
  const { context, page } = await phone(browser, { signedIn: false });
  await new SignInPage(page).signInAsStaff(STAFF.technician.email, STAFF.technician.password);
  await expect(page).toHaveURL(/\/shop(\/|$)/);
  await page.goto(JOB);
  await expect(page.getByRole("heading", { level: 1, name: /^J-0002/ })).toBeVisible();
  await workerReady(page);
  await expect.poll(() => pageKept(page, page.url()), { timeout: 30_000 }).toBe(true);

  await page.getByRole("button", { name: `Sign out ${STAFF.technician.email}` }).click();
  await expect(page).toHaveURL(/\/sign-in/);
  await expect.poll(() => page.evaluate(() => Promise.all([caches.has("benchside-pages"), caches.has("benchside-photos")]))).toEqual([false, false]);
  await context.close();
});

test("the quick-post bar opens the right forms at 390 px, within a thumb's reach", async ({ browser }) => {
  test.setTimeout(90_000);
  const { context, page } = await phone(browser);
  await page.goto(JOB);
  const bar = quickPost(page);
  await expect(bar).toBeVisible();
  // Along the bottom edge of the phone's screen, every target at least 44 px high.
  const box = (await bar.boundingBox())!;
  expect(box.y + box.height).toBeGreaterThan(PHONE.height - 4);
  expect(box.y).toBeGreaterThan(PHONE.height / 2);
  for (const name of ["Note", "Photo", "Clip", "Torque", "Reading"]) {
    const target = bar.getByRole(name === "Torque" || name === "Reading" ? "link" : "button", { name, exact: true });
    const size = (await target.boundingBox())!;
    expect(size.height, name).toBeGreaterThanOrEqual(44);
    expect(size.width, name).toBeGreaterThanOrEqual(44);
  }

  // Note: the composer's note tab, the caret in the note box.
  await bar.getByRole("button", { name: "Note", exact: true }).click();
  await expect(page.getByRole("tab", { name: "Note" })).toHaveAttribute("aria-selected", "true");
  await expect(page.getByRole("textbox", { name: "Note", exact: true })).toBeFocused();
  // While a field has the keyboard the bar makes room on a phone; leaving the field brings it back.
  await expect(bar).toBeHidden();
  await page.locator("h1").click();
  await expect(bar).toBeVisible();

  // Photo and clip: the composer's tab, and the camera (a file input with `capture`).
  for (const [name, tab, accept] of [["Photo", "Photos", "image/*"], ["Clip", "Clip", "video/*"]] as const) {
    const chooser = page.waitForEvent("filechooser");
    await bar.getByRole("button", { name, exact: true }).click();
    const input = (await chooser).element();
    expect(await input.getAttribute("capture"), name).toBe("environment");
    expect(await input.getAttribute("accept"), name).toBe(accept);
    await expect(page.getByRole("tab", { name: tab })).toHaveAttribute("aria-selected", "true");
  }

  // Torque: the bench page, the caret in the torque form.
  await bar.getByRole("link", { name: "Torque", exact: true }).click();
  await expect(page).toHaveURL(/\/bench#torque$/);
  await expect.poll(() => page.evaluate(() => document.activeElement?.closest("section")?.getAttribute("aria-labelledby"))).toBe("torque");

  // Reading, from the bench page's own bar: the readings form.
  await page.locator("h1").click();
  await quickPost(page).getByRole("button", { name: "Reading", exact: true }).click();
  await expect.poll(() => page.evaluate(() => document.activeElement?.closest("section")?.getAttribute("aria-labelledby"))).toBe("readings");

  // Note from the bench page: back on the job page, in the note box.
  await page.locator("h1").click();
  await quickPost(page).getByRole("link", { name: "Note", exact: true }).click();
  await expect(page).toHaveURL(new RegExp(`${JOB}#compose-note$`));
  await expect(page.getByRole("textbox", { name: "Note", exact: true })).toBeFocused();
  await context.close();
});

test("a photo taken from the bench page's bar lands in the job page's composer", async ({ browser }) => {
  test.setTimeout(90_000);
  const { context, page } = await phone(browser);
  await page.goto(BENCH);
  const chooser = page.waitForEvent("filechooser");
  await quickPost(page).getByRole("button", { name: "Photo", exact: true }).click();
  await (await chooser).setFiles(PHOTO);
  await expect(page).toHaveURL(new RegExp(`${JOB}#compose-photo$`));
  await expect(page.getByRole("tab", { name: "Photos" })).toHaveAttribute("aria-selected", "true");
  const set = page.getByRole("list", { name: "Photos in this set" });
  await expect(set.getByText("Uploaded")).toHaveCount(1);
  // Post it as any photo is posted, then take it away again: the seed stays as it was.
  const caption = `Quick-post photo ${Date.now().toString(36)}`;
  await page.getByLabel("Caption (optional)").fill(caption);
  await page.getByRole("button", { name: "Post 1 photo" }).click();
  const job = new JobPage(page);
  const entry = job.entry(caption);
  await expect(entry.locator("img")).toHaveCount(1);
  await job.deleteEntry(entry);
  await context.close();
});

test("bench cautions show in full on the first visit, fold afterwards and open in one tap", async ({ browser }) => {
  const { context, page } = await phone(browser);
  const caution = page.getByRole("complementary", { name: "Safety caution" }).filter({ hasText: "Working safely at the bench" });
  await page.goto(BENCH);
  await expect(caution.getByRole("listitem").first()).toBeVisible();
  await expect(caution.getByRole("button", { name: "Hide the safety caution" })).toBeVisible();
  await expect(caution).toContainText("Follow the maker's service manual");

  await page.reload();
  await expect(caution.getByRole("button", { name: "Show the safety caution" })).toBeVisible();
  await expect(caution.getByRole("listitem").first()).toBeHidden();
  // The title and the deferral stay on screen while it is folded.
  await expect(caution.getByText("Working safely at the bench")).toBeVisible();
  await expect(caution.getByText("Follow the maker's service manual, local codes and licensed practice.")).toBeVisible();
  await caution.getByRole("button", { name: "Show the safety caution" }).click();
  await expect(caution.getByRole("listitem").first()).toBeVisible();

  // Another job's bench page is another page: shown in full there the first time.
  await page.goto("/shop/copper-gulch/jobs/5/bench");
  await expect(caution.getByRole("listitem").first()).toBeVisible();
  await context.close();
});

for (const colorScheme of ["light", "dark"] as const) {
  test(`job and bench pages at 390 px have no WCAG 2.2 AA violations axe can find (${colorScheme})`, async ({ browser }) => {
    const { context, page } = await phone(browser, { colorScheme });
    // Each page twice: cautions in full (first visit), then folded.
    for (const where of [JOB, BENCH, BENCH]) {
      await page.goto(where);
      await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
      await expect(quickPost(page)).toBeVisible();
      const { violations } = await new AxeBuilder({ page }).withTags(TAGS).analyze();
      expect(violations.map((v) => `${where} ${v.id}: ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`)).toEqual([]);
    }
    await context.close();
  });
}

test.describe("the outbox and the photo viewer at 390 px", () => {
  // A job of its own (the demo owner's), removed afterwards so the seed's counts hold.
  test.afterAll(async () => {
    await sql("DELETE FROM jobs WHERE public_id LIKE 'INSTAX%'");
  });

  /**
   * A button pressed straight after typing: on a phone the quick-post bar makes room while a field
   * has the keyboard and comes back once it is left, a moment later, so the bar never lands under
   * the press that left the field and takes its click (it did, before). Then the bar is back.
   */
  const pressAfterTyping = async (page: Page, button: Locator) => {
    await expect(quickPost(page)).toBeHidden();
    await button.click();
    await expect(quickPost(page)).toBeVisible();
  };

  /** The tabs work once the page has hydrated: on a busy machine the first click can come before. */
  const openTab = (page: Page, name: "Note" | "Photos") =>
    expect(async () => {
      await page.getByRole("tab", { name }).click();
      await expect(page.getByRole("tab", { name })).toHaveAttribute("aria-selected", "true", { timeout: 2000 });
    }).toPass({ timeout: 30_000 });

  const scan = async (page: Page, what: string) => {
    const { violations } = await new AxeBuilder({ page }).withTags(TAGS).analyze();
    expect(violations.map((v) => `${what} ${v.id}: ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`)).toEqual([]);
  };

  test("the open photo viewer, and 'Waiting to send' with a waiting, a refused and someone else's post beside 'Kept on this phone', have no WCAG 2.2 AA violations axe can find (light and dark)", async ({ browser }) => {
    test.setTimeout(120_000);
    const id = Date.now().toString(36);
    const job = await newDemoJob("INSTAX", `Axe at 390 px ${id}`);
    const jobPath = `/shop/copper-gulch/jobs/${job.number}`;
    const { context, page } = await phone(browser);
    const journal = new JobPage(page);
    await journal.open(jobPath);
    await openTab(page, "Photos");

    // The photo viewer, open on a photo posted here.
    await page.getByLabel("Take or choose photos").setInputFiles(PHOTO);
    await expect(page.getByRole("list", { name: "Photos in this set" }).getByText("Uploaded")).toHaveCount(1);
    const caption = `Viewer at 390 px ${id}`;
    await page.getByLabel("Caption (optional)").fill(caption);
    await pressAfterTyping(page, page.getByRole("button", { name: "Post 1 photo" }));
    const photos = journal.entry(caption);
    await expect(photos.locator("img")).toHaveCount(1);
    await photos.getByRole("button", { name: "Open photo 1 of 1" }).click();
    await expect(page.locator(".yarl__slide_image")).toBeVisible();
    for (const scheme of ["light", "dark"] as const) {
      await page.emulateMedia({ colorScheme: scheme });
      await scan(page, `photo viewer (${scheme})`);
    }
    await page.keyboard.press("Escape");
    await expect(page.locator(".yarl__slide_image")).toHaveCount(0);
    await page.emulateMedia({ colorScheme: "light" });

    // Someone who used this phone before left a post of theirs (never sent under this name).
    await plantOutboxItem(page, {
      key: `bo-e2e-${id}-other`,
      kind: "note",
      job: job.publicId,
      label: "Note by someone else",
      payload: { kind: "note", note: { type: "doc" }, visibility: "shop" },
      by: (await staffUserId("technician")) + 100_000,
    });
    await page.reload();
    await expect(page.getByRole("heading", { name: "Waiting to send (1)" })).toBeVisible();

    // A note queued offline, then refused: the desk handed the machine back meanwhile.
    await openTab(page, "Note");
    await page.getByRole("textbox", { name: "Note", exact: true }).click();
    await context.setOffline(true);
    await page.keyboard.type(`Refused later ${id}`);
    await pressAfterTyping(page, page.getByRole("button", { name: "Post note" }));
    await expect(page.getByText(/Kept on this phone: the note is sent/)).toBeVisible();
    await sql("UPDATE jobs SET status = 'picked_up' WHERE public_id = ?", [job.publicId]);
    await context.setOffline(false);
    const outbox = page.getByTestId("outbox-item");
    await expect(outbox.filter({ hasText: "Not sent: This job was collected" })).toBeVisible({ timeout: 30_000 });
    // A status move queued offline: waiting, with the form's "Kept on this phone" notice.
    await context.setOffline(true);
    const status = page.locator("form#post-status");
    // Choosing in a list has the focus on it, as a tap on the phone does (selectOption alone doesn't).
    await status.getByLabel("Move to").focus();
    await status.getByLabel("Move to").selectOption({ label: "On the bench" });
    await pressAfterTyping(page, status.getByRole("button", { name: "Change status" }));
    await expect(status.getByText("Kept on this phone", { exact: true })).toBeVisible();
    await expect(page.getByRole("heading", { name: "Waiting to send (3)" })).toBeVisible();
    await expect(outbox.filter({ hasText: "Queued on this phone by another person" })).toBeVisible();
    await expect(outbox.filter({ hasText: "Move to On the bench" }).getByText("Waiting", { exact: true })).toBeVisible();
    for (const scheme of ["light", "dark"] as const) {
      await page.emulateMedia({ colorScheme: scheme });
      await scan(page, `waiting to send (${scheme})`);
    }
    await context.close();
  });
});
