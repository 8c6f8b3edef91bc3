import { defineConfig } from "@playwright/test";

// scripts/test.mjs starts the app, MariaDB and the mail fake, then runs this with APP_URL
// and RESEND_BASE_URL set. Debian's Chromium only: never a downloaded browser.
export default defineConfig({
  testDir: "tests/e2e",
  fullyParallel: false,
  workers: 1,
  retries: 0,
  timeout: 45_000,
  expect: { timeout: 10_000 },
  reporter: [["list"]],
  projects: [
    // Signs each persona in once and saves the browser state (tests/e2e/personas.ts).
    { name: "sign-ins", testMatch: /auth\.setup\.ts/ },
    { name: "e2e", dependencies: ["sign-ins"] },
  ],
  use: {
    baseURL: process.env.APP_URL ?? "http://localhost:3110",
    trace: "retain-on-failure",
    launchOptions: {
      executablePath: "/usr/bin/chromium",
      args: ["--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
    },
  },
});
