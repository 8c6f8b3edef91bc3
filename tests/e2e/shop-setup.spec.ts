import { type Browser, type Page, expect, test } from "@playwright/test";
import { waitForMail } from "../support/mailbox";
import { sql } from "./db";
import { CheckInForm } from "./pages/check-in-form";
import { mailBaseUrl } from "./pages/sign-in-page";

// Issue 16 end to end: a new shop signs up and confirms its e-mail, sets its labour rate and tax,
// invites a technician who signs in and checks a machine in; the owner of the shop prepares the
// drop-off authorisation, the machine's owner signs it at the counter, and the invoice made from
// the authorised work carries the diagnosis charge. Each run makes a shop of its own.

const run = Date.now().toString(36);
const SLUG = `e2e-${run}`;
const OWNER = { name: "Marta Quell", email: `marta.${run}@shop.test`, password: "brass-lantern-forge-41" };
const TECH = { name: "Oskar Fenn", email: `oskar.${run}@shop.test`, password: "tidal-hinge-copper-77" };
const CUSTOMER_EMAIL = `wyn.ashby.${run}@mail.test`;

async function link(email: string, since: Date, subject: string, path: string): Promise<string> {
  const mail = await waitForMail({ baseUrl: mailBaseUrl(), to: email, since, subjectIncludes: subject, timeoutMs: 30_000 });
  const url = mail.links.find((l) => l.includes(path));
  expect(url, `the e-mail "${subject}" has a link to ${path}`).toBeTruthy();
  return url!;
}

async function newPage(browser: Browser): Promise<Page> {
  return (await browser.newContext()).newPage();
}

test.afterAll(async () => {
  // The shop and everything in it (jobs, customers, memberships) go with it; then its people.
  // Best effort: a leftover test shop harms no other test.
  try {
    await sql("DELETE FROM shops WHERE slug = ?", [SLUG]);
    await sql("DELETE FROM users WHERE email IN (?)", [[OWNER.email, TECH.email, CUSTOMER_EMAIL]]);
  } catch (error) {
    console.warn(`shop-setup: test shop ${SLUG} left in place: ${String(error)}`);
  }
});

