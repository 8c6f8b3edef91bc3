import fs from "node:fs";
import http from "node:http";
import path from "node:path";
import AxeBuilder from "@axe-core/playwright";
import { type Page, expect, test } from "@playwright/test";
import exifr from "exifr";
import { newDemoJob, sql } from "./db";
import { CheckInForm } from "./pages/check-in-form";
import { JobPage } from "./pages/job-page";
import { SignInPage } from "./pages/sign-in-page";
import { storageStatePath } from "./personas";

const FIXTURES = path.join(__dirname, "..", "fixtures", "photos");
const publicIds = new Map<string, string>();
const stamp = () => Date.now().toString(36);
// A new owner per run, whose job is removed afterwards so the board counts other tests expect hold.
const ownerEmail = `noor.ashby.${stamp()}@mail.test`;

test.beforeAll(async () => {
  for (const r of await sql("SELECT s.slug, j.number, j.public_id FROM jobs j JOIN shops s ON s.id = j.shop_id")) publicIds.set(`${r.slug}/${r.number}`, String(r.public_id));
});

test.afterAll(async () => {
  await sql("DELETE FROM jobs WHERE public_id LIKE 'JRNLSHR%'");
  await sql("DELETE j FROM jobs j JOIN customers c ON c.id = j.customer_id WHERE c.email = ?", [ownerEmail]);
  await sql("DELETE FROM customers WHERE email = ?", [ownerEmail]);
});

test("a technician checks a machine in, posts a note and two photos and shares one; the owner signs in and sees exactly what was shared", async ({ browser }) => {
  test.setTimeout(120_000);
  const id = stamp();
  const staff = await browser.newContext({ storageState: storageStatePath("technician") });
  const counter = await staff.newPage();
  const form = new CheckInForm(counter);
  await form.openFromBoard();
  await form.newOwner({ name: "Noor Ashby", email: ownerEmail, phone: "+1 555 010 7788" });
  await form.newMachine({ kind: "ATV", make: "Tessaro", model: "Ridgeline 450", year: "2018", serial: `TSR45-${id}`, hours: "210" });
  await form.concern().fill("Oil light flickers at idle when hot.");
  await form.submit();
  // Straight after check-in the page opens on photos, for the intake condition.
  await expect(counter.getByRole("tab", { name: "Photos" })).toHaveAttribute("aria-selected", "true");
  const bench = new JobPage(counter);

  // A note whose text carries a script: it must read as text and run nothing.
  const script = "<script>window.__benchsidePwned = 1</script>";
  const note = await bench.postNote(`Bench check ${id}: ${script}`);
  await expect(note).toContainText(script);
  await expect(note.getByText("Shop only")).toBeVisible();
  expect(await counter.evaluate(() => (window as unknown as { __benchsidePwned?: number }).__benchsidePwned)).toBeUndefined();

  // Two photos, one per set; the one from the camera carries GPS in its EXIF.
  const magnet = await bench.postPhotos([path.join(FIXTURES, "gps.jpg")], `Drain plug magnet ${id}`);
  const slider = await bench.postPhotos([path.join(FIXTURES, "plain.png")], `Slider wear ${id}`);
  await magnet.getByRole("button", { name: "Share with owner" }).click();
  await expect(magnet.getByText("Shared with owner")).toBeVisible();
  const sharedThumb = (await magnet.locator("img").first().getAttribute("src"))!;
  const hiddenThumb = (await slider.locator("img").first().getAttribute("src"))!;

  // The owner signs in with an e-mailed link, on a phone, and opens the new job.
  const ownerContext = await browser.newContext({ viewport: { width: 390, height: 844 } });
  const owner = await ownerContext.newPage();
  await new SignInPage(owner).signInAsOwner(ownerEmail);
  await owner.getByTestId("my-job").filter({ hasText: "Tessaro Ridgeline 450" }).getByRole("link").click();
  const updates = owner.getByRole("region", { name: "Updates from the shop" });
  await expect(updates.getByText(`Drain plug magnet ${id}`)).toBeVisible();
  // Shared: the check-in's status entry and the one photo set. Nothing shop-only.
  await expect(updates.getByRole("article")).toHaveCount(2);
  await expect(updates.getByText(`Slider wear ${id}`)).toHaveCount(0);
  await expect(updates.getByText(`Bench check ${id}`)).toHaveCount(0);

  // Guessing the shop-only photo's address gets nothing, at any size (the srcset copies included).
  expect((await owner.request.get(hiddenThumb)).status()).toBe(404);
  expect((await owner.request.get(hiddenThumb.replace(/\/thumb$/, "/display"))).status()).toBe(404);
  expect((await owner.request.get(hiddenThumb.replace(/\/thumb$/, "/w640"))).status()).toBe(404);

  // The shared photo comes back without the GPS position the camera wrote.
  expect(await exifr.gps(fs.readFileSync(path.join(FIXTURES, "gps.jpg")))).toMatchObject({ latitude: expect.any(Number) });
  const served = await owner.request.get(sharedThumb.replace(/\/thumb$/, "/display"));
  expect(served.status()).toBe(200);
  expect(served.headers()["content-type"]).toBe("image/jpeg");
  expect(await exifr.gps(await served.body())).toBeFalsy();
  const copy = await owner.request.get(sharedThumb.replace(/\/thumb$/, "/w640"));
  expect([copy.status(), copy.headers()["content-type"]]).toEqual([200, "image/jpeg"]);

  // The viewer opens full size on a phone and closes again.
  await updates.getByRole("button", { name: "Open photo 1 of 1" }).click();
  await expect(owner.locator(".yarl__slide_image")).toBeVisible();
  await owner.keyboard.press("Escape");
  await expect(owner.locator(".yarl__slide_image")).toHaveCount(0);

  // Sharing the note later: it reaches the open page without a reload, still as plain text.
  await note.getByRole("button", { name: "Share with owner" }).click();
  await expect(note.getByText("Shared with owner")).toBeVisible();
  await expect(updates.getByText(`Bench check ${id}`)).toBeVisible({ timeout: 30_000 });
  await expect(updates.getByText(script)).toBeVisible();
  expect(await owner.evaluate(() => (window as unknown as { __benchsidePwned?: number }).__benchsidePwned)).toBeUndefined();

  // Deleting a shared entry takes it away from the owner, too.
  await bench.deleteEntry(note);
  await owner.reload();
  await expect(updates.getByText(`Drain plug magnet ${id}`)).toBeVisible();
  await expect(updates.getByText(`Bench check ${id}`)).toHaveCount(0);

  await expectNoViolations(owner);
  await staff.close();
  await ownerContext.close();
});

