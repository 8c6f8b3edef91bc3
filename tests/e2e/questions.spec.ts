import AxeBuilder from "@axe-core/playwright";
import { expect, test } from "@playwright/test";
import { sql } from "./db";
import { BenchPage } from "./pages/bench-page";
import { waitForMail } from "../support/mailbox";
import { mailBaseUrl } from "./pages/sign-in-page";
import { CUSTOMERS, storageStatePath } from "./personas";

// Issue 21 §4–5 on J-0005 (Ruth Calloway's ATV; a second request may go out while the demo's is
// open): the desk sends a request, the owner asks about one line on a phone-size page, the desk
// answers from the staff job page (the inbox item clears), the owner reads the answer, by e-mail
// too, and approves. Her job page shows the shop's phone as a tap-to-call link.

test("the owner asks about a line, the desk answers, the owner sees it and approves", async ({ browser }) => {
  test.setTimeout(150_000);
  const id = Date.now().toString(36);
  const title = `Cam chain and tensioner ${id}`;
  const question = `Is the tensioner needed if I replace the chain? (${id})`;
  const answer = `Yes: the old tensioner is out of travel, so a new chain would slap. (${id})`;

  // The service writer drafts, prices and sends the request.
  const deskContext = await browser.newContext({ storageState: storageStatePath("writer") });
  const desk = await deskContext.newPage();
  await desk.goto("/shop/copper-gulch/jobs/5/findings/new");
  await desk.getByLabel("Title").fill(title);
  await desk.getByLabel("What you found").fill("The cam chain has stretched and the tensioner has run out of travel.");
  await desk.getByRole("button", { name: "Add part" }).click();
  const chain = desk.getByRole("listitem", { name: "Line 1: Part" });
  await chain.getByLabel("Description").fill("Cam chain");
  await chain.getByLabel("Quantity").fill("1");
  await chain.getByLabel("Unit price (USD)").fill("38.00");
  await desk.getByRole("button", { name: "Add part" }).click();
  const tensioner = desk.getByRole("listitem", { name: "Line 2: Part" });
  await tensioner.getByLabel("Description").fill("Cam chain tensioner");
  await tensioner.getByLabel("Quantity").fill("1");
  await tensioner.getByLabel("Unit price (USD)").fill("54.00");
  await desk.getByRole("button", { name: "Save the draft" }).click();
  await desk.waitForURL(/\/findings\/\d+$/);
  const since = new Date();
  const send = desk.getByRole("region", { name: "Send for approval" });
  await send.getByRole("button", { name: "Send to the owner" }).click();
  await send.getByRole("button", { name: "Yes, send it" }).click();
  await expect(desk.getByRole("article", { name: "Version 1" })).toContainText("Sent, not opened yet");

  // The owner opens the request from the e-mail on a phone and asks about the tensioner line.
  const mail = await waitForMail({ baseUrl: mailBaseUrl(), to: CUSTOMERS.jobCustomer.email, since, subjectIncludes: title, timeoutMs: 30_000 });
  const link = mail.links.find((l) => l.includes("/approvals/"));
  expect(link, "the e-mail has a button to the request").toBeTruthy();
  const ownerContext = await browser.newContext({ storageState: storageStatePath("jobCustomer"), viewport: { width: 390, height: 844 } });
  const owner = await ownerContext.newPage();
  await owner.goto(link!);
  await expect(owner.getByRole("heading", { level: 1, name: title })).toBeVisible();
  const ask = owner.getByRole("region", { name: "Ask about a line" });
  await ask.getByLabel("Which line").selectOption({ label: "Line 2: Cam chain tensioner" });
  await ask.getByLabel("Your question about this line").fill(question);
  await ask.getByRole("button", { name: "Ask the shop" }).click();
  await expect(ask.getByText("Sent to the shop")).toBeVisible();
  const asked = ask.getByTestId("thread-question").filter({ hasText: question });
  await expect(asked).toContainText("About line 2: Cam chain tensioner");
  await expect(asked).toContainText("Waiting for the shop's answer");
  // Tap targets and contrast hold on the phone-size page with the form and thread on it.
  const { violations } = await new AxeBuilder({ page: owner }).withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa", "wcag22aa"]).analyze();
  expect(violations.map((v) => v.id)).toEqual([]);

  // The question is in the desk inbox, unread.
  await desk.goto("/shop/copper-gulch/inbox");
  await expect(desk.getByRole("paragraph").filter({ hasText: `Ruth Calloway asked about line 2 (Cam chain tensioner): ${question}` })).toBeVisible();
  const [item] = await sql("SELECT e.id FROM shop_events e JOIN shops s ON s.id = e.shop_id WHERE s.slug = 'copper-gulch' AND e.kind = 'owner_question' AND JSON_VALUE(e.payload, '$.summary') LIKE ? ORDER BY e.id DESC LIMIT 1", [`%${id}%`]);
  expect(item, "an inbox item for the question").toBeTruthy();

  // The desk answers from the staff job page.
  await desk.goto("/shop/copper-gulch/jobs/5");
  const questions = desk.getByRole("region", { name: "Questions from the owner" });
  const open = questions.getByTestId("thread-question").filter({ hasText: question });
  await expect(open).toContainText("Ruth Calloway asked");
  await open.getByLabel("Your answer").fill(answer);
  await open.getByRole("button", { name: "Send the answer" }).click();
  await expect(questions.getByTestId("thread-question").filter({ hasText: question })).toContainText("Answered");
  await expect(questions.getByTestId("thread-answer").filter({ hasText: answer })).toBeVisible();
  // Answered: the item is read for the whole desk (the writer's own reads and the shop owner's).
  const reads = await sql("SELECT COUNT(*) AS n FROM inbox_reads r JOIN memberships m ON m.user_id = r.user_id JOIN shops s ON s.id = m.shop_id WHERE s.slug = 'copper-gulch' AND m.deactivated_at IS NULL AND r.event_id = ?", [item!.id]);
  const staff = await sql("SELECT COUNT(*) AS n FROM memberships m JOIN shops s ON s.id = m.shop_id WHERE s.slug = 'copper-gulch' AND m.deactivated_at IS NULL");
  expect(Number(reads[0]!.n)).toBe(Number(staff[0]!.n));
  await deskContext.close();

  // The owner reads the answer on the request, and by e-mail with the job's reply-to address.
  await owner.reload();
  await expect(ask.getByTestId("thread-answer").filter({ hasText: answer })).toBeVisible();
  await expect(ask.getByTestId("thread-question").filter({ hasText: question })).toContainText("Answered");
  const answered = await waitForMail({ baseUrl: mailBaseUrl(), to: CUSTOMERS.jobCustomer.email, since, subjectIncludes: "answered your question", timeoutMs: 30_000 });
  expect(answered.text).toContain(answer);
  expect(answered.reply_to[0]).toMatch(/^q-[a-z2-7]{26}@/);

  // She approves both lines.
  await owner.getByRole("group", { name: /^Cam chain, / }).getByText("Approve", { exact: true }).click();
  await owner.getByRole("group", { name: /^Cam chain tensioner, / }).getByText("Approve", { exact: true }).click();
  await owner.getByLabel("Type your full name to sign").fill("Ruth Calloway");
  await owner.getByRole("button", { name: "Review my answer" }).click();
  await owner.getByRole("button", { name: "Confirm and send my answer" }).click();
  await expect(owner.getByRole("heading", { name: "The answer on record" })).toBeVisible();

  // Her job page: the thread, and the shop's phone to tap.
  await owner.goto(new URL(link!).pathname.replace(/\/approvals\/[^/]+$/, ""));
  await expect(owner.getByRole("region", { name: "Questions for the shop" }).getByTestId("thread-answer").filter({ hasText: answer })).toBeVisible();
  await expect(owner.getByTestId("shop-phone")).toHaveAttribute("href", "tel:+15550104471");
  await ownerContext.close();

  // The approved lines made their parts needed; the bench fits them, so the demo job doesn't stay
  // waiting on parts (staff.spec.ts counts the board from the seed).
  const benchContext = await browser.newContext({ storageState: storageStatePath("writer") });
  const benchPage = await benchContext.newPage();
  const bench = new BenchPage(benchPage);
  await bench.open("/shop/copper-gulch/jobs/5/bench");
  for (const part of ["Cam chain tensioner", "Cam chain"]) {
    // The part's own row: the one holding its status field (a `has` locator is looked for inside the row).
    const row = bench.section("Parts").getByRole("listitem").filter({ has: benchPage.getByLabel(`New status for ${part}`, { exact: true }) }).first();
    await row.getByLabel(`New status for ${part}`, { exact: true }).selectOption({ label: "Fitted" });
    await row.getByRole("button", { name: "Update part" }).click();
    await expect
      .poll(async () => (await sql("SELECT p.status FROM job_parts p JOIN finding_lines l ON l.id = p.finding_line_id JOIN findings f ON f.id = l.finding_id WHERE f.title = ? AND p.description = ?", [title, part]))[0]?.status)
      .toBe("fitted");
  }
  await benchContext.close();
});
