import AxeBuilder from "@axe-core/playwright";
import { type Page, expect, test } from "@playwright/test";
import mysql from "mysql2/promise";
import { storageStatePath } from "./personas";
import { BenchPage } from "./pages/bench-page";
import { sql } from "./db";

// J-0005 is Ruth Calloway's (the jobCustomer persona's) job at Copper Gulch: the technician works
// on its bench page and the owner reads the progress on her own page.
let ownerPath = "";

test.beforeAll(async () => {
  const db = await mysql.createConnection(process.env.DATABASE_URL!);
  const [rows] = await db.query<mysql.RowDataPacket[]>(
    "SELECT j.public_id FROM jobs j JOIN shops s ON s.id = j.shop_id WHERE s.slug = 'copper-gulch' AND j.number = 5",
  );
  await db.end();
  ownerPath = `/my/jobs/${rows[0]!.public_id}`;
});

const stamp = () => Date.now().toString(36);

test("teardown log → reassembly checklist in reverse with torque, ticked off; the owner sees the percentage", async ({ browser }) => {
  test.setTimeout(120_000);
  const id = stamp();
  const staff = await browser.newContext({ storageState: storageStatePath("technician"), viewport: { width: 390, height: 844 } });
  const bench = new BenchPage(await staff.newPage());
  await bench.open("/shop/copper-gulch/jobs/5/bench");
  // On a fresh seed J-0005 has no teardown log (so 2 of 3 → 66 %, 3 of 3 → 100 %); counting what is
  // there first keeps the check true if the same database is used again.
  const before = await bench.progressCounts();
  const percent = (done: number) => String(Math.floor(((before.done + done) * 100) / (before.total + 3)));

  const steps = [`Skid plate ${id}`, `Diff cover ${id}`, `Axle boot ${id}`];
  await bench.logStep(steps[0]!, "Four bolts, the rear two are longer", "Bin 5-A");
  await bench.logStep(steps[1]!, "Drain plug faces down", "Bag 5-B");
  await bench.logStep(steps[2]!, "Clamp ear points rearward", "Bag 5-C");
  // REFERENCES.md §1 worked value: 115 lbf·in → 13.0 N·m (NIST SP 811, App. B.9).
  await bench.addTorqueSpec(steps[1]!, { value: "115", unitLabel: "lbf·in", bolts: "8" });

  // Reverse order: last off, first on.
  const items = bench.checklist(id);
  await expect(items).toHaveCount(3);
  await expect(items.nth(0)).toContainText(`1. Refit: ${steps[2]}`);
  await expect(items.nth(1)).toContainText(`2. Refit: ${steps[1]}`);
  await expect(items.nth(2)).toContainText(`3. Refit: ${steps[0]}`);
  await expect(items.nth(0)).toContainText("Clamp ear points rearward");

  // The torque sits on its own step, in both units, with its passes and the drawn order.
  const cover = items.nth(1);
  await expect(cover).toContainText("13.0 N·m");
  await expect(cover).toContainText("115.0 lbf·in");
  const passes = cover.getByRole("table", { name: `Pass schedule: ${steps[1]}` });
  await expect(passes.getByRole("columnheader")).toContainText(["Pass", "Share of final", "N·m", "lbf·in"]);
  // ASME PCC-1 legacy cross pattern for 8 bolts (REFERENCES.md §2).
  await expect(cover.getByRole("img", { name: "Tightening order: 1, 5, 3, 7, 2, 6, 4, 8" })).toBeVisible();
  await expect(cover).toContainText("The maker's sequence and values override this generated pattern.");
  await expect(items.nth(0).getByRole("img")).toHaveCount(0);

  await bench.markDone(steps[2]!);
  await bench.markDone(steps[1]!);
  await expect(items.nth(0)).toContainText("Done by Mateo Brandt");
  const progress = bench.section("Reassembly checklist").getByRole("progressbar");
  await expect(progress).toHaveAttribute("aria-valuenow", percent(2));

  // While J-0005 waits on the owner's answer, her page shows no percentage: a number would promise
  // more than the shop can while the work isn't agreed.
  const ownerContext = await browser.newContext({ storageState: storageStatePath("jobCustomer"), viewport: { width: 390, height: 844 } });
  const owner = await ownerContext.newPage();
  await owner.goto(ownerPath);
  await expect(owner.getByTestId("standing")).toContainText("waiting for your answer");
  await expect(owner.getByRole("region", { name: "Putting it back together" })).toHaveCount(0);

  // Back on the bench (set directly, and put back after), she sees the share done (floored: never 100 % while a step is open).
  await sql("UPDATE jobs j JOIN shops s ON s.id = j.shop_id SET j.status = 'in_progress' WHERE s.slug = 'copper-gulch' AND j.number = 5");
  try {
    await owner.reload();
    const reassembly = owner.getByRole("region", { name: "Putting it back together" });
    await expect(reassembly).toContainText(`${percent(2)} % reassembled`);
    await expect(reassembly.getByRole("progressbar")).toHaveAttribute("aria-valuenow", percent(2));
    // Storage labels and notes stay on the shop's side.
    await expect(owner.getByText("Bag 5-B")).toHaveCount(0);

    await bench.markDone(steps[0]!);
    await expect(progress).toHaveAttribute("aria-valuenow", percent(3));
    await owner.reload();
    await expect(reassembly).toContainText(`${percent(3)} % reassembled`);
    await expectNoViolations(owner);
    await expectNoViolations(bench.page);
  } finally {
    await sql("UPDATE jobs j JOIN shops s ON s.id = j.shop_id SET j.status = 'waiting_approval' WHERE s.slug = 'copper-gulch' AND j.number = 5");
  }

  await staff.close();
  await ownerContext.close();
});

