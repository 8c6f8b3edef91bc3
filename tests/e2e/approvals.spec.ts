import crypto from "node:crypto";
import path from "node:path";
import AxeBuilder from "@axe-core/playwright";
import { expect, request, test } from "@playwright/test";
import { sql } from "./db";
import { waitForMail } from "../support/mailbox";
import { BenchPage } from "./pages/bench-page";
import { JobPage } from "./pages/job-page";
import { mailBaseUrl } from "./pages/sign-in-page";
import { CUSTOMERS, storageStatePath } from "./personas";

// Issue 5 end to end on J-0005 (Ruth Calloway's ATV, already waiting on her for the demo's CV axle
// request: a second request may go out while one is open). The finding starts from a moment of
// a clip and carries a photo too.
const FIXTURES = path.join(__dirname, "..", "fixtures", "photos");
const CLIPS = path.join(__dirname, "..", "fixtures", "clips");

test("technician drafts, writer prices and sends, the owner answers from the e-mail; staff see the new authorised total; the record's hash is the request's", async ({ browser }) => {
  test.setTimeout(180_000);
  const id = Date.now().toString(36);
  const title = `Front brake pads worn ${id}`;

  // The technician posts a shop-only photo, then drafts the finding from the job page: no prices.
  const techContext = await browser.newContext({ storageState: storageStatePath("technician") });
  const tech = await techContext.newPage();
  const job = new JobPage(tech);
  await job.open("/shop/copper-gulch/jobs/5");
  await job.postPhotos([path.join(FIXTURES, "plain.png")], `Pad wear ${id}`);
  // A clip of the pads; once it plays, the technician stops at 0:01 and starts the finding there.
  await job.openTab("Clip");
  await tech.getByLabel("Choose clips").setInputFiles(path.join(CLIPS, "bench-idle.mp4"));
  await tech.getByRole("button", { name: "Post 1 clip" }).click();
  const clip = tech.getByRole("article").filter({ hasText: /Processing the clip|Uploading from the bench|Clip, 0:03/ }).first();
  await expect(clip.getByText("Clip, 0:03")).toBeVisible({ timeout: 60_000 });
  await clip.scrollIntoViewIfNeeded();
  const player = clip.locator("video[data-clip-player]");
  await expect.poll(() => player.evaluate((el) => (el as HTMLMediaElement).duration), { timeout: 20_000 }).toBeGreaterThan(2.5);
  await player.evaluate((el) => ((el as HTMLMediaElement).currentTime = 1.4));
  await clip.getByRole("button", { name: "Finding from this moment" }).click();
  await expect(tech.getByRole("heading", { level: 1, name: "Draft a finding" })).toBeVisible();
  await tech.getByLabel("Title").fill(title);
  await tech.getByLabel("What you found").fill("Front pads worn to 1 mm on both calipers.");
  await tech.getByLabel("Why it matters").fill("Stopping distance grows and the rotors get scored.");
  await tech.getByLabel("Does it affect safety?").selectOption("brakes");
  await expect(tech.getByRole("complementary", { name: "Safety caution" })).toContainText("Brakes decide whether the machine can stop");
  await tech.getByRole("checkbox", { name: new RegExp(`Pad wear ${id}`) }).check();
  await tech.getByRole("button", { name: "Add part" }).click();
  const part = tech.getByRole("listitem", { name: "Line 1: Part" });
  await part.getByLabel("Description").fill("Front brake pads (pair)");
  await part.getByLabel("Part number").fill("FBP-220");
  await part.getByLabel("Quantity").fill("1");
  await tech.getByRole("button", { name: "Add labour" }).click();
  const labour = tech.getByRole("listitem", { name: "Line 2: Labour" });
  await labour.getByLabel("Description").fill("Fit pads and bed them in");
  await labour.getByLabel("Hours").fill("1.5");
  await expect(part.getByLabel(/Unit price/)).toHaveCount(0);
  await tech.getByRole("button", { name: "Save the draft" }).click();
  await tech.waitForURL(/\/findings\/\d+$/);
  const findingPath = new URL(tech.url()).pathname;
  await techContext.close();

  // The service writer prices it (the shop's $115/h is already on the labour line) and sends it.
  const deskContext = await browser.newContext({ storageState: storageStatePath("writer") });
  const desk = await deskContext.newPage();
  await desk.goto(findingPath);
  await desk.getByRole("listitem", { name: "Line 1: Part" }).getByLabel("Unit price (USD)").fill("42.50");
  await expect(desk.getByRole("listitem", { name: "Line 2: Labour" }).getByLabel("Rate per hour (USD)")).toHaveValue("115.00");
  await desk.getByRole("button", { name: "Save the finding" }).click();
  // 42.50 + 172.50 + supplies 5 % of labour 8.63 + tax 8.25 % on the part 3.51 (REFERENCES §5 worked line: $42.50 → $3.51)
  const send = desk.getByRole("region", { name: "Send for approval" });
  await expect(send).toContainText("$227.14");
  const since = new Date();
  await send.getByRole("button", { name: "Send to the owner" }).click();
  await send.getByRole("button", { name: "Yes, send it" }).click();
  await expect(desk.getByRole("article", { name: "Version 1" })).toContainText("Sent, not opened yet");

  // The desk keeps the job page open: the owner's answer must show up there by itself.
  await desk.goto("/shop/copper-gulch/jobs/5");
  const panel = desk.getByRole("region", { name: "Findings and approvals" });
  await expect(panel.getByTestId("finding-row").filter({ hasText: title })).toContainText("Sent, not opened yet");
  const before = await panel.getByTestId("authorised-total").textContent();

  // The owner follows the e-mail's button; its thumbnail loads without a session.
  const mail = await waitForMail({ baseUrl: mailBaseUrl(), to: CUSTOMERS.jobCustomer.email, since, subjectIncludes: title, timeoutMs: 30_000 });
  const link = mail.links.find((l) => l.includes("/approvals/"));
  expect(link, "the e-mail has one button to answer").toBeTruthy();
  const thumb = /src="([^"]+\/evidence\/[^"]+)"/.exec(mail.html ?? "")?.[1]?.replaceAll("&amp;", "&");
  expect(thumb, "the e-mail shows the evidence photo").toBeTruthy();
  const anonymous = await request.newContext();
  const image = await anonymous.get(thumb!);
  expect(image.status()).toBe(200);
  expect(image.headers()["content-type"]).toMatch(/^image\//);
  await anonymous.dispose();

  const ownerContext = await browser.newContext({ storageState: storageStatePath("jobCustomer"), viewport: { width: 390, height: 844 } });
  const owner = await ownerContext.newPage();
  await owner.goto(link!);
  await expect(owner.getByRole("heading", { level: 1, name: title })).toBeVisible();
  await expect(owner.getByRole("list", { name: "Photos of what was found" }).locator("img")).toHaveCount(1);
  // The clip plays from the marked moment.
  await expect(owner.getByText(/^Clip at 0:01/)).toBeVisible();
  const ownerPlayer = owner.getByRole("group", { name: /^Clip: / }).first();
  await ownerPlayer.scrollIntoViewIfNeeded();
  const loaded = owner.locator("video[data-clip-player]").first();
  await expect.poll(() => loaded.evaluate((el) => (el as HTMLMediaElement).currentTime), { timeout: 20_000 }).toBeGreaterThanOrEqual(0.9);
  await expect(owner.getByRole("complementary", { name: "Safety caution" })).toBeVisible();
  const { violations } = await new AxeBuilder({ page: owner }).withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa", "wcag22aa"]).analyze();
  expect(violations.map((v) => v.id)).toEqual([]);
  await expect(panel.getByTestId("finding-row").filter({ hasText: title })).toContainText("Opened, not answered", { timeout: 15_000 });

  await owner.getByRole("group", { name: /Front brake pads \(pair\)/ }).getByText("Approve", { exact: true }).click();
  await owner.getByRole("group", { name: /Fit pads and bed them in/ }).getByText("Decline", { exact: true }).click();
  // Approved: the $42.50 part and its $3.51 tax (SSUTA §324 / RCW 82.08.054, REFERENCES §5); no labour, so no supplies fee.
  await expect(owner.getByTestId("running-total")).toHaveText("$46.01");
  await owner.getByLabel("Type your full name to sign").fill("Ruth Calloway");
  await owner.getByLabel("I want the replaced parts back").check();
  await owner.getByRole("button", { name: "Review my answer" }).click();
  await expect(owner.getByRole("group", { name: "Check your answer" })).toContainText("New authorised total: $46.01");
  await owner.getByRole("button", { name: "Confirm and send my answer" }).click();
  await expect(owner.getByRole("heading", { name: "The answer on record" })).toBeVisible();
  const shown = (await owner.getByTestId("decision-hash").textContent())?.trim();

  // The desk's open page shows the new authorised total within seconds (no reload).
  const added = 4601;
  const expected = Math.round(Number((before ?? "$0").replace(/[$,]/g, "")) * 100) + added;
  await expect(panel.getByTestId("authorised-total")).toHaveText(`$${(expected / 100).toFixed(2)}`, { timeout: 15_000 });

  // The decision's hash is SHA-256 of the request exactly as stored when sent.
  const requestId = new URL(link!).pathname.split("/").pop();
  const [row] = await sql(
    "SELECT r.canonical, r.hash, d.shown_hash, d.signature_name, d.wants_parts_back, d.method FROM approval_requests r JOIN approval_decisions d ON d.request_id = r.id WHERE r.public_id = ?",
    [requestId],
  );
  expect(row!.shown_hash).toBe(crypto.createHash("sha256").update(String(row!.canonical), "utf8").digest("hex"));
  expect(row!.shown_hash).toBe(row!.hash);
  expect(shown).toBe(row!.shown_hash);
  expect(row).toMatchObject({ signature_name: "Ruth Calloway", wants_parts_back: 1, method: "online" });

  // Answering again (a second tab) is refused with the answer on record.
  const again = await owner.request.post(`/api/approvals/${requestId}/decision`, {
    data: { shownHash: row!.hash, lines: [{ no: 1, answer: "declined" }, { no: 2, answer: "declined" }], signature: "Ruth Calloway", wantsPartsBack: false, confirmed: true },
  });
  expect(again.status()).toBe(409);
  expect((await again.json()).refusal.decision.shownHash).toBe(row!.shown_hash);
  await ownerContext.close();

  // The approved pads line made its job part (issue 19): the desk fits them from stock on the bench,
  // so J-0005 waits on nothing but the open CV axle request and the invoice (invoice.spec.ts) bills them.
  const bench = new BenchPage(desk);
  await bench.open("/shop/copper-gulch/jobs/5/bench");
  const pads = bench.section("Parts").getByRole("listitem").filter({ hasText: "Front brake pads (pair)" }).first();
  await pads.getByLabel("New status for Front brake pads (pair)").selectOption({ label: "Fitted" });
  await pads.getByRole("button", { name: "Update part" }).click();
  await expect
    .poll(async () => String((await sql("SELECT p.status FROM job_parts p JOIN finding_lines l ON l.id = p.finding_line_id JOIN approval_requests r ON r.finding_id = l.finding_id WHERE r.public_id = ?", [requestId]))[0]?.status))
    .toBe("fitted");
  await deskContext.close();
});
