import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import AxeBuilder from "@axe-core/playwright";
import { expect, test } from "@playwright/test";
import { newDemoJob, publicIdOf, sql } from "./db";
import { JobPage } from "./pages/job-page";
import { storageStatePath } from "./personas";

const CLIPS = path.join(__dirname, "..", "fixtures", "clips");
test.use({ storageState: storageStatePath("technician") });

// Jobs made here are the demo owner's: removed afterwards, so the seed's counts hold.
test.afterAll(async () => {
  await sql("DELETE FROM jobs WHERE public_id LIKE 'CLIPSHR%'");
});

test("a clip goes up in 1 MB chunks through a failed chunk, turns playable by itself, gets a moment, and plays for the owner", async ({ browser }) => {
  test.setTimeout(150_000);
  // A 4-second clip of a few MB, made now with ffmpeg from Debian (test pattern and a tone).
  const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "bench-clip-")), "pads.mp4");
  execFileSync("ffmpeg", ["-v", "error", "-y", "-f", "lavfi", "-i", "testsrc2=duration=4:size=640x480:rate=25", "-f", "lavfi", "-i", "sine=frequency=330:duration=4", "-c:v", "libx264", "-preset", "ultrafast", "-b:v", "6M", "-minrate", "6M", "-maxrate", "6M", "-bufsize", "1M", "-x264-params", "nal-hrd=cbr", "-pix_fmt", "yuv420p", "-c:a", "aac", "-shortest", file]);
  expect(fs.statSync(file).size).toBeGreaterThan(2 * 1024 * 1024);
  // The video service fails the next chunk once: the upload must retry it and carry on.
  const fake = process.env.MUX_BASE_URL!;
  expect((await fetch(`${fake}/_fake/fail-chunks`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ count: 1, status: 503 }) })).ok).toBe(true);

  const staff = await browser.newContext({ storageState: storageStatePath("technician") });
  const page = await staff.newPage();
  const bench = new JobPage(page);
  await bench.open("/shop/copper-gulch/jobs/5");
  // The tabs work once the page has hydrated: on a busy machine the first click can come before.
  const shareBox = page.getByLabel("Share with the owner now (otherwise shop only)");
  await bench.openTab("Clip");
  await shareBox.check();
  await page.getByLabel("Choose clips").setInputFiles(file);
  await page.getByRole("button", { name: "Post 1 clip" }).click();
  await expect(page.getByText(/1 clip on the way, shared with the owner/)).toBeVisible();
  // It goes through the phone's outbox: waiting to send, then sent (the list empties).
  await expect(page.getByTestId("outbox-item")).toHaveCount(0, { timeout: 60_000 });
  // The failure was used up on this upload (and retried past).
  expect((await (await fetch(`${fake}/_fake/status`)).json()).pending_chunk_failures).toBe(0);

  // The newest clip entry becomes ready without a reload, with its length; the player loads in view.
  const clip = page.getByRole("article").filter({ hasText: /Processing the clip|Uploading from the bench|Clip, 0:04/ }).first();
  await expect(clip.getByText("Clip, 0:04")).toBeVisible({ timeout: 60_000 });
  await clip.scrollIntoViewIfNeeded();
  const player = clip.locator("video[data-clip-player]");
  await expect(player).toHaveAttribute("src", /^\/api\/clips\/[^/]+\/video\.mp4$/, { timeout: 20_000 });
  await expect.poll(() => player.evaluate((el) => (el as HTMLMediaElement).duration), { timeout: 20_000 }).toBeGreaterThan(3.5);

  // Mark a moment at 0:02.
  await player.evaluate((el) => ((el as HTMLMediaElement).currentTime = 2.2));
  await clip.getByPlaceholder(/What is seen here/).fill("pad edge");
  await clip.getByRole("button", { name: "Mark this moment" }).click();
  await expect(clip.getByRole("list", { name: "Moments in this clip" })).toContainText("0:02 pad edge");
  const src = (await player.getAttribute("src"))!;

  // The owner opens the job on a phone: the clip plays (time moves) and the moment opens it at 0:02.
  const ownerContext = await browser.newContext({ storageState: storageStatePath("jobCustomer"), viewport: { width: 390, height: 844 } });
  const owner = await ownerContext.newPage();
  // Every request the owner's page makes, player included, goes to our own host (no player script from elsewhere).
  const hosts = new Set<string>();
  owner.on("request", (r) => {
    const url = new URL(r.url());
    if (url.protocol === "http:" || url.protocol === "https:") hosts.add(url.host);
  });
  await owner.goto(`/my/jobs/${await publicIdOf(5)}`);
  const shared = owner.getByRole("article").filter({ hasText: "Clip, 0:04" }).first();
  await shared.scrollIntoViewIfNeeded();
  const ownerPlayer = shared.locator("video[data-clip-player]");
  await expect.poll(() => ownerPlayer.evaluate((el) => (el as HTMLMediaElement).duration), { timeout: 20_000 }).toBeGreaterThan(3.5);
  await ownerPlayer.evaluate(async (el) => {
    const media = el as HTMLMediaElement;
    media.muted = true;
    await media.play();
  });
  await expect.poll(() => ownerPlayer.evaluate((el) => (el as HTMLMediaElement).currentTime), { timeout: 15_000 }).toBeGreaterThan(0.5);
  await ownerPlayer.evaluate((el) => (el as HTMLMediaElement).pause());
  await shared.getByRole("link", { name: /0:02 pad edge/ }).click();
  await expect.poll(() => ownerPlayer.evaluate((el) => (el as HTMLMediaElement).currentTime), { timeout: 10_000 }).toBeGreaterThanOrEqual(2);
  expect([...hosts]).toEqual([new URL(owner.url()).host]);

  // Made shop-only again, the clip is out of the owner's reach even at the address they saw.
  expect((await owner.request.get(src)).status()).toBe(200);
  await clip.getByRole("button", { name: "Make shop only" }).click();
  await expect(clip.getByText("Shop only")).toBeVisible();
  expect((await owner.request.get(src)).status()).toBe(404);

  // Deleting the entry removes the video at the service too.
  await bench.deleteEntry(clip);
  await expect.poll(async () => JSON.stringify(await (await fetch(`${fake}/_fake/webhooks?type=video.asset.deleted`)).json()), { timeout: 20_000 }).toContain("video.asset.deleted");
  expect((await page.request.get(src)).status()).toBe(404);
  await ownerContext.close();
  await staff.close();
});

