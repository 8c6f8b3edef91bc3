import { type APIRequestContext, type Page, expect, test } from "@playwright/test";
import { newDemoJob, sql } from "./db";
import { storageStatePath } from "./personas";

// Issue 15 end to end: the job follows what happens. A fresh job for Ruth Calloway (made in the
// database: check-in has its own tests) gets a request from the desk; the owner answers it on her
// phone; the desk's open board and inbox show the answer within 2 s without a reload; then the
// owner's open page follows the job to ready and collected, and collection is gated on payment.

const SHOP = "copper-gulch";
const APP = process.env.APP_URL ?? "http://localhost:3110";

async function sendRequest(api: APIRequestContext, job: string, title: string) {
  const headers = { origin: APP };
  const made = await api.post(`/api/jobs/${job}/findings`, {
    headers,
    data: { title, found: "Cam chain stretched past the service limit.", whyItMatters: null, safety: "none", evidence: [], lines: [{ kind: "fee", description: "Cam chain and fitting", amount: "180.00" }] },
  });
  expect(made.status(), await made.text()).toBe(200);
  const { id, version } = await made.json();
  const sent = await api.post(`/api/jobs/${job}/findings/${id}/send`, { headers, data: { findingVersion: version } });
  expect(sent.status(), await sent.text()).toBe(200);
  return (await sent.json()) as { request: string };
}

async function moveTo(page: Page, label: string, extra?: (page: Page) => Promise<void>) {
  await page.getByLabel("Move to").selectOption({ label });
  await extra?.(page);
  await page.getByRole("button", { name: "Change status" }).click();
}

test("the owner answers the last request: the board and the inbox show it within 2 s without reload; the owner's page follows ready → collected", async ({ browser }) => {
  test.setTimeout(120_000);
  const { number, publicId } = await newDemoJob("wf", "Rattle from the top end at idle.");
  const title = `Cam chain stretched ${Date.now().toString(36)}`;

  const deskContext = await browser.newContext({ storageState: storageStatePath("writer") });
  const { request: requestId } = await sendRequest(deskContext.request, publicId, title);

  // The desk keeps the board (filtered to this job) and the inbox open.
  const board = await deskContext.newPage();
  await board.goto(`/shop/${SHOP}?q=${number}`);
  const row = board.getByTestId("job-row").filter({ hasText: `J-${String(number).padStart(4, "0")}` });
  await expect(row).toContainText("Needs owner's OK");
  await expect(row.getByTestId("waits-on")).toContainText("The owner");
  const inbox = await deskContext.newPage();
  await inbox.goto(`/shop/${SHOP}/inbox`);
  await expect(inbox.getByRole("heading", { level: 1, name: "Inbox" })).toBeVisible();
  await expect(inbox.getByTestId("inbox-item").filter({ hasText: title })).toHaveCount(0);

  // The owner answers on her phone.
  const ownerContext = await browser.newContext({ storageState: storageStatePath("jobCustomer"), viewport: { width: 390, height: 844 } });
  const owner = await ownerContext.newPage();
  await owner.goto(`/my/approvals/${requestId}`);
  await owner.getByRole("group", { name: /Cam chain and fitting/ }).getByText("Approve", { exact: true }).click();
  await owner.getByLabel("Type your full name to sign").fill("Ruth Calloway");
  await owner.getByRole("button", { name: "Review my answer" }).click();
  await owner.getByRole("button", { name: "Confirm and send my answer" }).click();
  await expect(owner.getByRole("heading", { name: "The answer on record" })).toBeVisible();

  // Within 2 s, with no reload: the board row has moved off the owner, the inbox has the answer.
  await expect(row).toContainText("On the bench", { timeout: 2_000 });
  await expect(row.getByTestId("waits-on")).toContainText("The shop", { timeout: 2_000 });
  const item = inbox.getByTestId("inbox-item").filter({ hasText: title });
  await expect(item).toBeVisible({ timeout: 2_000 });
  await expect(item).toContainText("Cam chain and fitting");
  const [moved] = await sql("SELECT cause FROM job_status_changes WHERE job_id = (SELECT id FROM jobs WHERE public_id = ?) ORDER BY id DESC LIMIT 1", [publicId]);
  expect(moved!.cause).toBe("request_answered");

  // The owner's page, left open, follows the job: on the bench, then ready, then collected.
  await owner.goto(`/my/jobs/${publicId}`);
  const standing = owner.getByTestId("standing");
  await expect(standing).toHaveText("It's on the bench.");
  const staffJob = await deskContext.newPage();
  await staffJob.goto(`/shop/${SHOP}/jobs/${number}`);
  // The control offers the next step, not a step back.
  await expect(staffJob.getByLabel("Move to")).toHaveValue("ready");
  await moveTo(staffJob, "Ready to collect");
  await expect(standing).toHaveText("It's ready to collect.", { timeout: 5_000 });
  await expect(owner.getByRole("region", { name: "Where it stands" })).not.toContainText("expects to have it ready by");

  // No invoice yet: handing it back is refused until a reason is given, which the history keeps.
  await expect(staffJob.getByLabel("Move to")).toHaveValue("picked_up");
  await moveTo(staffJob, "Collected");
  await expect(staffJob.getByText(/can't be handed back yet: there is no invoice yet/).first()).toBeVisible();
  await moveTo(staffJob, "Collected", (p) => p.getByLabel("Reason to hand it back before it is paid").fill("Owner pays on account"));
  await expect(standing).toHaveText(/^Collected on \d{4}-\d{2}-\d{2}\.$/, { timeout: 5_000 });
  const [last] = await sql("SELECT to_status, note FROM job_status_changes WHERE job_id = (SELECT id FROM jobs WHERE public_id = ?) ORDER BY id DESC LIMIT 1", [publicId]);
  expect(last).toMatchObject({ to_status: "picked_up", note: "Handed back before payment: Owner pays on account" });

  await ownerContext.close();
  await deskContext.close();
});