test("a shared torque record reads as proof on the owner's page, in words and as the drawn order", async ({ browser }) => {
  test.setTimeout(90_000);
  const id = stamp();
  const staff = await browser.newContext({ storageState: storageStatePath("technician") });
  const bench = new BenchPage(await staff.newPage());
  await bench.open("/shop/copper-gulch/jobs/5/bench");
  const record = await bench.logTorque({ fastener: `Wheel hub nuts ${id}`, spec: "80", unitLabel: "lbf·ft", bolts: "4", share: true });
  // Headlined in the unit entered, the shop's beside it: REFERENCES.md §1, 80 lbf·ft → 108.5 N·m.
  await expect(record).toContainText("80.0 lbf·ft (108.5 N·m)");
  await expect(record).toContainText("Shared with owner");

  const ownerContext = await browser.newContext({ storageState: storageStatePath("jobCustomer") });
  const owner = await ownerContext.newPage();
  await owner.goto(ownerPath);
  const updates = owner.getByRole("region", { name: "Updates from the shop" });
  const proof = updates.getByRole("article").filter({ hasText: `Wheel hub nuts ${id}` });
  // No applied value and nothing ticked: nothing is claimed (issue 18 §2).
  await expect(proof).toContainText("Spec 80.0 lbf·ft (108.5 N·m); applied torque not recorded; 3 passes (30 → 60 → 100 %) planned, not recorded as done; no check pass recorded; cross pattern");
  await expect(proof).toContainText("Applied not recorded");
  await expect(proof).not.toContainText("to spec");
  // ASME PCC-1 legacy cross pattern for 4 bolts (REFERENCES.md §2).
  await expect(proof.getByRole("img", { name: "Tightening order: 1, 3, 2, 4" })).toBeVisible();
  await staff.close();
  await ownerContext.close();
});

test("“1,200” lbf·in is read as twelve hundred, never 1.2; “1,2” is refused beside the field", async ({ browser }) => {
  test.setTimeout(90_000);
  const id = stamp();
  const staff = await browser.newContext({ storageState: storageStatePath("technician") });
  const bench = new BenchPage(await staff.newPage());
  await bench.open("/shop/copper-gulch/jobs/5/bench");
  // Copper Gulch keeps its books in USD: en-US marks (lib/number-input.ts), "," groups thousands.
  const record = await bench.logTorque({ fastener: `Sprocket nuts ${id}`, spec: "1,200", unitLabel: "lbf·in" });
  // NIST SP 811 App. B.9 via REFERENCES.md §1: 1200 lbf·in × 0.112 984 8 = 135.58 → 135.6 N·m.
  await expect(record).toContainText("1200.0 lbf·in (135.6 N·m)");
  await expect(record).not.toContainText("1.2 lbf·in");

  const form = bench.section("Torque log");
  await form.getByLabel(/^What was torqued/).fill(`Cover screws ${id}`);
  await form.getByLabel(/^Spec torque/).fill("1,2");
  const message = "“1,2” isn’t how this shop writes numbers (1,234.5) — write 1.2.";
  await expect(form.getByText(message)).toBeVisible();
  await form.getByRole("button", { name: "Log torque" }).click();
  await expect(form.getByText(message).first()).toBeVisible();
  await expect(form.getByRole("list", { name: "Torque records" }).getByRole("listitem").filter({ hasText: `Cover screws ${id}` })).toHaveCount(0);
  await staff.close();
});