test.describe("as a technician", () => {
  test.use({ storageState: storageStatePath("technician") });

  test("an edit keeps the old words in the entry's history", async ({ page }) => {
    const id = stamp();
    const bench = new JobPage(page);
    await bench.open("/shop/copper-gulch/jobs/3");
    const note = await bench.postNote(`Fan relay clicks ${id}`);
    await note.getByRole("button", { name: "Edit" }).click();
    const editor = note.getByRole("textbox", { name: "Edit note", exact: true });
    await editor.click();
    await page.keyboard.press("End");
    await page.keyboard.type(" but the fan stays off");
    await note.getByRole("button", { name: "Save changes" }).click();
    await expect(note).toContainText(`Fan relay clicks ${id} but the fan stays off`);
    await expect(note).toContainText("(edited)");
    await note.getByRole("button", { name: "History" }).click();
    await expect(note.getByRole("list", { name: "Earlier versions" })).toContainText("Edited by Mateo Brandt");
  });

  test("the status moves only where its rules allow, and the move lands in the timeline", async ({ page }) => {
    const bench = new JobPage(page);
    await bench.open("/shop/copper-gulch/jobs/3");
    const moveTo = page.getByLabel("Move to");
    // "On the bench" can't jump to "Collected": it isn't offered.
    await expect(moveTo.locator("option")).toHaveText(["Diagnosing", "Needs owner's OK", "Waiting on parts", "Ready to collect"]);
    await moveTo.selectOption({ label: "Diagnosing" });
    await page.getByLabel("Note for the owner (optional)").fill("Rechecking the fan circuit");
    await page.getByRole("button", { name: "Change status" }).click();
    const entry = page.getByRole("article").filter({ hasText: "Rechecking the fan circuit" });
    await expect(entry).toBeVisible();
    await expect(entry).toContainText("Diagnosing");
    await expect(page.getByRole("region", { name: "Where it stands" })).toContainText("Diagnosing");
  });

  test("share ticked after the photos were chosen: the set comes out shared", async ({ page }) => {
    const id = stamp();
    const job = await newDemoJob("JRNLSHR", `Photos shared late ${id}`);
    await new JobPage(page).open(`/shop/copper-gulch/jobs/${job.number}`);
    // The tabs work once the page has hydrated: on a busy machine the first click can come before.
    await expect(async () => {
      await page.getByRole("tab", { name: "Photos" }).click();
      await expect(page.getByRole("tab", { name: "Photos" })).toHaveAttribute("aria-selected", "true", { timeout: 2000 });
    }).toPass({ timeout: 30_000 });
    // The photo first (it uploads at once), the share box after.
    await page.getByLabel("Take or choose photos").setInputFiles(path.join(FIXTURES, "plain.png"));
    await expect(page.getByRole("list", { name: "Photos in this set" }).getByText("Uploaded")).toHaveCount(1);
    await page.getByLabel("Share with the owner now (otherwise shop only)").check();
    const caption = `Shared late ${id}`;
    await page.getByLabel("Caption (optional)").fill(caption);
    await page.getByRole("button", { name: "Post 1 photo" }).click();
    const entry = new JobPage(page).entry(caption);
    await expect(entry.locator("img")).toHaveCount(1);
    await expect(entry.getByText("Shared with owner")).toBeVisible();
    expect(await sql("SELECT e.visibility FROM journal_entries e JOIN jobs j ON j.id = e.job_id WHERE j.public_id = ? AND e.kind = 'photos'", [job.publicId])).toEqual([{ visibility: "shared" }]);
  });

  test("a PDF picked as a photo is named at once with what a set takes, and nothing is sent", async ({ page }) => {
    await new JobPage(page).open("/shop/copper-gulch/jobs/3");
    await expect(async () => {
      await page.getByRole("tab", { name: "Photos" }).click();
      await expect(page.getByRole("tab", { name: "Photos" })).toHaveAttribute("aria-selected", "true", { timeout: 2000 });
    }).toPass({ timeout: 30_000 });
    const uploads: string[] = [];
    page.on("request", (r) => {
      if (r.method() === "POST" && r.url().includes("/photos")) uploads.push(r.url());
    });
    await page.getByLabel("Take or choose photos").setInputFiles({ name: "estimate.pdf", mimeType: "application/pdf", buffer: Buffer.from("%PDF-1.4\n% not a photo\n") });
    const set = page.getByRole("list", { name: "Photos in this set" });
    await expect(set).toContainText('"estimate.pdf" is a PDF document, not a photo we can take. A photo set takes JPEG, PNG or WebP photos.');
    await expect(page.getByRole("button", { name: "Post photos" })).toBeDisabled();
    expect(uploads).toEqual([]);
  });

  test("bad input gets a clear answer and writes nothing", async ({ page }) => {
    const job = publicIds.get("copper-gulch/3")!;
    const post = (data: unknown) => page.request.post(`/api/jobs/${job}/entries`, { data });
    const para = (content: unknown[]) => ({ kind: "note", note: { type: "doc", content: [{ type: "paragraph", content }] } });

    const empty = await post({ kind: "note", note: { type: "doc", content: [{ type: "paragraph" }] } });
    expect(empty.status()).toBe(422);
    expect((await empty.json()).error.message).toMatch(/write something/i);

    const huge = await post(para([{ type: "text", text: "x".repeat(200_000) }]));
    expect(huge.status()).toBe(422);
    expect((await huge.json()).error.message).toMatch(/too long/i);

    const jsLink = await post(para([{ type: "text", text: "click", marks: [{ type: "link", attrs: { href: "javascript:alert(1)" } }] }]));
    expect(jsLink.status()).toBe(422);
    expect((await jsLink.json()).error.message).toMatch(/http/i);

    const exe = await page.request.post(`/api/jobs/${job}/photos`, {
      multipart: { photo: { name: "brake-pads.jpg", mimeType: "image/jpeg", buffer: fs.readFileSync(path.join(FIXTURES, "not-a-photo.jpg")) } },
    });
    expect(exe.status()).toBe(422);
    expect((await exe.json()).error.message).toMatch(/not a photo/i);

    const tooBig = await earlyAnsweredWithRetry(() => postEarlyAnswered(page, `/api/jobs/${job}/photos`, "photo", "huge.jpg", 50 * 1024 * 1024));
    expect(tooBig.status).toBe(413);
    expect(JSON.parse(tooBig.body).error.message).toMatch(/20 MB/);

    // Another shop's job looks like no job at all.
    const elsewhere = await page.request.post(`/api/jobs/${publicIds.get("saltmarsh/1")}/entries`, { data: para([{ type: "text", text: "hello" }]) });
    expect(elsewhere.status()).toBe(404);

    // None of the refused notes was written.
    const timeline = await (await page.request.get(`/api/jobs/${job}/timeline?limit=100`)).json();
    expect(JSON.stringify(timeline)).not.toContain("x".repeat(1000));
  });
});

