import { test } from "@playwright/test";

// Work in progress (H9): holds the stack up for exploration.
test("hold", async () => {
  test.setTimeout(0);
  await new Promise((r) => setTimeout(r, Number(process.env.FUZZ_HOLD_S ?? 0) * 1000));
});
