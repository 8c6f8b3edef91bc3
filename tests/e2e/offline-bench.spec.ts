// Issue 20 §2: posting from the bench with no network. Posts made offline wait in the phone's
// outbox (IndexedDB), survive a reload, and go in order once the network is back, each exactly
// once (idempotency keys), bench records included; a clip upload cut off by the network or a reload carries on.
// Needs the service worker of issue 20 §1 for the offline navigation and reload.
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { type BrowserContext, type Page, expect, test } from "@playwright/test";
import { newDemoJob, sql } from "./db";
import { BenchPage } from "./pages/bench-page";
import { JobPage } from "./pages/job-page";
import { storageStatePath } from "./personas";
import { outboxHolds, plantOutboxItem, staffUserId } from "./outbox";
import { pageKept, workerReady } from "./service-worker";

test.use({ storageState: storageStatePath("technician") });

/** An entry's JSON body as text (mysql2 hands JSON columns back parsed). */
const bodyText = (body: unknown) => (typeof body === "string" ? body : JSON.stringify(body));

// The jobs made here are the demo owner's: removed afterwards, so the owner's and the board's
// counts in owner.spec.ts and staff.spec.ts stay the seed's.
test.afterAll(async () => {
  await sql("DELETE FROM jobs WHERE public_id LIKE 'OFFL%' OR public_id LIKE 'OFFC%' OR public_id LIKE 'OFFR%' OR public_id LIKE 'OFFB%'");
});
const FIXTURES = path.join(__dirname, "..", "fixtures", "photos");

/** A clip of about `mb` MB (test pattern and tone, constant bit rate), made with Debian's ffmpeg. */
function makeClip(mb: number, seconds = 8): string {
  const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "offline-clip-")), "bench.mp4");
  const rate = `${Math.round((mb * 8) / seconds)}M`;
  execFileSync("ffmpeg", ["-v", "error", "-y", "-f", "lavfi", "-i", `testsrc2=duration=${seconds}:size=640x480:rate=25`, "-f", "lavfi", "-i", `sine=frequency=330:duration=${seconds}`,
    "-c:v", "libx264", "-preset", "ultrafast", "-b:v", rate, "-minrate", rate, "-maxrate", rate, "-bufsize", "2M", "-x264-params", "nal-hrd=cbr", "-pix_fmt", "yuv420p", "-c:a", "aac", "-shortest", file]);
  return file;
}

/** The outbox's line for one post, and how far it got (its progress bar). */
const outboxItem = (page: Page, label: RegExp | string) => page.getByTestId("outbox-item").filter({ hasText: label });
const progressOf = async (page: Page, label: RegExp | string) => Number((await outboxItem(page, label).getByRole("progressbar").getAttribute("value")) ?? 0);

async function openTab(page: Page, name: "Note" | "Photos" | "Clip") {
  // The tabs work once the page has hydrated: on a busy machine the first click can come before.
  await expect(async () => {
    await page.getByRole("tab", { name }).click();
    await expect(page.getByRole("tab", { name })).toHaveAttribute("aria-selected", "true", { timeout: 2000 });
  }).toPass({ timeout: 30_000 });
}

