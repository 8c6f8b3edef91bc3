import { expect, test } from "@playwright/test";
import mysql from "mysql2/promise";
import { CheckInForm } from "./pages/check-in-form";
import { storageStatePath } from "./personas";

// A technician checks a machine in at the counter. Each run uses owners of its own (unique
// e-mails) and removes their jobs afterwards, so the board counts other tests expect hold.
test.use({ storageState: storageStatePath("technician") });

const run = Date.now().toString(36);
const OWNER_EMAILS = [`hollis.varga.${run}@mail.test`, `nobody.${run}@mail.test`];

async function query<T extends mysql.RowDataPacket>(sql: string, params: unknown[] = []): Promise<T[]> {
  const db = await mysql.createConnection(process.env.DATABASE_URL!);
  try {
    const [rows] = await db.query<T[]>(sql, params);
    return rows;
  } finally {
    await db.end();
  }
}

test.afterAll(async () => {
  // Jobs first (their history goes with them), then the owners (their machines go with them).
  await query("DELETE j FROM jobs j JOIN customers c ON c.id = j.customer_id WHERE c.email IN (?)", [OWNER_EMAILS]);
  await query("DELETE FROM customers WHERE email IN (?)", [OWNER_EMAILS]);
});

test("a technician checks a machine in for a new owner and lands on the new job", async ({ page }) => {
  const [shop] = await query<mysql.RowDataPacket>("SELECT next_job_number FROM shops WHERE slug = 'copper-gulch'");
  const next = Number(shop!.next_job_number);
  const form = new CheckInForm(page);
  await form.openFromBoard();
  await form.newOwner({ name: "Hollis Varga", email: OWNER_EMAILS[0]!, phone: "+1 555 010 2233" });
  await form.newMachine({ kind: "Dirt bike", make: "Corvane", model: "Tarn 250", year: "2020", serial: `CVT250-${run}`, hours: "41.5" });
  await form.concern().fill("Stalls when the throttle snaps shut.");
  await page.getByLabel("Condition at check-in").fill("Left shroud cracked, half a tank.");
  // The technician checking the machine in is offered as its technician.
  await expect(page.getByLabel("Technician")).toHaveValue(/\d+/);
  await form.submit();

  const number = `J-${String(next).padStart(4, "0")}`;
  await expect(page).toHaveURL(new RegExp(`/shop/copper-gulch/jobs/${next}\\?intake=1$`));
  await expect(page.getByRole("heading", { level: 1, name: new RegExp(number) })).toBeVisible();

  const [job] = await query<mysql.RowDataPacket>(
    "SELECT j.status, c.name FROM jobs j JOIN customers c ON c.id = j.customer_id JOIN shops s ON s.id = j.shop_id WHERE s.slug = 'copper-gulch' AND j.number = ?",
    [next],
  );
  expect(job).toMatchObject({ status: "checked_in", name: "Hollis Varga" });
});

test("an empty concern is refused beside its field, keeping what was typed, and nothing is saved", async ({ page }) => {
  const form = new CheckInForm(page);
  await form.openFromBoard();
  await form.newOwner({ name: "Nobody Saved", email: OWNER_EMAILS[1]!, phone: "" });
  await form.newMachine({ kind: "Snowmobile", make: "Brumal", model: "Drift 600", year: "2016", serial: "", hours: "" });
  await form.submit();

  await expect(page.getByRole("main").getByRole("alert")).toContainText("Some fields need attention");
  await expect(form.concern()).toHaveAccessibleDescription(/Write down the owner's concern in their own words/);
  await expect(form.concern()).toHaveAttribute("aria-invalid", "true");
  await expect(page).toHaveURL(/\/shop\/copper-gulch\/jobs\/new$/);
  await expect(page.getByLabel("Owner's name")).toHaveValue("Nobody Saved");
  await expect(page.getByLabel("E-mail", { exact: true })).toHaveValue(OWNER_EMAILS[1]!);
  await expect(page.getByLabel("Make")).toHaveValue("Brumal");
  await expect(page.getByLabel("Year", { exact: true })).toHaveValue("2016");
  await expect(page.getByLabel("Kind")).toHaveValue("snowmobile");
  expect(await query("SELECT id FROM customers WHERE email = ?", [OWNER_EMAILS[1]])).toEqual([]);
});