test("a new shop signs up, sets its rates, tax and drop-off terms, invites a technician who checks a machine in with a signed drop-off authorisation; the invoice shows the diagnosis line", async ({ browser }) => {
  test.setTimeout(240_000);

  // Sign up and confirm the e-mail.
  const owner = await newPage(browser);
  await owner.goto("/start");
  await owner.getByLabel("Shop name").fill(`Quell Powersports ${run}`);
  await owner.getByLabel("Address for links").fill(SLUG);
  await owner.getByLabel("Time zone").selectOption("America/Denver");
  await owner.getByLabel("Currency").selectOption("USD");
  await owner.getByLabel("Your name").fill(OWNER.name);
  await owner.getByLabel("E-mail").fill(OWNER.email);
  await owner.getByLabel("Password").fill(OWNER.password);
  const signedUp = new Date();
  await owner.getByRole("button", { name: "Start the shop" }).click();
  await expect(owner.getByRole("heading", { level: 1, name: "Check your e-mail" })).toBeVisible();
  await owner.goto(await link(OWNER.email, signedUp, "Confirm your shop", "/start/confirm"));
  await owner.getByLabel("The password you chose").fill(OWNER.password);
  await owner.getByRole("button", { name: "Create the shop and sign in" }).click();
  await expect(owner).toHaveURL(new RegExp(`/shop/${SLUG}$`), { timeout: 20_000 });

  // Labour rate and tax.
  await owner.goto(`/shop/${SLUG}/settings`);
  const labour = owner.getByRole("form", { name: "Labour rates" });
  await labour.getByLabel("Default rate per hour (USD)").fill("110.00");
  await labour.getByLabel("Rate 1: name").fill("Diagnosis");
  await labour.getByLabel("Rate 1: per hour (USD)").fill("130.00");
  await labour.getByRole("button", { name: "Save labour rates" }).click();
  await expect(labour.getByRole("status")).toBeVisible();
  const tax = owner.getByRole("form", { name: "Tax" });
  await tax.getByLabel("Sales tax rate (%)").fill("7.5");
  await tax.getByLabel("Labour (%)").fill("fast");
  await tax.getByRole("button", { name: "Save tax" }).click();
  // A rate that can't be read is named beside its own field.
  await expect(tax.getByLabel("Labour (%)")).toHaveAccessibleDescription(/number of percent/);
  await tax.getByLabel("Labour (%)").fill("0");
  await tax.getByRole("button", { name: "Save tax" }).click();
  await expect(tax.getByRole("status")).toBeVisible();
  // Standard drop-off terms, which anyone at the counter can put up for signing.
  const terms = owner.getByRole("form", { name: "Standard drop-off terms" });
  await terms.getByLabel("Diagnosis charge (USD)").fill("55.00");
  await terms.getByLabel("Work authorised up to (USD)").fill("300.00");
  await terms.getByRole("button", { name: "Save drop-off terms" }).click();
  await expect(terms.getByRole("status")).toBeVisible();
  const [money] = await sql("SELECT m.labour_rate_minor, m.tax_rate_percent, m.labour_tax_rate_percent, m.dropoff_charge_minor FROM shop_money_settings m JOIN shops s ON s.id = m.shop_id WHERE s.slug = ?", [SLUG]);
  expect(money).toMatchObject({ labour_rate_minor: 11_000, dropoff_charge_minor: 5500 });
  expect(Number(money!.tax_rate_percent)).toBe(7.5);
  expect(Number(money!.labour_tax_rate_percent)).toBe(0);

  // Invite a technician, who joins from the e-mail and is signed in with that role.
  await owner.goto(`/shop/${SLUG}/staff`);
  const invite = owner.locator("form").filter({ has: owner.getByRole("button", { name: "Send invitation" }) });
  await invite.getByLabel("Name").fill(TECH.name);
  await invite.getByLabel("E-mail").fill(TECH.email);
  await invite.getByLabel(/^Role/).selectOption("technician");
  const invited = new Date();
  await invite.getByRole("button", { name: "Send invitation" }).click();
  const tech = await newPage(browser);
  await tech.goto(await link(TECH.email, invited, "invites you to Benchside", "/join"));
  await tech.getByLabel("Your name").fill(TECH.name);
  await tech.getByLabel("Choose a password").fill(TECH.password);
  await tech.getByRole("button", { name: "Join and sign in" }).click();
  await expect(tech).toHaveURL(new RegExp(`/shop/${SLUG}`), { timeout: 20_000 });

  // The technician checks a machine in for a new owner.
  const form = new CheckInForm(tech);
  await form.openFromBoard(SLUG);
  await form.newOwner({ name: "Wyn Ashby", email: CUSTOMER_EMAIL, phone: "+1 555 010 7788" });
  await form.newMachine({ kind: "Dirt bike", make: "Corvane", model: "Tarn 250", year: "2019", serial: `QP-${run}`, hours: "88" });
  await form.concern().fill("Hard to start when cold; smokes for a minute.");
  await form.submit();
  await expect(tech).toHaveURL(new RegExp(`/shop/${SLUG}/jobs/1\\?intake=1$`), { timeout: 20_000 });

  // At the counter: the technician puts the shop's standard terms up; the machine's owner signs on that screen.
  const standard = tech.getByRole("form", { name: "Standard drop-off terms" });
  await expect(standard).toContainText("diagnosis $55.00, work authorised up to $300.00");
  await standard.getByRole("button", { name: "Put the standard terms up for signing" }).click();
  const sign = tech.getByRole("form", { name: "Owner signs at the counter" });
  await expect(tech.getByText(/up to \$300\.00 in total before tax/)).toBeVisible();
  await sign.getByLabel("Full name, typed as a signature").fill("Wyn Ashby");
  await sign.getByLabel("I have read the wording above and agree to it").check();
  await sign.getByRole("button", { name: "Sign the authorisation" }).click();
  await expect(sign).toHaveCount(0, { timeout: 10_000 });
  const [signed] = await sql(
    "SELECT d.method, d.signature_name FROM dropoff_authorisations d JOIN jobs j ON j.id = d.job_id JOIN shops s ON s.id = j.shop_id WHERE s.slug = ? AND j.number = 1",
    [SLUG],
  );
  expect(signed).toMatchObject({ method: "in_person", signature_name: "Wyn Ashby" });

  // The desk prices added work with the shop's named rates.
  await owner.goto(`/shop/${SLUG}/jobs/1/findings/new`);
  await owner.getByRole("button", { name: "Add labour" }).click();
  const line = owner.getByRole("listitem", { name: "Line 1: Labour" });
  await expect(line.getByLabel("Rate per hour (USD)")).toHaveValue("110.00");
  await line.getByLabel("Labour rate").selectOption("Diagnosis");
  await expect(line.getByLabel("Rate per hour (USD)")).toHaveValue("130.00");

  // The invoice made from the authorised work carries the diagnosis charge.
  await owner.goto(`/shop/${SLUG}/jobs/1/invoice`);
  await owner.getByRole("button", { name: "Make the invoice from authorised work" }).click();
  await expect(owner.getByRole("heading", { level: 1, name: /^Invoice INV-\d{4}$/ })).toBeVisible();
  await expect(owner.getByTestId("invoice-line").filter({ hasText: "Inspection and diagnosis" })).toContainText("$55.00");

  // The owner takes the technician off the staff (a second click confirms); their next request finds them signed out.
  await owner.goto(`/shop/${SLUG}/staff`);
  await owner.getByRole("button", { name: `Deactivate ${TECH.name}` }).click();
  await owner.getByRole("button", { name: `Yes, deactivate ${TECH.name}` }).click();
  await expect(owner.getByRole("button", { name: `Reactivate ${TECH.name}` })).toBeVisible();
  await tech.goto(`/shop/${SLUG}`);
  await expect(tech).toHaveURL(/\/sign-in/);
});