/**
 * A multipart upload of `bytes` zero bytes that reads the answer while still sending, as a browser
 * does: the server refuses an over-size body from its declared length and closes the connection,
 * so a client that only reads once it has sent everything gets a broken pipe instead of the 413.
 */
class ResetBeforeAnswer extends Error {}

/** The early answer, asked for again (at most three times) when the connection was reset before it could be read. */
async function earlyAnsweredWithRetry(send: () => Promise<{ status: number; body: string }>): Promise<{ status: number; body: string }> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await send();
    } catch (error) {
      if (!(error instanceof ResetBeforeAnswer) || attempt >= 3) throw error;
    }
  }
}

async function postEarlyAnswered(page: Page, route: string, field: string, filename: string, bytes: number): Promise<{ status: number; body: string }> {
  const url = new URL(route, process.env.APP_URL ?? "http://localhost:3110");
  const cookie = (await page.context().cookies(url.origin)).map((c) => `${c.name}=${c.value}`).join("; ");
  const boundary = `----benchside${Date.now().toString(36)}`;
  const head = Buffer.from(`--${boundary}\r\nContent-Disposition: form-data; name="${field}"; filename="${filename}"\r\nContent-Type: image/jpeg\r\n\r\n`);
  const tail = Buffer.from(`\r\n--${boundary}--\r\n`);
  return new Promise((resolve, reject) => {
    const req = http.request(url, {
      method: "POST",
      headers: { cookie, origin: url.origin, "content-type": `multipart/form-data; boundary=${boundary}`, "content-length": String(head.length + bytes + tail.length) },
    });
    req.on("response", (res) => {
      let body = "";
      res.setEncoding("utf8");
      res.on("data", (chunk: string) => (body += chunk));
      res.on("end", () => resolve({ status: res.statusCode ?? 0, body }));
      // Cut off part-way by the reset: no whole answer to check, so it counts as none.
      res.on("close", () => (res.complete ? undefined : reject(new ResetBeforeAnswer("the answer was cut off"))));
    });
    // Once the server has answered and closed, the rest of the body has nowhere to go: expected.
    // But a reset can also reach this side before the answer was read (TCP drops what the client
    // hadn't read yet when a reset arrives): then no answer ever comes, and the caller may try again.
    let answered = false;
    req.on("response", () => (answered = true));
    req.on("error", (error: NodeJS.ErrnoException) => {
      if (!["EPIPE", "ECONNRESET"].includes(error.code ?? "")) return reject(error);
      setTimeout(() => (answered ? undefined : reject(new ResetBeforeAnswer(`${error.code} before any answer`))), 1000);
    });
    req.write(head);
    const chunk = Buffer.alloc(1024 * 1024);
    let sent = 0;
    const more = () => {
      while (sent < bytes && !req.destroyed) {
        const n = Math.min(chunk.length, bytes - sent);
        sent += n;
        if (!req.write(n === chunk.length ? chunk : chunk.subarray(0, n))) return void req.once("drain", more);
      }
      if (!req.destroyed) req.end(tail);
    };
    more();
  });
}

async function expectNoViolations(page: Page) {
  // WCAG 2.2 AA through axe-core's rule tags (see accessibility.spec.ts).
  const { violations } = await new AxeBuilder({ page }).withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa", "wcag22aa"]).analyze();
  expect(violations.map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`)).toEqual([]);
}
