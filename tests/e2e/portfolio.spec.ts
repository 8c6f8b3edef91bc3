import fs from "node:fs";
import path from "node:path";
import AxeBuilder from "@axe-core/playwright";
import { type Page, expect, test } from "@playwright/test";
import { publicIdOf, sql } from "./db";
import { waitForMail } from "../support/mailbox";
import { JobPage } from "./pages/job-page";
import { mailBaseUrl } from "./pages/sign-in-page";
import { CUSTOMERS, storageStatePath } from "./personas";

// Issue 8 end to end on J-0001 (Ruth Calloway's ATV, collected): the bench shares a photo and a
// clip, the shop owner proposes the job, Ruth agrees from the e-mail's link, the shop owner
// curates and publishes, a visitor with no account reads the story with its photo and clip, and
// when Ruth withdraws the story is gone on the next request. The public pages are static (served
// from Next's cache): the shop's page is cached before the story goes out and the story is cached
// before Ruth withdraws, so each change is seen through a cached page being dropped.
const PHOTOS = path.join(__dirname, "..", "fixtures", "photos");
const CLIPS = path.join(__dirname, "..", "fixtures", "clips");
const TAGS = ["wcag2a", "wcag2aa", "wcag21a", "wcag21aa", "wcag22aa"]; // WCAG 2.2 AA through axe-core's tags

// J-0001 is reopened for a moment below: collected again whatever happened, as the seed has it.
test.afterAll(async () => {
  await sql("UPDATE jobs SET status = 'picked_up' WHERE public_id = ?", [await publicIdOf(1)]);
});