test("the 72 / 65 lbf·ft axle record is flagged in the staff view and the owner's view", async ({ browser }) => {
  test.setTimeout(90_000);
  const id = stamp();
  const staff = await browser.newContext({ storageState: storageStatePath("technician") });
  const bench = new BenchPage(await staff.newPage());
  await bench.open("/shop/copper-gulch/jobs/5/bench");
  const record = await bench.logTorque({ fastener: `Rear axle nut ${id}`, spec: "72", unitLabel: "lbf·ft", applied: "65", share: true });
  // (65 − 72) / 72 = −9.7 %, outside the ±4 % of a type II click wrench (ISO 6789-1, from memory,
  // unverified); NIST SP 811 App. B.9: 65 lbf·ft → 88.1 N·m, 72 lbf·ft → 97.6 N·m.
  const flagged = "UNDER SPEC: torqued to 65.0 lbf·ft (88.1 N·m), 9.7 % under the 72.0 lbf·ft (97.6 N·m) spec (tolerance ±4 %)";
  await expect(record).toContainText("Under spec");
  await expect(record).toContainText(flagged);

  const ownerContext = await browser.newContext({ storageState: storageStatePath("jobCustomer") });
  const owner = await ownerContext.newPage();
  await owner.goto(ownerPath);
  const proof = owner.getByRole("region", { name: "Updates from the shop" }).getByRole("article").filter({ hasText: `Rear axle nut ${id}` });
  await expect(proof).toContainText("Under spec");
  await expect(proof).toContainText(flagged);
  await expect(proof).not.toContainText("to spec");
  await staff.close();
  await ownerContext.close();
});

test("a reading keeps its resolution and shows its limit and verdict; a negative one is refused beside the field", async ({ browser }) => {
  test.setTimeout(90_000);
  const id = stamp();
  const staff = await browser.newContext({ storageState: storageStatePath("technician") });
  const bench = new BenchPage(await staff.newPage());
  await bench.open("/shop/copper-gulch/jobs/5/bench");
  const form = bench.section("Readings");
  await form.getByLabel(/^What was measured/).fill(`Intake valve clearance, left ${id}`);
  await form.getByRole("textbox", { name: /^Reading/ }).fill("0.06");
  await form.getByLabel("Minimum (optional)").fill("0.10");
  await form.getByLabel("Maximum (optional)").fill("0.20");
  // The chain form below has a field of the same name.
  await form.locator("#reading-source").fill("maker's manual");
  await form.getByRole("button", { name: "Log reading" }).click();
  const item = form.getByRole("list", { name: "Readings" }).getByRole("listitem").filter({ hasText: id });
  // Limits typed by the shop (invented); 0.10 − 0.06 = 0.04 mm under the minimum. Trailing zeros kept.
  await expect(item).toContainText(`Intake valve clearance, left ${id}: 0.06`);
  await expect(item).toContainText("Out of limit: under");
  await expect(item).toContainText("0.04 under the minimum");
  await expect(item).toContainText("Limit 0.10–0.20 (maker's manual)");

  await form.getByLabel(/^What was measured/).fill(`Front pad ${id}`);
  await form.getByRole("textbox", { name: /^Reading/ }).fill("-0.5");
  await form.getByRole("button", { name: "Log reading" }).click();
  await expect(form.getByText(/^The reading can’t be below zero/)).toBeVisible();
  await expect(form.getByRole("list", { name: "Readings" }).getByRole("listitem").filter({ hasText: `Front pad ${id}` })).toHaveCount(0);
  await staff.close();
});