test("offline: a note, a photo set, a 20 MB clip and a torque record each appear once, in order, after a reload and the network's return", async ({ page, context }) => {
  test.setTimeout(240_000);
  const id = Date.now().toString(36);
  const job = await newDemoJob("OFFL", `Offline bench ${id}`);
  const jobPath = `/shop/copper-gulch/jobs/${job.number}`;
  const clip = makeClip(20);
  expect(fs.statSync(clip).size).toBeGreaterThan(18 * 1024 * 1024);

  // Both pages once online, so the service worker has them; the note editor is fetched on first focus.
  await page.goto(`${jobPath}/bench`);
  await expect(page.getByRole("heading", { name: /Bench tools/ })).toBeVisible();
  // The worker starts after the first staff page and is handed that page: wait until it keeps it.
  await workerReady(page);
  await expect.poll(() => pageKept(page, `${jobPath}/bench`), { timeout: 30_000 }).toBe(true);
  const journal = new JobPage(page);
  await journal.open(jobPath);
  await expect.poll(() => pageKept(page, jobPath), { timeout: 30_000 }).toBe(true);
  await openTab(page, "Note");
  await page.getByRole("textbox", { name: "Note", exact: true }).click();

  await context.setOffline(true);
  await page.keyboard.type(`Offline note ${id}`);
  await page.getByRole("button", { name: "Post note" }).click();
  await expect(page.getByText(/Kept on this phone: the note is sent/)).toBeVisible();

  await openTab(page, "Photos");
  await page.getByLabel(/Take or choose photos/).setInputFiles(path.join(FIXTURES, "plain.png"));
  await expect(page.getByText("No network: kept on this phone, sent with the set")).toBeVisible();
  await page.getByLabel("Caption (optional)").fill(`Offline photos ${id}`);
  await page.getByRole("button", { name: "Post 1 photo" }).click();
  await expect(page.getByText(/Kept on this phone: 1 photo/)).toBeVisible();

  await openTab(page, "Clip");
  await page.getByLabel("Choose clips").setInputFiles(clip);
  await expect(page.getByRole("list", { name: "Clips to post" }).getByText("Ready to post")).toBeVisible();
  await page.getByRole("button", { name: "Post 1 clip" }).click();
  await expect(page.getByRole("heading", { name: "Waiting to send (3)" })).toBeVisible();

  // The bench page, offline (from the service worker's cache): a torque record.
  await page.goto(`${jobPath}/bench#torque`);
  const torque = page.locator("form#post-torque");
  await torque.getByLabel("What was torqued").fill(`Offline flywheel nut ${id}`);
  await torque.getByLabel("Spec torque").fill("60");
  await torque.getByRole("button", { name: "Log torque" }).click();
  await expect(page.getByText("Kept on this phone", { exact: true })).toBeVisible();
  await expect(page.getByRole("heading", { name: "Waiting to send (4)" })).toBeVisible();

  // Closed and opened again, still offline: everything is still there, nothing was sent.
  await page.reload();
  await expect(page.getByRole("heading", { name: "Waiting to send (4)" })).toBeVisible();
  expect(await sql("SELECT COUNT(*) AS n FROM journal_entries WHERE job_id = (SELECT id FROM jobs WHERE public_id = ?)", [job.publicId])).toEqual([expect.objectContaining({ n: 0 })]);

  await context.setOffline(false);
  await expect(page.getByTestId("outbox-item")).toHaveCount(0, { timeout: 120_000 });

  // Exactly once each, in the order they were made.
  const rows = await sql(
    "SELECT e.kind, e.caption, e.body FROM journal_entries e JOIN jobs j ON j.id = e.job_id WHERE j.public_id = ? AND e.kind IN ('note', 'photos', 'clip', 'torque') ORDER BY e.id",
    [job.publicId],
  );
  expect(rows.map((r) => r.kind)).toEqual(["note", "photos", "clip", "torque"]);
  expect(bodyText(rows[0]!.body)).toContain(`Offline note ${id}`);
  expect(rows[1]!.caption).toBe(`Offline photos ${id}`);
  expect(bodyText(rows[3]!.body)).toContain(`Offline flywheel nut ${id}`);

  // The clip turns playable and plays.
  await journal.open(jobPath);
  const entry = page.getByRole("article").filter({ hasText: /Clip, 0:08/ }).first();
  await expect(entry).toBeVisible({ timeout: 90_000 });
  await entry.scrollIntoViewIfNeeded();
  const player = entry.locator("video[data-clip-player]");
  await expect.poll(() => player.evaluate((el) => (el as HTMLMediaElement).duration), { timeout: 20_000 }).toBeGreaterThan(7);
  await player.evaluate(async (el) => {
    const media = el as HTMLMediaElement;
    media.muted = true;
    await media.play();
  });
  await expect.poll(() => player.evaluate((el) => (el as HTMLMediaElement).currentTime), { timeout: 15_000 }).toBeGreaterThan(0.5);
});

