import { request as apiRequest, expect, test } from "@playwright/test";
import { sql } from "./db";
import { listMail, waitForMail } from "../support/mailbox";
import { JobPage } from "./pages/job-page";
import { mailBaseUrl } from "./pages/sign-in-page";
import { storageStatePath } from "./personas";

// J-0005 is Ruth Calloway's (jobCustomer) ATV at Copper Gulch. She invites a follower; the
// follower signs in from the mail fake, reads the shared entries (no prices), gets a digest
// when the shop shares a note, and stops it with the one-click POST from the mail's header.
const id = Date.now().toString(36);
const followerEmail = `dale.calloway.${id}@mail.test`;
let jobPath = "";
let jobDbId = 0;

test.beforeAll(async () => {
  const [job] = await sql("SELECT j.id, j.public_id FROM jobs j JOIN shops s ON s.id = j.shop_id WHERE s.slug = 'copper-gulch' AND j.number = 5");
  jobPath = `/my/jobs/${job!.public_id}`;
  jobDbId = Number(job!.id);
  // A window of 0 minutes: shared entries go out at the worker's next round instead of after 15 minutes.
  await sql("UPDATE shops SET digest_window_minutes = 0 WHERE slug = 'copper-gulch'");
});

test.afterAll(async () => {
  await sql("UPDATE shops SET digest_window_minutes = 15 WHERE slug = 'copper-gulch'");
  await sql("DELETE FROM job_subscribers WHERE email = ?", [followerEmail]);
  await sql("DELETE FROM journal_entries WHERE job_id = ? AND body LIKE ?", [jobDbId, `%${id}%`]);
});

test("the owner invites a follower, who signs in from the mail, reads the shared entries, and stops the digest with one click", async ({ browser }) => {
  test.setTimeout(120_000);
  const mail = mailBaseUrl();

  // The owner invites someone from her job page.
  const ownerContext = await browser.newContext({ storageState: storageStatePath("jobCustomer") });
  const owner = await ownerContext.newPage();
  await owner.goto(jobPath);
  const following = owner.getByRole("region", { name: "E-mail updates" });
  await following.getByLabel("Invite someone by e-mail").fill(followerEmail);
  await following.getByRole("button", { name: "Invite", exact: true }).click();
  await expect(following.getByText(`Invitation on its way to ${followerEmail}`)).toBeVisible();
  await expect(following.getByTestId("follower").filter({ hasText: followerEmail })).toBeVisible();

  // The invitation arrives through the outbox; its link leads to sign-in, back to the job.
  const invitation = await waitForMail({ baseUrl: mail, to: followerEmail, subjectIncludes: "invited you to follow" });
  expect(invitation.reply_to).toEqual(["desk@coppergulch.test"]);
  const inviteLink = invitation.links.find((l) => l.includes("/sign-in?next="));
  expect(inviteLink, "the invitation carries a sign-in link").toBeTruthy();

  const followerContext = await browser.newContext({ viewport: { width: 390, height: 844 } });
  const follower = await followerContext.newPage();
  await follower.goto(inviteLink!);
  const since = new Date();
  const owners = follower.getByRole("region", { name: "Machine owners" });
  await owners.getByLabel("E-mail you gave the shop").fill(followerEmail);
  await owners.getByRole("button", { name: "E-mail me a sign-in link" }).click();
  await expect(follower.getByRole("heading", { name: "Check your e-mail" })).toBeVisible();
  const signIn = await waitForMail({ baseUrl: mail, to: followerEmail, since, subjectIncludes: "sign-in link" });
  await follower.goto(signIn.links.find((l) => l.includes("/sign-in/link?token="))!);
  await follower.getByRole("button", { name: "Sign in and see my jobs" }).click();
  await follower.waitForURL((url) => url.pathname === jobPath);

  // Shared entries only, and never a price.
  const updates = follower.getByRole("region", { name: "Updates from the shop" });
  await expect(updates.getByText("Front left CV boot is split")).toBeVisible();
  await expect(updates.getByText("Check whether the parts counter")).toHaveCount(0);
  await expect(follower.getByRole("main")).not.toContainText(/\$\s?\d/);
  await follower.goto("/my");
  await expect(follower.getByTestId("followed-job")).toContainText("Ridgeline 570");

  // The shop shares a note; the follower gets it as a progress e-mail.
  const staffContext = await browser.newContext({ storageState: storageStatePath("technician") });
  const bench = new JobPage(await staffContext.newPage());
  await bench.open("/shop/copper-gulch/jobs/5");
  const beforeDigest = new Date();
  const note = await bench.postNote(`Axle on order ${id}`);
  await note.getByRole("button", { name: "Share with owner" }).click();
  await expect(note.getByText("Shared with owner")).toBeVisible();
  const digest = await waitForMail({ baseUrl: mail, to: followerEmail, since: beforeDigest, subjectIncludes: "update" });
  expect(digest.text).toContain(`Axle on order ${id}`);
  const header = /^<(https?:\/\/[^>]+\/u\/[A-Za-z0-9_-]+)>$/.exec(digest.headers["List-Unsubscribe"] ?? "");
  expect(header, "List-Unsubscribe holds one URL in angle brackets").toBeTruthy();
  expect(digest.headers["List-Unsubscribe-Post"]).toBe("List-Unsubscribe=One-Click");

  // RFC 8058 §3.2: the one-click POST, as a mail client sends it: no cookies, no redirect followed.
  const anonymous = await apiRequest.newContext();
  const res = await anonymous.post(header![1]!, { headers: { "content-type": "application/x-www-form-urlencoded" }, data: "List-Unsubscribe=One-Click", maxRedirects: 0 });
  expect(res.status()).toBe(200);
  await anonymous.dispose();

  // Another shared note: the worker handles it, and the follower gets nothing.
  const afterUnsubscribe = new Date();
  const second = await bench.postNote(`Axle fitted ${id}`);
  await second.getByRole("button", { name: "Share with owner" }).click();
  await expect(second.getByText("Shared with owner")).toBeVisible();
  await expect
    .poll(async () => (await sql("SELECT q.every_sent_at FROM job_update_queue q JOIN journal_entries e ON e.id = q.entry_id WHERE e.job_id = ? AND e.body LIKE ?", [jobDbId, `%Axle fitted ${id}%`]))[0]?.every_sent_at ?? null, { timeout: 15_000 })
    .not.toBeNull();
  expect((await listMail(mail, { to: followerEmail, since: afterUnsubscribe })).filter((m) => m.subject.includes("update"))).toEqual([]);

  await ownerContext.close();
  await followerContext.close();
  await staffContext.close();
});