test("a teardown step is corrected and deleted with its history kept; the checklist cautions and the timeline follow", async ({ browser }) => {
  test.setTimeout(120_000);
  const id = stamp();
  const staff = await browser.newContext({ storageState: storageStatePath("technician") });
  const bench = new BenchPage(await staff.newPage());
  await bench.open("/shop/copper-gulch/jobs/5/bench");
  const tank = `Fuel tank ${id}`;
  const wrong = `Typed twice ${id}`;
  await bench.logStep(tank, "Petcock off", "Bin 9");
  await bench.logStep(wrong, "Oops", "Bin 9");

  // Correct the tank's step: the step as it was stays in its history, with who and when.
  const step = bench.teardownStep(tank);
  await step.getByText(/^Edit or delete step \d+$/).click();
  await step.getByLabel(/^Step \d+: count/).fill("2");
  await step.getByLabel(/^Step \d+: notes/).fill("Petcock off, line plugged");
  await step.getByRole("button", { name: /^Save changes to step/ }).click();
  await expect(step.getByRole("list", { name: "Changes to this step" })).toContainText("Edited by Mateo Brandt");
  await expect(step.getByRole("list", { name: "Changes to this step" })).toContainText("count was empty (now 2); notes was “Petcock off” (now “Petcock off, line plugged”)");
  await expect(step).toContainText("(2 ×)");

  // On the checklist: fuel words bring the fuel caution; a torque spec adds the torque caution.
  await bench.addTorqueSpec(tank, { value: "10", unitLabel: "N·m" });
  const item = bench.checklist(tank);
  const caution = item.getByRole("complementary", { name: "Safety caution" });
  await expect(caution).toContainText("Torque wrench:");
  await expect(caution).toContainText("Fuel system open:");
  await expect(caution).toContainText("Follow the maker's service manual");

  // Delete the mistyped step: gone from the log and the checklist, kept under "Deleted steps".
  const doomed = bench.teardownStep(wrong);
  await doomed.getByText(/^Edit or delete step \d+$/).click();
  await doomed.getByText("Delete this step…").click();
  await doomed.getByRole("button", { name: new RegExp(`^Delete step \\d+: ${wrong}$`) }).click();
  await expect(bench.teardownStep(wrong)).toHaveCount(0);
  await expect(bench.checklist(wrong)).toHaveCount(0);
  const deleted = bench.section("Teardown log").getByRole("list", { name: "Deleted teardown steps" });
  await bench.section("Teardown log").getByText("Deleted steps (", { exact: false }).click();
  await expect(deleted).toContainText(wrong);
  await expect(deleted).toContainText("Deleted by Mateo Brandt");

  // The timeline shows the step as it now is, marked edited; the deleted step's entry is gone.
  const page = bench.page;
  await page.goto("/shop/copper-gulch/jobs/5");
  const entry = page.getByRole("article").filter({ hasText: tank });
  await expect(entry).toContainText("Petcock off, line plugged");
  await expect(entry).toContainText("(edited)");
  await expect(page.getByRole("article").filter({ hasText: wrong })).toHaveCount(0);
  await staff.close();
});

test("a torque-angle record (20 N·m + 90°) reads as proof on the owner's page, with its threads and one-time fasteners", async ({ browser }) => {
  test.setTimeout(90_000);
  const id = stamp();
  const staff = await browser.newContext({ storageState: storageStatePath("technician") });
  const bench = new BenchPage(await staff.newPage());
  await bench.open("/shop/copper-gulch/jobs/5/bench");
  const record = await bench.logTorque({ fastener: `Cylinder head bolts ${id}`, spec: "20", unitLabel: "N·m", applied: "20", angle: "90", angleDone: true, threads: "Oiled", oneTime: true, share: true });
  // Issue 18 §4, our own wording: 20 against 20 N·m is within the ±4 % default (ISO 6789-1 type II,
  // from memory, unverified); nothing ticked for the passes, the angle stage ticked as turned.
  const proof = "Torqued to 20.0 N·m, within ±4 % of the 20.0 N·m spec; 3 passes (30 → 60 → 100 %) planned, not recorded as done; no check pass recorded; then + 90° by angle, done; threads oiled; one-time (torque-to-yield) fasteners: replace with new, never re-use";
  await expect(record).toContainText(proof);

  const ownerContext = await browser.newContext({ storageState: storageStatePath("jobCustomer") });
  const owner = await ownerContext.newPage();
  await owner.goto(ownerPath);
  const shown = owner.getByRole("region", { name: "Updates from the shop" }).getByRole("article").filter({ hasText: `Cylinder head bolts ${id}` });
  await expect(shown).toContainText(proof);
  await expect(shown).toContainText("Within tolerance");
  await staff.close();
  await ownerContext.close();
});