test("offline: a chain wear reading, a measurement set and a reassembly tick each land once after a reload and the network's return", async ({ page, context }) => {
  test.setTimeout(180_000);
  const id = Date.now().toString(36);
  const job = await newDemoJob("OFFB", `Offline bench records ${id}`);
  const benchPath = `/shop/copper-gulch/jobs/${job.number}/bench`;
  const bench = new BenchPage(page);
  await bench.open(benchPath);
  // A step logged online, so the checklist has an item to tick offline.
  const removed = `Offline clutch cover ${id}`;
  await bench.logStep(removed, "Nine bolts, two lengths");
  await workerReady(page);
  await expect.poll(() => pageKept(page, benchPath), { timeout: 30_000 }).toBe(true);

  await context.setOffline(true);
  // Chain wear: the #520 pitch and 20 pitches are the form's own defaults.
  const readings = page.getByRole("region", { name: "Readings", exact: true });
  await readings.getByText("Chain wear helper").click();
  await readings.getByLabel("Which chain (optional)").fill(`Offline drive chain ${id}`);
  await readings.getByLabel("Measured length (mm)").fill("318");
  await readings.getByRole("button", { name: "Log chain wear" }).click();
  await expect(readings.getByText("Kept on this phone", { exact: true })).toBeVisible();

  // Invented limit and values: only that the set arrives once is checked.
  const sets = page.getByRole("region", { name: "Measurement sets", exact: true });
  const form = sets.getByRole("form", { name: "Record a measurement set" });
  await form.getByLabel("What was measured").selectOption({ label: "Leak-down" });
  await form.getByLabel("Maximum", { exact: true }).fill("10");
  await form.getByLabel(/^Where the limit comes from/).fill(`Offline manual ${id}`);
  await form.getByLabel(/^Measured/).first().fill("4");
  await form.getByRole("button", { name: "Log measurement set" }).click();
  await expect(sets.getByText("Kept on this phone", { exact: true })).toBeVisible();

  const item = bench.checklist(removed);
  await item.getByRole("button", { name: `Mark done: ${removed}` }).click();
  await expect(item.getByRole("button", { name: `Undo: ${removed}` })).toBeVisible();
  await expect(item.getByText("Kept on this phone", { exact: true })).toBeVisible();
  await expect(page.getByRole("heading", { name: "Waiting to send (3)" })).toBeVisible();

  // Closed and opened again, still offline: all three wait, nothing was sent.
  await page.reload();
  await expect(page.getByRole("heading", { name: "Waiting to send (3)" })).toBeVisible();
  const jobId = "(SELECT id FROM jobs WHERE public_id = ?)";
  expect(await sql(`SELECT COUNT(*) AS n FROM journal_entries WHERE job_id = ${jobId} AND kind = 'reading'`, [job.publicId])).toEqual([expect.objectContaining({ n: 0 })]);
  expect(await sql(`SELECT checked_at FROM teardown_steps WHERE job_id = ${jobId}`, [job.publicId])).toEqual([{ checked_at: null }]);

  await context.setOffline(false);
  await expect(page.getByTestId("outbox-item")).toHaveCount(0, { timeout: 60_000 });

  // Exactly once each, in the order they were made: the step (online), the chain reading, the set.
  const rows = await sql(`SELECT kind, body FROM journal_entries WHERE job_id = ${jobId} AND kind IN ('teardown', 'reading') ORDER BY id`, [job.publicId]);
  expect(rows.map((r) => r.kind)).toEqual(["teardown", "reading", "reading"]);
  expect(bodyText(rows[1]!.body)).toContain(`Offline drive chain ${id}`);
  expect(bodyText(rows[2]!.body)).toContain(`Offline manual ${id}`);
  expect(await sql(`SELECT COUNT(*) AS n FROM readings WHERE job_id = ${jobId}`, [job.publicId])).toEqual([expect.objectContaining({ n: 1 })]);
  expect(await sql(`SELECT COUNT(*) AS n FROM measurement_sets WHERE job_id = ${jobId}`, [job.publicId])).toEqual([expect.objectContaining({ n: 1 })]);
  const [step] = await sql(`SELECT checked_at, checked_by_user_id FROM teardown_steps WHERE job_id = ${jobId}`, [job.publicId]);
  expect(step!.checked_at).not.toBeNull();
  expect(step!.checked_by_user_id).not.toBeNull();
  // Its only step back on, nothing else awaited: the tick moved the job to ready, once.
  expect(await sql(`SELECT COUNT(*) AS n FROM job_status_changes WHERE job_id = ${jobId} AND to_status = 'ready'`, [job.publicId])).toEqual([expect.objectContaining({ n: 1 })]);
  // The page shows what the server now holds.
  await expect(bench.checklist(removed).getByRole("button", { name: `Undo: ${removed}` })).toBeVisible({ timeout: 15_000 });
});

