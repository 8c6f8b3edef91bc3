import { expect, test } from "@playwright/test";
import mysql from "mysql2/promise";
import { storageStatePath } from "./personas";
import { BenchPage } from "./pages/bench-page";

// Issue 19, ordering: on J-0005 (Ruth Calloway's job at Copper Gulch) the technician puts two
// parts for the booked work on one supplier order, the supplier back-orders one with a new date,
// the order comes in from the shop's "Parts on order" list (the other part arrives, the
// back-ordered one stays), and the owner's page says which part is awaited and when.
// It changes J-0005's parts and status, so it runs after staff.spec.ts (files run in name order),
// whose board counts and filters assume the seed.

let ownerPath = "";

test.beforeAll(async () => {
  const db = await mysql.createConnection(process.env.DATABASE_URL!);
  const [rows] = await db.query<mysql.RowDataPacket[]>("SELECT j.public_id FROM jobs j JOIN shops s ON s.id = j.shop_id WHERE s.slug = 'copper-gulch' AND j.number = 5");
  await db.end();
  ownerPath = `/my/jobs/${rows[0]!.public_id}`;
});

test("two parts on one order, one back-ordered: the order comes in from the list, the owner sees the wait", async ({ browser }) => {
  test.setTimeout(120_000);
  const id = Date.now().toString(36);
  const [cable, grips] = [`Throttle cable ${id}`, `Hand grips ${id}`];
  const staff = await browser.newContext({ storageState: storageStatePath("technician") });
  const bench = new BenchPage(await staff.newPage());
  await bench.open("/shop/copper-gulch/jobs/5/bench");
  for (const description of [cable, grips]) {
    const parts = bench.section("Parts");
    await parts.getByLabel("Part (required)", { exact: true }).fill(description);
    await parts.getByLabel(/^For which work/).selectOption("booked");
    await parts.getByRole("button", { name: "Add part" }).click();
    await expect(parts.getByText(description, { exact: true })).toBeVisible();
  }

  const ordering = bench.page.getByRole("region", { name: "Ordering", exact: true });
  const order = ordering.getByRole("form", { name: "Order parts" });
  // Only this run's two parts go on the order (earlier runs may have left needed parts).
  for (const box of await order.getByRole("checkbox").all()) await box.uncheck();
  await order.getByRole("checkbox", { name: cable }).check();
  await order.getByRole("checkbox", { name: grips }).check();
  await order.getByLabel("Supplier").fill("Northgate Supply");
  await order.getByLabel("Order reference (optional)").fill(`PO-${id}`);
  await order.getByLabel("Expected (optional)").fill("2026-12-30");
  await order.getByRole("button", { name: "Put on order" }).click();
  await expect(ordering.getByText(`Order ref. PO-${id}`)).toHaveCount(2);

  const cableItem = ordering.getByRole("list", { name: "Ordering per part" }).getByRole("listitem").filter({ hasText: cable });
  await cableItem.getByLabel(`Back-ordered: new date for ${cable} (optional)`).fill("2027-01-15");
  await cableItem.getByRole("button", { name: "Mark back-ordered" }).click();
  await expect(cableItem.getByText("Back-ordered, now expected 2027-01-15")).toBeVisible();

  // The shop's list: both parts, for J-0005; the order comes in.
  await bench.page.goto("/shop/copper-gulch/parts");
  await expect(bench.page.getByRole("heading", { level: 1, name: "Parts on order" })).toBeVisible();
  const row = bench.page.getByTestId("part-on-order").filter({ hasText: grips });
  await expect(row).toContainText("J-0005");
  // The button sits on the order's first row on the page; the whole order is received.
  await bench.page.getByTestId("part-on-order").filter({ hasText: `PO-${id}` }).getByRole("button", { name: "Order received" }).click();
  await expect(bench.page.getByTestId("part-on-order").filter({ hasText: grips })).toHaveCount(0);
  await expect(bench.page.getByTestId("part-on-order").filter({ hasText: cable })).toContainText("Back-ordered");

  // The owner's page: the awaited part, in plain words.
  const owner = await browser.newContext({ storageState: storageStatePath("jobCustomer") });
  const mine = await owner.newPage();
  await mine.goto(ownerPath);
  await expect(mine.getByTestId("part-wait").filter({ hasText: cable })).toHaveText(`Part on back-order: ${cable}, expected 2027-01-15.`);
  await expect(mine.getByTestId("part-wait").filter({ hasText: grips })).toHaveCount(0);
  await staff.close();
  await owner.close();
});
