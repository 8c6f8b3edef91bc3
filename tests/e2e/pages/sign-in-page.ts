import { type Page, expect } from "@playwright/test";
import { waitForMail } from "../../support/mailbox";

/** The sign-in screen, found by labels and roles as a person would. */
export class SignInPage {
  constructor(private readonly page: Page) {}

  async open(next?: string) {
    await this.page.goto(next ? `/sign-in?next=${encodeURIComponent(next)}` : "/sign-in");
  }

  private staff() {
    return this.page.getByRole("region", { name: "Shop staff" });
  }

  private owners() {
    return this.page.getByRole("region", { name: "Machine owners" });
  }

  async signInAsStaff(email: string, password: string) {
    await this.open();
    await this.staff().getByLabel("E-mail").fill(email);
    await this.staff().getByLabel("Password").fill(password);
    await this.staff().getByRole("button", { name: "Sign in" }).click();
  }

  /** Asks for a link, reads it from the mail fake, follows it and confirms. */
  async signInAsOwner(email: string) {
    const since = new Date();
    await this.open();
    await this.owners().getByLabel("E-mail you gave the shop").fill(email);
    await this.owners().getByRole("button", { name: "E-mail me a sign-in link" }).click();
    await expect(this.page.getByRole("heading", { name: "Check your e-mail" })).toBeVisible();
    const message = await waitForMail({ baseUrl: mailBaseUrl(), to: email, since, subjectIncludes: "sign-in link" });
    const link = message.links.find((l) => l.includes("/sign-in/link?token="));
    expect(link, "the e-mail carries a sign-in link").toBeTruthy();
    await this.page.goto(link!);
    await this.page.getByRole("button", { name: "Sign in and see my jobs" }).click();
    await this.page.waitForURL((url) => !url.pathname.startsWith("/sign-in"));
    return link!;
  }
}

export function mailBaseUrl(): string {
  const url = process.env.RESEND_BASE_URL;
  if (!url) throw new Error("RESEND_BASE_URL is not set; run the end-to-end tests through `npm test`.");
  return url;
}