// The upload itself, online throughout, with no service worker: a page it controls may hand its
// requests to the worker, outside the page's network throttling and request events.
test.describe("clip upload resume", () => {
  test.use({ serviceWorkers: "block" });

  test("a clip upload cut off by the network resumes and completes, and after a reload sends only the missing part", async ({ page, context }) => {
    test.setTimeout(240_000);
    const id = Date.now().toString(36);
    const job = await newDemoJob("OFFC", `Clip resume ${id}`);
    const jobPath = `/shop/copper-gulch/jobs/${job.number}`;
    const clip = makeClip(20);
    // Upload at about 1 MB/s, so there is time to cut it off part-way and to reload before the end.
    const cdp = await context.newCDPSession(page);
    await cdp.send("Network.enable");
    const throttle = () => cdp.send("Network.emulateNetworkConditions", { offline: false, latency: 20, downloadThroughput: -1, uploadThroughput: 1024 * 1024 });
    await throttle();
    await new JobPage(page).open(jobPath);
    await openTab(page, "Clip");
    await page.getByLabel("Choose clips").setInputFiles(clip);
    await page.getByRole("button", { name: "Post 1 clip" }).click();
    const label = /Clip: bench\.mp4/;
    await expect.poll(() => progressOf(page, label), { timeout: 60_000 }).toBeGreaterThan(0.15);

    // The network drops mid-upload, then comes back: the same upload carries on to the end.
    await context.setOffline(true);
    await page.waitForTimeout(3000);
    await expect(outboxItem(page, label)).toHaveCount(1);
    await context.setOffline(false);
    // Playwright's setOffline sets the network conditions too: slow the upload again.
    await throttle();
    await expect.poll(() => progressOf(page, label), { timeout: 60_000, intervals: [200] }).toBeGreaterThan(0.4);

    // Reloaded part-way: the outbox asks the upload where it got to and sends only the rest. The
    // reload must land part-way whatever the machine's speed: from here the page's chunks are cut
    // off (as a dead network would) until the page is reloaded; the reloaded page's requests go
    // through, and only those are kept in `puts`. (Routed only now: the throttling above is the
    // network's, and the route must not stand in its way.)
    let reloaded = false;
    let cut = 0;
    const puts: string[] = [];
    await page.route(/\/upload\//, async (route) => {
      if (route.request().method() !== "PUT") return route.fallback();
      if (!reloaded) {
        cut++;
        return route.abort("internetdisconnected");
      }
      puts.push(route.request().headers()["content-range"] ?? "");
      return route.fallback();
    });
    await expect.poll(() => cut, { timeout: 30_000, message: "the upload's next chunk was cut off" }).toBeGreaterThan(0);
    page.once("domcontentloaded", () => (reloaded = true));
    await page.reload();
    expect(reloaded).toBe(true);
    // The clip is still waiting (the outbox reads it back from the phone's store after the page
    // loads), then it goes.
    await expect(outboxItem(page, label)).toBeVisible({ timeout: 30_000 });
    await expect(page.getByTestId("outbox-item")).toHaveCount(0, { timeout: 120_000 });
    const sent = puts.filter((r) => /^bytes \d+-\d+\//.test(r));
    expect(puts[0]).toMatch(/^bytes \*\/\d+$/); // "where did I get to?"
    expect(Number(/^bytes (\d+)-/.exec(sent[0]!)![1])).toBeGreaterThan(0); // not from byte 0 again

    // One clip entry, and it plays.
    expect(await sql("SELECT COUNT(*) AS n FROM clips c JOIN jobs j ON j.id = c.job_id WHERE j.public_id = ?", [job.publicId])).toEqual([expect.objectContaining({ n: 1 })]);
    const entry = page.getByRole("article").filter({ hasText: /Clip, 0:08/ }).first();
    await expect(entry).toBeVisible({ timeout: 90_000 });
    await entry.scrollIntoViewIfNeeded();
    const player = entry.locator("video[data-clip-player]");
    await expect.poll(() => player.evaluate((el) => (el as HTMLMediaElement).duration), { timeout: 20_000 }).toBeGreaterThan(7);
  });
});

