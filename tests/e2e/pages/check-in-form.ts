import { type Page, expect } from "@playwright/test";

/** The check-in form, found by its labels as a writer would. */
export class CheckInForm {
  constructor(private readonly page: Page) {}

  async openFromBoard(shop = "copper-gulch") {
    await this.page.goto(`/shop/${shop}`);
    // A click that lands while the board is still hydrating can be lost: click again until the
    // address changes, then look for the form.
    await expect(async () => {
      if (!/\/jobs\/new$/.test(this.page.url())) await this.page.getByRole("link", { name: "Check in a machine" }).click();
      await this.page.waitForURL(new RegExp(`/shop/${shop}/jobs/new$`), { timeout: 5_000 });
    }).toPass({ timeout: 30_000 });
    await expect(this.page.getByRole("heading", { level: 1, name: "Check in a machine" })).toBeVisible({ timeout: 20_000 });
  }

  async newOwner(owner: { name: string; email: string; phone: string }) {
    await this.page.getByRole("radio", { name: /New owner/ }).check();
    await this.page.getByLabel("Owner's name").fill(owner.name);
    await this.page.getByLabel("E-mail", { exact: true }).fill(owner.email);
    await this.page.getByLabel("Phone", { exact: true }).fill(owner.phone);
  }

  async newMachine(machine: { kind: string; make: string; model: string; year: string; serial: string; hours: string }) {
    await this.page.getByLabel("Kind").selectOption({ label: machine.kind });
    await this.page.getByLabel("Make").fill(machine.make);
    await this.page.getByLabel(/^Model/).fill(machine.model);
    await this.page.getByLabel("Year", { exact: true }).fill(machine.year);
    await this.page.getByLabel("Serial number or VIN").fill(machine.serial);
    await this.page.getByLabel("Hours", { exact: true }).fill(machine.hours);
  }

  concern() {
    return this.page.getByLabel("Owner's concern");
  }

  async submit() {
    await this.page.getByRole("button", { name: "Check in machine" }).click();
  }
}