test.describe("spec library, as the service writer", () => {
  test.use({ storageState: storageStatePath("writer") });

  test("a spec added for the machine's model pre-fills the bench's torque form, and can be deleted after a confirmation", async ({ page }) => {
    const id = stamp();
    await page.goto("/shop/copper-gulch/specs");
    const add = page.getByRole("region", { name: "Add a spec" });
    await add.getByLabel(/^Make/).fill("Tessaro");
    await add.getByLabel(/^Model/).fill("Ridgeline 570");
    await add.getByLabel("Kind").selectOption({ label: "Torque" });
    await add.getByLabel(/^What it is for/).fill(`Skid plate bolts ${id}`);
    await add.getByLabel(/^Torque/).fill("12");
    await add.getByLabel("Unit").selectOption({ label: "N·m" });
    await add.getByLabel("Bolts in the circle (optional)").fill("4");
    await add.getByLabel("Source").fill("invented test sheet p. 1");
    await add.getByRole("button", { name: "Add spec" }).click();
    const tessaro = page.getByRole("region", { name: "Tessaro Ridgeline 570", exact: true });
    await expect(tessaro).toContainText(`Skid plate bolts ${id}`);

    // J-0005 is a Tessaro Ridgeline 570: its torque form offers the spec and fills itself in.
    await page.goto("/shop/copper-gulch/jobs/5/bench");
    const torque = page.getByRole("region", { name: "Torque log", exact: true });
    await torque.getByLabel("From the shop's specs").selectOption({ label: `Skid plate bolts ${id} (invented test sheet p. 1)` });
    await expect(torque.getByLabel(/^What was torqued/)).toHaveValue(`Skid plate bolts ${id}`);
    await expect(torque.getByLabel(/^Spec torque/)).toHaveValue("12");
    await expect(torque.getByLabel("Bolts in the circle (optional)")).toHaveValue("4");
    // Switching the unit of a picked spec converts it: 12 N·m = 8.9 lbf·ft (NIST SP 811 App. B.9,
    // 12 / 1.355 818 = 8.851), and back to exactly the spec.
    await torque.getByLabel("Unit", { exact: true }).selectOption({ label: "lbf·ft" });
    await expect(torque.getByLabel(/^Spec torque/)).toHaveValue("8.9");
    await torque.getByLabel("Unit", { exact: true }).selectOption({ label: "N·m" });
    await expect(torque.getByLabel(/^Spec torque/)).toHaveValue("12");
    await expect(torque.getByRole("img", { name: "Tightening order: 1, 3, 2, 4" })).toBeVisible();

    await page.goto("/shop/copper-gulch/specs");
    await tessaro.getByRole("button", { name: `Delete Skid plate bolts ${id} (Tessaro Ridgeline 570)` }).click();
    await tessaro.getByRole("group", { name: /^Confirm deleting/ }).getByRole("button", { name: "Delete" }).click();
    await expect(page.getByText(`Skid plate bolts ${id}`)).toHaveCount(0);
  });
});

test.describe("spec library, as a technician", () => {
  test.use({ storageState: storageStatePath("technician") });

  test("technicians read the shop's specs but can't change them", async ({ page }) => {
    await page.goto("/shop/copper-gulch/specs");
    const corvane = page.getByRole("region", { name: "Corvane Tarn 450", exact: true });
    await expect(corvane).toContainText("Valve cover bolts");
    await expect(page.getByRole("button", { name: /^Delete/ })).toHaveCount(0);
    await expect(page.getByRole("heading", { name: "Add a spec" })).toHaveCount(0);
  });
});

async function expectNoViolations(page: Page) {
  // WCAG 2.2 AA through axe-core's rule tags (see accessibility.spec.ts).
  const { violations } = await new AxeBuilder({ page }).withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa", "wcag22aa"]).analyze();
  expect(violations.map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`)).toEqual([]);
}