test("a file that isn't a video leaves no entry: the bench is told why, and the failed upload can be cleared", async ({ page }) => {
  test.setTimeout(60_000);
  const bench = new JobPage(page);
  await bench.open("/shop/copper-gulch/jobs/3");
  await bench.openTab("Clip");
  await page.getByLabel("Choose clips").setInputFiles({ name: "parts-list.mp4", mimeType: "video/mp4", buffer: Buffer.from("this is a parts list, not a video\n") });
  await page.getByRole("button", { name: "Post 1 clip" }).click();
  // Sent through the outbox; the service's reason then shows in the list of clips it couldn't use.
  const failed = page.getByRole("list", { name: "Clips that couldn't be used" });
  await expect(failed.getByText(/parts-list\.mp4/)).toBeVisible({ timeout: 45_000 });
  // Nothing of it is left on the timeline.
  await expect(page.getByRole("article").filter({ hasText: /not a decodable video|parts-list/i })).toHaveCount(0);
  await failed.getByRole("button", { name: "Clear parts-list.mp4 from the list" }).first().click();
  await expect(page.getByRole("list", { name: "Clips that couldn't be used" })).toHaveCount(0);
});

test("a clip longer than the shop allows is refused with a clear message before it is sent", async ({ page }) => {
  await sql("UPDATE shops SET clip_max_seconds = 2 WHERE slug = 'copper-gulch'");
  try {
    const bench = new JobPage(page);
    await bench.open("/shop/copper-gulch/jobs/3");
    await bench.openTab("Clip");
    await page.getByLabel("Choose clips").setInputFiles(path.join(CLIPS, "bench-idle.mp4"));
    await expect(page.getByRole("list", { name: "Clips to post" })).toContainText("runs 0:03; the shop takes clips up to 0:02");
    await expect(page.getByRole("button", { name: "Post clips" })).toBeDisabled();
    // The server holds the same line when a browser can't read the length.
    const job = await page.request.post(`/api/jobs/${await publicIdOf(3)}/clips`, { data: { name: "long.mp4", size: 1000, durationSeconds: 3, type: "video/mp4" } });
    expect(job.status()).toBe(413);
  } finally {
    await sql("UPDATE shops SET clip_max_seconds = 600 WHERE slug = 'copper-gulch'");
  }
});

