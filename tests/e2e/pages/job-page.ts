import { type Locator, type Page, expect } from "@playwright/test";

/** The staff job page: composer, timeline and entry controls, found by role and label. */
export class JobPage {
  constructor(readonly page: Page) {}

  async open(path: string) {
    await this.page.goto(path);
    await expect(this.page.getByRole("heading", { name: "Journal", exact: true })).toBeVisible();
  }

  /**
   * Opens a tab of the composer and waits until it is the selected one: a click before the page has
   * hydrated does nothing, and the other tabs' fields (the share box is in each) would pass for it.
   */
  async openTab(name: "Note" | "Photos" | "Clip") {
    const tab = this.page.getByRole("tab", { name });
    await expect(async () => {
      await tab.click();
      await expect(tab).toHaveAttribute("aria-selected", "true", { timeout: 2000 });
    }).toPass({ timeout: 30_000 });
  }

  entry(text: string): Locator {
    return this.page.getByRole("article").filter({ hasText: text });
  }

  async postNote(text: string): Promise<Locator> {
    await this.openTab("Note");
    const editor = this.page.getByRole("textbox", { name: "Note", exact: true });
    await editor.click();
    await this.page.keyboard.type(text);
    await this.page.getByRole("button", { name: "Post note" }).click();
    const entry = this.entry(text);
    await expect(entry).toBeVisible();
    return entry;
  }

  async postPhotos(files: string[], caption: string): Promise<Locator> {
    await this.openTab("Photos");
    await this.page.getByLabel(/Take or choose photos|Add more photos/).setInputFiles(files);
    const set = this.page.getByRole("list", { name: "Photos in this set" });
    await expect(set.getByText("Uploaded")).toHaveCount(files.length);
    await this.page.getByLabel("Caption (optional)").fill(caption);
    await this.page.getByRole("button", { name: `Post ${files.length} photo${files.length === 1 ? "" : "s"}` }).click();
    const entry = this.entry(caption);
    await expect(entry.locator("img")).toHaveCount(files.length);
    return entry;
  }

  async deleteEntry(entry: Locator) {
    await entry.getByRole("button", { name: "Delete" }).click();
    await entry.getByRole("group", { name: "Confirm delete" }).getByRole("button", { name: "Delete" }).click();
    await expect(entry).toHaveCount(0);
  }
}
