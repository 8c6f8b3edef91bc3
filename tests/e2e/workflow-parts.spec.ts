import { type Page, expect, test } from "@playwright/test";
import { newDemoJob, sql } from "./db";
import { BenchPage } from "./pages/bench-page";
import { storageStatePath } from "./personas";

// Issue 19 end to end: a part is typed once. The shop owner sets a markup by cost bands; the desk
// prices a finding with two parts from their costs (one at the rule's price, one by hand with a
// reason); the owner approves one and declines the other; the desk orders, receives and fits the
// approved one with the bench's part status buttons; the invoice carries exactly that part, at
// the price the owner approved. The owner never sees a cost.
// Its job stays in the demo shop, like workflow.spec.ts's: both run after staff.spec.ts (files run in
// name order), whose board counts assume the seed.
test.describe.configure({ mode: "serial" });

const SHOP = "copper-gulch";

const jobStatus = async (publicId: string) => String((await sql("SELECT status FROM jobs WHERE public_id = ?", [publicId]))[0]!.status);

/** Moves a part with the bench's existing status control and waits for the stored status. */
async function movePart(page: Page, description: string, label: string, status: string) {
  const parts = new BenchPage(page).section("Parts");
  const item = parts.getByRole("listitem").filter({ hasText: description }).first();
  await item.getByLabel(`New status for ${description}`).selectOption({ label });
  await item.getByRole("button", { name: "Update part" }).click();
  await expect.poll(async () => String((await sql("SELECT status FROM job_parts WHERE description = ?", [description]))[0]?.status)).toBe(status);
}