test("share ticked after the clip was chosen: the clip comes out shared, and its player's controls pass axe at 390 px", async ({ page, browser }) => {
  test.setTimeout(150_000);
  const id = Date.now().toString(36);
  const job = await newDemoJob("CLIPSHR", `Clip shared late ${id}`);
  const jobPath = `/shop/copper-gulch/jobs/${job.number}`;
  const journal = new JobPage(page);
  await journal.open(jobPath);
  const shareBox = page.getByLabel("Share with the owner now (otherwise shop only)");
  await journal.openTab("Clip");
  // The file first, the share box after (the order that once left the clip shop-only).
  await page.getByLabel("Choose clips").setInputFiles(path.join(CLIPS, "bench-idle.mp4"));
  await expect(page.getByRole("list", { name: "Clips to post" }).getByText("Ready to post")).toBeVisible();
  await shareBox.check();
  await page.getByRole("button", { name: "Post 1 clip" }).click();
  await expect(page.getByText(/1 clip on the way, shared with the owner/)).toBeVisible();
  await expect(page.getByTestId("outbox-item")).toHaveCount(0, { timeout: 60_000 });
  const entries = await sql("SELECT e.visibility FROM journal_entries e JOIN jobs j ON j.id = e.job_id WHERE j.public_id = ? AND e.kind = 'clip'", [job.publicId]);
  expect(entries).toEqual([{ visibility: "shared" }]);
  const clip = page.getByRole("article").filter({ hasText: "Clip, 0:03" });
  await expect(clip).toBeVisible({ timeout: 60_000 });
  await expect(clip.getByText("Shared with owner")).toBeVisible();

  // The ready clip's controls (ours, on a plain <video>) on a phone, light and dark.
  const phone = await browser.newContext({ storageState: storageStatePath("technician"), viewport: { width: 390, height: 844 } });
  const small = await phone.newPage();
  await small.goto(jobPath);
  const article = small.getByRole("article").filter({ hasText: "Clip, 0:03" });
  await article.scrollIntoViewIfNeeded();
  // The player's code comes in its own chunk: its poster holds the place until then.
  const player = article.getByRole("group", { name: /^Clip: / });
  await expect(player.getByRole("button", { name: "Play" })).toBeVisible({ timeout: 20_000 });
  await expect(player.getByRole("slider", { name: "Position in the clip" })).toBeVisible();
  for (const colorScheme of ["light", "dark"] as const) {
    await small.emulateMedia({ colorScheme });
    const { violations } = await new AxeBuilder({ page: small }).withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa", "wcag22aa"]).analyze();
    expect(violations.map((v) => `${colorScheme} ${v.id}: ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`)).toEqual([]);
  }
  await phone.close();
});

test("a text file picked as a clip is named at once with what clips take, and can't be posted", async ({ page }) => {
  const bench = new JobPage(page);
  await bench.open("/shop/copper-gulch/jobs/3");
  await bench.openTab("Clip");
  await page.getByLabel("Choose clips").setInputFiles({ name: "notes.txt", mimeType: "text/plain", buffer: Buffer.from("Chain slack 30 mm, adjust before hand-back.\n") });
  const picked = page.getByRole("list", { name: "Clips to post" });
  await expect(picked).toContainText('"notes.txt" is a text file, not a video. Clips take video files (MP4, MOV, WebM, 3GP…) from the camera or the gallery.');
  await expect(page.getByRole("button", { name: "Post clips" })).toBeDisabled();
  await expect(page.getByTestId("outbox-item")).toHaveCount(0);
});
