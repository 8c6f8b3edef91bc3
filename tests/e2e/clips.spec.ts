import path from "node:path";
import { expect, test } from "@playwright/test";
import mysql from "mysql2/promise";
import { JobPage } from "./pages/job-page";
import { storageStatePath } from "./personas";

const CLIPS = path.join(__dirname, "..", "fixtures", "clips");
test.use({ storageState: storageStatePath("technician") });

async function sql(query: string, params: unknown[] = []) {
  const db = await mysql.createConnection(process.env.DATABASE_URL!);
  try {
    await db.query(query, params);
  } finally {
    await db.end();
  }
}

test("a clip goes up in chunks, shows at once as processing and turns playable by itself", async ({ page }) => {
  test.setTimeout(90_000);
  const bench = new JobPage(page);
  await bench.open("/shop/copper-gulch/jobs/3");
  await page.getByRole("tab", { name: "Clip" }).click();
  await page.getByLabel("Choose clips").setInputFiles(path.join(CLIPS, "bench-idle.mp4"));
  const queued = page.getByRole("list", { name: "Clips on their way" });
  await expect(queued.getByText(/Sent\. It shows in the journal/)).toBeVisible({ timeout: 30_000 });

  // The newest entry is the clip; it becomes ready without a reload, with its length.
  const clip = page.getByRole("article").filter({ hasText: /Processing the clip|Uploading from the bench|Clip, 0:03/ }).first();
  await expect(clip).toBeVisible();
  await expect(clip.getByText("Clip, 0:03")).toBeVisible({ timeout: 45_000 });
  // The player loads when the clip comes into view, then plays the fake's rendition.
  await clip.scrollIntoViewIfNeeded();
  const player = clip.locator("mux-player:not([data-mux-player-react-lazy-placeholder])");
  await expect(player).toHaveAttribute("src", /\/media\/[^/]+\/video\.mp4$/, { timeout: 20_000 });
  await expect.poll(() => player.evaluate((el) => (el as HTMLMediaElement).duration), { timeout: 20_000 }).toBeGreaterThan(2.5);
});

test("a file that isn't a video ends as a clip that couldn't be processed, with the reason", async ({ page }) => {
  test.setTimeout(60_000);
  const bench = new JobPage(page);
  await bench.open("/shop/copper-gulch/jobs/3");
  await page.getByRole("tab", { name: "Clip" }).click();
  await page.getByLabel("Choose clips").setInputFiles({ name: "parts-list.mp4", mimeType: "video/mp4", buffer: Buffer.from("this is a parts list, not a video\n") });
  await expect(page.getByRole("list", { name: "Clips on their way" }).getByText(/Sent\./)).toBeVisible({ timeout: 30_000 });
  await expect(page.getByRole("article").filter({ hasText: /not a decodable video|couldn.t be processed/i }).first()).toBeVisible({ timeout: 45_000 });
});

test("a clip longer than the shop allows is refused with a clear message before it is sent", async ({ page }) => {
  await sql("UPDATE shops SET clip_max_seconds = 2 WHERE slug = 'copper-gulch'");
  try {
    const bench = new JobPage(page);
    await bench.open("/shop/copper-gulch/jobs/3");
    await page.getByRole("tab", { name: "Clip" }).click();
    await page.getByLabel("Choose clips").setInputFiles(path.join(CLIPS, "bench-idle.mp4"));
    await expect(page.getByRole("list", { name: "Clips on their way" })).toContainText("runs 0:03; the shop takes clips up to 0:02");
    // The server holds the same line when a browser can't read the length.
    const job = await page.request.post(`/api/jobs/${await publicIdOf(3)}/clips`, { data: { name: "long.mp4", size: 1000, durationSeconds: 3, type: "video/mp4" } });
    expect(job.status()).toBe(413);
  } finally {
    await sql("UPDATE shops SET clip_max_seconds = 600 WHERE slug = 'copper-gulch'");
  }
});

async function publicIdOf(number: number): Promise<string> {
  const db = await mysql.createConnection(process.env.DATABASE_URL!);
  try {
    const [rows] = await db.query<mysql.RowDataPacket[]>("SELECT j.public_id FROM jobs j JOIN shops s ON s.id = j.shop_id WHERE s.slug = 'copper-gulch' AND j.number = ?", [number]);
    return String(rows[0]!.public_id);
  } finally {
    await db.end();
  }
}