async function expectNoViolations(page: Page) {
  const { violations } = await new AxeBuilder({ page }).withTags(TAGS).analyze();
  expect(violations.map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`)).toEqual([]);
}

test("propose a collected job, the owner agrees by e-mail, the shop owner publishes, anyone reads it; withdrawn, it is gone", async ({ browser }) => {
  test.setTimeout(240_000);
  const id = Date.now().toString(36);
  const caption = `Rebuilt front end ${id}`;
  const job = await publicIdOf(1);

  // The bench shares a photo (through the API, as the composer does) and a clip (through the composer),
  // as it would have before the hand-back: nothing new is posted on a collected job, so the seed's
  // job is back in "ready" for this and collected again afterwards.
  await sql("UPDATE jobs SET status = 'ready' WHERE public_id = ?", [job]);
  const techContext = await browser.newContext({ storageState: storageStatePath("technician") });
  const tech = await techContext.newPage();
  const upload = await tech.request.post(`/api/jobs/${job}/photos`, {
    multipart: { photo: { name: "front-end.png", mimeType: "image/png", buffer: fs.readFileSync(path.join(PHOTOS, "plain.png")) } },
  });
  expect(upload.status()).toBe(200);
  const { photo } = (await upload.json()) as { photo: { id: string } };
  const posted = await tech.request.post(`/api/jobs/${job}/entries`, { data: { kind: "photos", photoIds: [photo.id], caption, visibility: "shared" } });
  expect(posted.status()).toBe(200);
  const bench = new JobPage(tech);
  await bench.open("/shop/copper-gulch/jobs/1");
  await bench.openTab("Clip");
  await tech.getByLabel("Share with the owner now (otherwise shop only)").check();
  await tech.getByLabel("Choose clips").setInputFiles(path.join(CLIPS, "bench-idle.mp4"));
  await tech.getByRole("button", { name: "Post 1 clip" }).click();
  await expect(tech.getByTestId("outbox-item")).toHaveCount(0, { timeout: 30_000 });
  await expect(tech.getByRole("article").filter({ hasText: "Clip, 0:03" }).first()).toBeVisible({ timeout: 45_000 });
  await techContext.close();
  await sql("UPDATE jobs SET status = 'picked_up' WHERE public_id = ?", [job]);

  // The shop owner proposes it from the job page; the story opens, nobody asked yet.
  const deskContext = await browser.newContext({ storageState: storageStatePath("owner") });
  const desk = await deskContext.newPage();
  await desk.goto("/shop/copper-gulch/jobs/1");
  await desk.getByRole("region", { name: "Public portfolio" }).getByRole("button", { name: "Propose for the portfolio" }).click();
  await desk.waitForURL(/\/shop\/copper-gulch\/portfolio\/\d+$/);
  const storyAdmin = desk.url();
  const publishing = desk.getByRole("region", { name: "Consent and publishing" });
  await expect(publishing).toContainText("Proposed, owner not asked yet");
  await expect(publishing.getByRole("button", { name: "Publish" })).toHaveCount(0);

  // The shop owner writes the story first: title, write-up, cover, the photo set and the clip.
  const title = `Ridgeline front end, back on the trail ${id}`;
  await desk.getByLabel(/^Title/).fill(title);
  await desk.getByLabel(/^Web address/).fill(`ridgeline-front-end-${id}`);
  await desk.getByRole("textbox", { name: "Write-up (optional)" }).click();
  await desk.keyboard.type("Came in clunking over bumps. New tie-rod ends and a torqued axle nut later, it runs straight.");
  await desk.getByRole("radio", { name: new RegExp(`Cover: Photo 1 of: .*${caption}`) }).check();
  await desk.getByRole("button", { name: new RegExp(`Add the whole set: .*${caption}`) }).click();
  await desk.getByRole("button", { name: /^Add the clip: Clip/ }).first().click();
  const items = desk.getByRole("list", { name: "In the story, in order" });
  await expect(items.getByRole("listitem")).toHaveCount(2);
  await items.getByRole("listitem").first().getByLabel("Caption for the public (optional)").fill("Tie-rod ends and boots, new");
  await desk.getByRole("button", { name: "Save the story" }).click();
  await expect(desk.getByRole("status").filter({ hasText: "Saved." })).toBeVisible();
  // Then asks the owner, who is shown this version.
  const since = new Date();
  await publishing.getByRole("button", { name: "Ask the owner by e-mail" }).click();
  await expect(publishing).toContainText("Waiting on the owner's answer");

  // Ruth follows the e-mail's button and agrees, signing with her name.
  const mail = await waitForMail({ baseUrl: mailBaseUrl(), to: CUSTOMERS.jobCustomer.email, since, subjectIncludes: "would like to show the work" });
  const link = mail.links.find((l) => l.endsWith(`/my/jobs/${job}/portfolio`));
  expect(link, "the e-mail links to the consent page").toBeTruthy();
  const ownerContext = await browser.newContext({ storageState: storageStatePath("jobCustomer") });
  const owner = await ownerContext.newPage();
  await owner.goto(link!);
  await expect(owner.getByRole("heading", { level: 1, name: "Show this job in public?" })).toBeVisible();
  // She reads the story as the public would see it before answering.
  const preview = owner.getByRole("region", { name: "The story as the public would see it" });
  await expect(preview.getByRole("heading", { name: title })).toBeVisible();
  await expect(preview).toContainText("New tie-rod ends and a torqued axle nut later");
  await owner.getByLabel(/Type your full name to sign your answer/).fill("Ruth Calloway");
  await owner.getByRole("button", { name: "Yes, the shop may show it" }).click();
  await expect(owner.getByRole("status").filter({ hasText: "the shop may now publish the story" })).toBeVisible();

  // The shop owner publishes what she agreed to.
  await desk.goto(storyAdmin);
  await expect(publishing).toContainText("Owner agreed, not public yet");
  // The shop's page, as anyone sees it, is answered from the cache before the story goes out.
  await expect.poll(async () => (await desk.request.get("/s/copper-gulch")).headers()["x-nextjs-cache"]).toBe("HIT");
  await publishing.getByRole("button", { name: "Publish" }).click();
  await expect(publishing.getByRole("button", { name: "Take it down" })).toBeVisible();
  const storyPath = `/s/copper-gulch/ridgeline-front-end-${id}`;

  // Anyone: the shop's page lists it; the story shows the photo, the clip, and good metadata.
  const visitorContext = await browser.newContext();
  const visitor = await visitorContext.newPage();
  await visitor.goto("/s/copper-gulch");
  await expect(visitor.getByRole("heading", { level: 1, name: "Copper Gulch Powersports" })).toBeVisible();
  await expectNoViolations(visitor);
  await visitor.getByRole("link", { name: title }).click();
  await visitor.waitForURL(new RegExp(`${storyPath}$`));
  await expect(visitor.getByRole("heading", { level: 1, name: title })).toBeVisible();
  const html = await visitor.content();
  for (const secret of ["Ruth", "Calloway", "TSR57-19-004418", job]) expect(html).not.toContain(secret);
  expect(await visitor.locator("body").innerText()).not.toMatch(/\$\s?\d/);
  const thumb = visitor.getByRole("list", { name: /Photos: Tie-rod ends/ }).locator("img");
  await expect.poll(() => thumb.evaluate((img) => (img as HTMLImageElement).naturalWidth)).toBeGreaterThan(0);
  const cover = visitor.getByRole("img", { name: /the machine in this story/ });
  await expect.poll(() => cover.evaluate((img) => (img as HTMLImageElement).naturalWidth)).toBeGreaterThan(0);
  // The page itself carries the cover at a phone's 1× width (lib/server/photos.ts, photoInlineCopy),
  // so it shows with the first screen on a slow line; the full-density copy covers it.
  const storyHtml = await (await visitor.request.get(storyPath)).text();
  expect(storyHtml).toMatch(/<img[^>]*src="data:image\/(avif|webp);base64,[A-Za-z0-9+/=]{200,}"/);
  const clip = visitor.getByRole("region", { name: /^Clip, part/ });
  await clip.scrollIntoViewIfNeeded();
  const player = clip.locator("video[data-clip-player]");
  await expect(player).toHaveAttribute("src", new RegExp(`${storyPath}/clips/[^/]+/video\\.mp4$`), { timeout: 20_000 });
  // It really plays for someone with no account: the browser reads the clip's length.
  await expect.poll(() => player.evaluate((el) => (el as HTMLMediaElement).duration), { timeout: 20_000 }).toBeGreaterThan(2.5);
  await expect(visitor.locator('link[rel="canonical"]')).toHaveAttribute("href", new RegExp(`${storyPath}$`));
  const ogImage = await visitor.locator('meta[property="og:image"]').getAttribute("content");
  const card = await visitor.request.get(ogImage!);
  expect([card.status(), card.headers()["content-type"]]).toEqual([200, "image/png"]);
  await expectNoViolations(visitor);
  expect(await (await visitor.request.get("/sitemap.xml")).text()).toContain(storyPath);

  // The story and its card are answered from the cache now.
  for (const url of [storyPath, ogImage!]) {
    await expect.poll(async () => (await visitor.request.get(url)).headers()["x-nextjs-cache"], { message: url }).toBe("HIT");
  }
  // The shop takes it down: the very next request is a 404; published again, it is back at once.
  await publishing.getByRole("button", { name: "Take it down" }).click();
  await expect(publishing.getByRole("button", { name: "Publish" })).toBeVisible();
  expect((await visitor.request.get(storyPath)).status()).toBe(404);
  await publishing.getByRole("button", { name: "Publish" }).click();
  await expect(publishing.getByRole("button", { name: "Take it down" })).toBeVisible();
  expect((await visitor.request.get(storyPath)).status()).toBe(200);
  await expect.poll(async () => (await visitor.request.get(storyPath)).headers()["x-nextjs-cache"]).toBe("HIT");
  // Ruth withdraws: the very next request for the story is a 404, photo and card too.
  await owner.goto(`/my/jobs/${job}/portfolio`);
  await owner.getByLabel(/Type your full name to sign your answer/).fill("Ruth Calloway");
  await owner.getByRole("button", { name: "Withdraw my consent" }).click();
  await expect(owner.getByRole("status").filter({ hasText: "no longer public" })).toBeVisible();
  expect((await visitor.goto(storyPath))?.status()).toBe(404);
  expect((await visitor.request.get(ogImage!)).status()).toBe(404);
  await visitor.goto("/s/copper-gulch");
  await expect(visitor.getByRole("link", { name: title })).toHaveCount(0);
  await Promise.all([visitorContext.close(), ownerContext.close(), deskContext.close()]);
});