test("a post the server refuses is held with its words, never dropped: retry or discard", async ({ page, context }) => {
  test.setTimeout(90_000);
  const id = Date.now().toString(36);
  const job = await newDemoJob("OFFR", `Held post ${id}`);
  const jobPath = `/shop/copper-gulch/jobs/${job.number}`;
  await new JobPage(page).open(jobPath);
  const status = page.locator("form#post-status");
  await expect(status).toBeVisible();
  await context.setOffline(true);
  await status.getByLabel("Move to").selectOption({ label: "On the bench" });
  await status.getByRole("button", { name: "Change status" }).click();
  await expect(page.getByRole("heading", { name: "Waiting to send (1)" })).toBeVisible();
  // Meanwhile the desk moves the job on: the queued move's "from" no longer holds.
  await sql("UPDATE jobs SET status = 'ready' WHERE public_id = ?", [job.publicId]);
  await context.setOffline(false);
  const held = outboxItem(page, /Move to On the bench/);
  await expect(held.getByText(/Not sent: .*moved this job/)).toBeVisible({ timeout: 30_000 });
  await held.getByRole("button", { name: "Retry" }).click();
  await expect(held.getByText(/Not sent:/)).toBeVisible();
  await held.getByRole("button", { name: /Discard/ }).click();
  await expect(page.getByTestId("outbox-item")).toHaveCount(0);
});

