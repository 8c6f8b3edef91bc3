import path from "node:path";
import { defineConfig } from "vitest/config";

export default defineConfig({
  resolve: {
    alias: {
      "@": path.resolve(__dirname),
      // `server-only` throws outside React's server build; tests run server code directly.
      "server-only": path.resolve(__dirname, "tests/support/server-only.ts"),
    },
  },
  test: {
    environment: "node",
    // next-auth imports "next/server" without an extension, which only a bundler resolves:
    // let Vite handle it so server code that signs people in can be tested directly.
    server: { deps: { inline: ["next-auth"] } },
    include: ["tests/unit/**/*.test.ts", "tests/integration/**/*.test.ts"],
    globalSetup: ["tests/support/global-setup.ts"],
    testTimeout: 20_000,
    hookTimeout: 60_000,
  },
});