test("price a finding with two parts; the owner approves one; the desk orders, receives and fits it; the invoice carries exactly that part", async ({ browser }) => {
  test.setTimeout(180_000);
  const id = Date.now().toString(36);
  const cable = `Clutch cable ${id}`;
  const plates = `Friction plate set ${id}`;
  const { number, publicId } = await newDemoJob("pp", "Clutch slips when pulling away.");
  const jobPath = `/shop/${SHOP}/jobs/${number}`;

  // The shop owner sets the markup: common trade practice, no published source.
  const ownerStaff = await browser.newContext({ storageState: storageStatePath("owner") });
  const settings = await ownerStaff.newPage();
  await settings.goto(`/shop/${SHOP}/settings`);
  const markup = settings.getByRole("form", { name: "Parts markup" });
  await markup.getByLabel("A part's sell price from its cost").selectOption("bands");
  await markup.getByLabel("First band: cost up to (USD)").fill("10.00");
  await markup.getByLabel("First band: markup (%)").fill("100");
  await markup.getByLabel("Second band: cost up to (USD)").fill("50.00");
  await markup.getByLabel("Second band: markup (%)").fill("60");
  await markup.getByLabel("Dearer parts: markup (%)").fill("35");
  await markup.getByRole("button", { name: "Save parts markup" }).click();
  await expect(markup.getByRole("status")).toBeVisible();
  await ownerStaff.close();

  // The writer drafts and prices: the cable from its $8.00 cost (first band, +100 % → $16.00), the
  // plates at $70.00 by hand ($40.00 would give $64.00), with the reason kept.
  const deskContext = await browser.newContext({ storageState: storageStatePath("writer") });
  const desk = await deskContext.newPage();
  await desk.goto(`${jobPath}/findings/new`);
  await desk.getByLabel("Title").fill(`Clutch worn ${id}`);
  await desk.getByLabel("What you found").fill("The clutch slips under load; the cable is frayed at the lever.");
  await desk.getByRole("button", { name: "Add part" }).click();
  const one = desk.getByRole("listitem", { name: "Line 1: Part" });
  await one.getByLabel("Description").fill(cable);
  await one.getByLabel("Quantity").fill("1");
  await one.getByLabel("Unit cost (USD)").fill("8.00");
  await expect(one.getByLabel("Unit price (USD)")).toHaveAccessibleDescription(/Markup rule: \$16\.00/);
  await desk.getByRole("button", { name: "Add part" }).click();
  const two = desk.getByRole("listitem", { name: "Line 2: Part" });
  await two.getByLabel("Description").fill(plates);
  await two.getByLabel("Quantity").fill("1");
  await two.getByLabel("Unit cost (USD)").fill("40.00");
  await two.getByLabel("Unit price (USD)").fill("70.00");
  await two.getByLabel("Why this price").fill("Matched the counter price");
  await desk.getByRole("button", { name: "Save the draft" }).click();
  await desk.waitForURL(/\/findings\/\d+$/);
  await expect(desk.getByRole("listitem", { name: "Line 1: Part" }).getByLabel("Unit price (USD)")).toHaveValue("16.00");
  const send = desk.getByRole("region", { name: "Send for approval" });
  await send.getByRole("button", { name: "Send to the owner" }).click();
  await send.getByRole("button", { name: "Yes, send it" }).click();
  await expect(desk.getByRole("article", { name: "Version 1" })).toBeVisible();

  // Before the answer, both parts are only proposed: the job isn't waiting on parts.
  const bench = new BenchPage(desk);
  await bench.open(`${jobPath}/bench`);
  await expect(bench.section("Parts").getByRole("listitem").filter({ hasText: cable }).first()).toContainText("Proposed");

  // The owner sees sell prices only, approves the cable and declines the plates.
  const [request] = await sql("SELECT r.public_id FROM approval_requests r JOIN jobs j ON j.id = r.job_id WHERE j.public_id = ? ORDER BY r.id DESC LIMIT 1", [publicId]);
  const ownerContext = await browser.newContext({ storageState: storageStatePath("jobCustomer"), viewport: { width: 390, height: 844 } });
  const owner = await ownerContext.newPage();
  await owner.goto(`/my/approvals/${request!.public_id}`);
  await expect(owner.getByRole("group", { name: new RegExp(cable) })).toContainText("$16.00");
  await expect(owner.locator("body")).not.toContainText("$8.00");
  await expect(owner.locator("body")).not.toContainText("$40.00");
  await expect(owner.locator("body")).not.toContainText("counter price");
  await owner.getByRole("group", { name: new RegExp(cable) }).getByText("Approve", { exact: true }).click();
  await owner.getByRole("group", { name: new RegExp(plates) }).getByText("Decline", { exact: true }).click();
  await owner.getByLabel("Type your full name to sign").fill("Ruth Calloway");
  await owner.getByRole("button", { name: "Review my answer" }).click();
  await owner.getByRole("button", { name: "Confirm and send my answer" }).click();
  await expect(owner.getByRole("heading", { name: "The answer on record" })).toBeVisible();
  await ownerContext.close();
  // The approved part waits the job; the declined one doesn't.
  await expect.poll(() => jobStatus(publicId)).toBe("waiting_parts");

  // The desk: the declined part is out, visibly, with nothing to move; the cable is ordered and arrives.
  await bench.open(`${jobPath}/bench`);
  const declined = bench.section("Parts").getByRole("listitem").filter({ hasText: plates }).first();
  await expect(declined).toContainText("Declined by owner");
  await expect(declined.getByRole("button", { name: "Update part" })).toHaveCount(0);
  await movePart(desk, cable, "On order", "ordered");
  await movePart(desk, cable, "Arrived", "received");
  await expect.poll(() => jobStatus(publicId)).toBe("in_progress");

  // Arrived but not fitted: not billed, and the invoice page says so.
  await desk.goto(`${jobPath}/invoice`);
  await expect(desk.getByRole("status").filter({ hasText: "Parts not billed yet" })).toContainText(cable);

  await bench.open(`${jobPath}/bench`);
  await movePart(desk, cable, "Fitted", "fitted");

  // The invoice takes the fitted part at the approved $16.00, typed once; never the declined one.
  await desk.goto(`${jobPath}/invoice`);
  await desk.getByRole("button", { name: "Make the invoice from authorised work" }).click();
  await expect(desk.getByRole("heading", { level: 1, name: /^Invoice INV-\d{4}$/ })).toBeVisible();
  const lines = desk.getByTestId("invoice-line");
  await expect(lines).toHaveCount(1);
  await expect(lines.first()).toContainText(cable);
  await expect(lines.first()).toContainText("$16.00");
  await deskContext.close();
});