// Issue 20 §2, the outbox away from the job pages and when the job moved on meanwhile. Jobs of
// their own, removed afterwards like the ones above.
test.describe("the outbox beyond the job page", () => {
  test.afterAll(async () => {
    await sql("DELETE FROM jobs WHERE public_id LIKE 'OFFS%' OR public_id LIKE 'OFFK%' OR public_id LIKE 'OFFX%'");
  });

  const notesOf = (publicId: string, text: string) =>
    sql("SELECT COUNT(*) AS n FROM journal_entries e JOIN jobs j ON j.id = e.job_id WHERE j.public_id = ? AND e.kind = 'note' AND e.body LIKE ?", [publicId, `%${text}%`]).then(
      (rows) => Number(rows[0]!.n),
    );

  async function queueNoteOffline(page: Page, context: BrowserContext, text: string) {
    await openTab(page, "Note");
    // The editor is fetched on the first touch of the note box: while still online.
    await page.getByRole("textbox", { name: "Note", exact: true }).click();
    await context.setOffline(true);
    await page.keyboard.type(text);
    await page.getByRole("button", { name: "Post note" }).click();
    await expect(page.getByText(/Kept on this phone: the note is sent/)).toBeVisible();
  }

  test("a note queued on a job page that was then closed is sent from the board alone, once", async ({ page, context }) => {
    test.setTimeout(90_000);
    const id = Date.now().toString(36);
    const job = await newDemoJob("OFFS", `Sent from the board ${id}`);
    await new JobPage(page).open(`/shop/copper-gulch/jobs/${job.number}`);
    const text = `Queued then closed ${id}`;
    await queueNoteOffline(page, context, text);
    expect(await outboxHolds(page)).toEqual([{ by: await staffUserId("technician"), state: "waiting" }]);
    await page.close();

    // The network is back; the app is opened where it starts (its manifest's /shop: the board).
    await context.setOffline(false);
    const board = await context.newPage();
    await board.goto("/shop");
    await expect(board).toHaveURL(/\/shop\/copper-gulch$/);
    await expect(board.getByTestId("outbox")).toHaveCount(0); // no outbox panel here: only the runner
    await expect.poll(() => notesOf(job.publicId, text), { timeout: 30_000 }).toBe(1);
    await expect.poll(() => outboxHolds(board), { timeout: 10_000 }).toEqual([]);
    // Nothing more goes later (a reload runs the runner again; the board's timer, another page).
    await board.reload();
    await board.waitForTimeout(2000);
    expect(await notesOf(job.publicId, text)).toBe(1);
  });

  test("a note queued before the desk collected the job is not sent: the item says why, and discard clears it", async ({ page, context }) => {
    test.setTimeout(90_000);
    const id = Date.now().toString(36);
    const job = await newDemoJob("OFFK", `Collected meanwhile ${id}`);
    await new JobPage(page).open(`/shop/copper-gulch/jobs/${job.number}`);
    const text = `Queued before the hand-back ${id}`;
    await queueNoteOffline(page, context, text);
    await expect(page.getByRole("heading", { name: "Waiting to send (1)" })).toBeVisible();
    // Meanwhile the desk hands the machine back.
    await sql("UPDATE jobs SET status = 'picked_up' WHERE public_id = ?", [job.publicId]);
    await context.setOffline(false);
    const held = outboxItem(page, "Note");
    await expect(held.getByText("Not sent: This job was collected, so nothing more can be posted on it.", { exact: false })).toBeVisible({ timeout: 30_000 });
    await expect(held.getByRole("button", { name: "Retry" })).toBeVisible();
    expect(await notesOf(job.publicId, text)).toBe(0);
    await held.getByRole("button", { name: "Discard Note" }).click();
    await expect(page.getByTestId("outbox-item")).toHaveCount(0);
    expect(await outboxHolds(page)).toEqual([]);
    expect(await notesOf(job.publicId, text)).toBe(0);
  });

  test("a clip whose entry was deleted while its upload waited says so instead of sending the rest", async ({ page }) => {
    test.setTimeout(90_000);
    const id = Date.now().toString(36);
    const job = await newDemoJob("OFFX", `Deleted clip ${id}`);
    await new JobPage(page).open(`/shop/copper-gulch/jobs/${job.number}`);
    // The clip's upload had begun (its ticket kept on the phone) when somebody deleted its entry,
    // which closes the upload at the video service.
    const made = await page.request.post(`/api/jobs/${job.publicId}/clips`, { data: { name: "bench.mp4", size: 2048, durationSeconds: 3, type: "video/mp4", visibility: "shop" } });
    expect(made.status()).toBe(200);
    const ticket = (await made.json()) as { clipId: string; entryId: number; uploadUrl: string };
    expect((await page.request.delete(`/api/jobs/${job.publicId}/entries/${ticket.entryId}`, { data: { version: 1 } })).status()).toBe(200);
    await plantOutboxItem(page, {
      key: `bo-e2e-${id}-clip`,
      kind: "clip",
      job: job.publicId,
      label: "Clip: bench.mp4",
      payload: { name: "bench.mp4", size: 2048, durationSeconds: 3, type: "video/mp4", visibility: "shop" },
      by: await staffUserId("technician"),
      files: [{ name: "bench.mp4", type: "video/mp4", text: "x".repeat(2048) }],
      ticket,
    });
    await page.reload();
    const held = outboxItem(page, "Clip: bench.mp4");
    await expect(held.getByText("Not sent: The clip's entry was deleted from the job's timeline meanwhile, so the rest of bench.mp4 was not uploaded.", { exact: false })).toBeVisible({
      timeout: 30_000,
    });
    await held.getByRole("button", { name: "Discard Clip: bench.mp4" }).click();
    await expect(page.getByTestId("outbox-item")).toHaveCount(0);
  });
});
