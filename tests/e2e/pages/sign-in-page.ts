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

  /** Fills the machine owners' form and presses the button (the answer is left to the caller). */
  async askForLink(email: string) {
    await this.open();
    await this.owners().getByLabel("E-mail you gave the shop").fill(email);
    await this.owners().getByRole("button", { name: "E-mail me a sign-in link" }).click();
  }

  /** Asks for a link and reads it from the mail fake. */
  async requestLink(email: string): Promise<string> {
    const since = new Date();
    await this.askForLink(email);
    await expect(this.page.getByRole("heading", { name: "Check your e-mail" })).toBeVisible();
    const message = await waitForMail({ baseUrl: mailBaseUrl(), to: email, since, subjectIncludes: "sign-in link" });
    const link = message.links.find((l) => l.includes("/sign-in/link?token="));
    expect(link, "the e-mail carries a sign-in link").toBeTruthy();
    return link!;
  }

  /** Asks for a link, follows it and confirms. */
  async signInAsOwner(email: string) {
    const link = await this.requestLink(email);
    await this.page.goto(link);
    await this.page.getByRole("button", { name: "Sign in and see my jobs" }).click();
    await this.page.waitForURL((url) => !url.pathname.startsWith("/sign-in"));
    return link;
  }
}

export function mailBaseUrl(): string {
  const url = process.env.RESEND_BASE_URL;
  if (!url) throw new Error("RESEND_BASE_URL is not set; run the end-to-end tests through `npm test`.");
  return url;
}
