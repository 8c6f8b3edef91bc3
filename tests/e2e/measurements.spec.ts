import { expect, test } from "@playwright/test";
import { sql } from "./db";
import { BenchPage } from "./pages/bench-page";
import { storageStatePath } from "./personas";

// Issue 18 §5 end to end on J-0005 (Ruth Calloway's ATV, already waiting on her: a second request
// may go out while one is open, as in approvals.spec.ts). The technician logs a valve-clearance set
// with one valve out, drafts a finding from it, the desk prices and sends it, and the owner reads
// the limit and its source on the request. The shim rule is common trade practice, no published source.

test("a valve-clearance set with one out-of-limit valve drafts a finding that shows the limit to the owner", async ({ browser }) => {
  test.setTimeout(120_000);
  const id = Date.now().toString(36);
  const source = `maker's manual p. 3-14 (${id})`;

  const techContext = await browser.newContext({ storageState: storageStatePath("technician"), viewport: { width: 390, height: 844 } });
  const bench = new BenchPage(await techContext.newPage());
  const tech = bench.page;
  await bench.open("/shop/copper-gulch/jobs/5/bench");
  const section = tech.getByRole("region", { name: "Measurement sets", exact: true });
  const form = section.getByRole("form", { name: "Record a measurement set" });
  await form.getByLabel("What was measured").selectOption({ label: "Valve clearance" });
  await form.getByLabel("Intake minimum").fill("0.10");
  await form.getByLabel("Intake maximum").fill("0.20");
  await form.getByLabel("Exhaust minimum").fill("0.20");
  await form.getByLabel("Exhaust maximum").fill("0.30");
  await form.getByLabel(/^Where the limit comes from/).fill(source);
  await expect(form).toContainText("common trade practice, no published source");
  // The form starts with cylinder 1: intake left, intake right, exhaust left, exhaust right.
  const measured = form.getByLabel("Measured (mm)");
  await measured.nth(0).fill("0.15");
  await measured.nth(1).fill("0.20");
  await measured.nth(2).fill("0.12");
  await measured.nth(3).fill("0.25");
  await form.getByLabel("Old shim, mm (optional)").nth(2).fill("2.50");
  await form.getByRole("button", { name: "Log measurement set" }).click();

  const set = section.getByTestId("measurement-set").filter({ hasText: source });
  await expect(set).toContainText("Valve clearance: 1 of 4 out of limit");
  await expect(set).toContainText("Exhaust, cyl 1, left: 0.12 mm");
  await expect(set).toContainText("Out of limit: under");
  // 0.20 stays 0.20 (the resolution typed).
  await expect(set).toContainText("Intake, cyl 1, right: 0.20 mm");
  // Common trade practice, no published source: 2.50 + 0.12 − 0.25 (middle of 0.20–0.30) = 2.37 mm.
  await expect(set).toContainText("Suggested shim 2.37 mm");
  await expect(set).toContainText("2.50 + 0.12 − 0.25 = 2.37 mm");

  await set.getByRole("button", { name: "Draft a finding" }).click();
  await tech.waitForURL(/\/findings\/\d+$/);
  const findingPath = new URL(tech.url()).pathname;
  const findingId = Number(findingPath.split("/").pop());
  await expect(tech.getByLabel("What you found")).toHaveValue(new RegExp(`limit 0\\.20–0\\.30 mm \\(maker's manual p\\. 3-14 \\(${id}\\)\\)`));
  await techContext.close();

  // The desk adds and prices a labour line, then sends it.
  const deskContext = await browser.newContext({ storageState: storageStatePath("writer") });
  const desk = await deskContext.newPage();
  await desk.goto(findingPath);
  await desk.getByRole("button", { name: "Add labour" }).click();
  const labour = desk.getByRole("listitem", { name: "Line 1: Labour" });
  await labour.getByLabel("Description").fill(`Re-shim the exhaust valve ${id}`);
  await labour.getByLabel("Hours").fill("1.0");
  await desk.getByRole("button", { name: "Save the finding" }).click();
  const send = desk.getByRole("region", { name: "Send for approval" });
  await send.getByRole("button", { name: "Send to the owner" }).click();
  await send.getByRole("button", { name: "Yes, send it" }).click();
  await expect(desk.getByRole("article", { name: "Version 1" })).toContainText("Sent, not opened yet");
  await deskContext.close();

  // The owner's request shows each valve with its limit, source and verdict.
  const [row] = await sql(
    "SELECT r.public_id AS request, j.public_id AS job FROM approval_requests r JOIN jobs j ON j.id = r.job_id WHERE r.finding_id = ? ORDER BY r.id DESC LIMIT 1",
    [findingId],
  );
  const ownerContext = await browser.newContext({ storageState: storageStatePath("jobCustomer"), viewport: { width: 390, height: 844 } });
  const owner = await ownerContext.newPage();
  await owner.goto(`/my/jobs/${row!.job}/approvals/${row!.request}`);
  await expect(owner.getByRole("heading", { level: 1, name: "Valve clearance: 1 of 4 out of limit" })).toBeVisible();
  await expect(owner.getByText(`Exhaust, cyl 1, left: 0.12 mm — OUT OF LIMIT (under); limit 0.20–0.30 mm (${source})`, { exact: false }).first()).toBeVisible();
  await expect(owner.getByText("suggested shim 2.37 mm", { exact: false }).first()).toBeVisible();
  await ownerContext.close();
});
