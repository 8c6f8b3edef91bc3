// Signed-in sessions for the bench, made the way people make them, in Debian's Chromium: staff through the
// password form, the machine owner through a one-time sign-in link. The link is minted straight into
// sign_in_links (what lib/server/sign-in.ts does before queueing the mail: the token's SHA-256 with the
// AUTH_SECRET) instead of waiting for the mail worker, then followed and confirmed on the real page.
import crypto from "node:crypto";
import knex from "knex";
import { chromium, type Browser } from "@playwright/test";
import { knexConfig } from "../../db/config";
import type { Stack } from "./stack";

export const STAFF = { email: "dana@coppergulch.test", password: "gulch-owner-demo" };
export const OWNER = { email: "ruth.calloway@mail.test" };

export function launchChromium(): Promise<Browser> {
  return chromium.launch({
    executablePath: "/usr/bin/chromium",
    args: ["--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
  });
}

/** The Cookie header of a signed-in session. */
export async function signIn(stack: Stack, who: "staff" | "owner"): Promise<string> {
  const browser = await launchChromium();
  try {
    const context = await browser.newContext({ baseURL: stack.appUrl });
    const page = await context.newPage();
    if (who === "staff") {
      await page.goto("/sign-in");
      const staff = page.getByRole("region", { name: "Shop staff" });
      await staff.getByLabel("E-mail").fill(STAFF.email);
      await staff.getByLabel("Password").fill(STAFF.password);
      await staff.getByRole("button", { name: "Sign in" }).click();
      await page.waitForURL(/\/shop(\/|$)/, { timeout: 30_000 });
    } else {
      const token = crypto.randomBytes(32).toString("base64url");
      const tokenHash = crypto.createHash("sha256").update(`${token}${stack.env.AUTH_SECRET}`).digest("hex");
      const k = knex({ ...knexConfig(stack.databaseUrl), pool: { min: 0, max: 1 } });
      try {
        await k("sign_in_links").insert({ email: OWNER.email, token_hash: tokenHash, expires_at: k.raw("NOW() + INTERVAL 20 MINUTE") });
      } finally {
        await k.destroy();
      }
      await page.goto(`/sign-in/link?token=${encodeURIComponent(token)}`);
      await page.getByRole("button", { name: "Sign in and see my jobs" }).click();
      await page.waitForURL((url) => !url.pathname.startsWith("/sign-in"), { timeout: 30_000 });
    }
    const cookies = await context.cookies(stack.appUrl);
    if (!cookies.some((c) => c.name.includes("session-token"))) throw new Error(`signing in as ${who} left no session cookie`);
    return cookies.map((c) => `${c.name}=${c.value}`).join("; ");
  } finally {
    await browser.close();
  }
}
