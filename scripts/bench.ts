// `npm run bench`: the budgets of DESIGN.md §5 that have a check so far. Prints a table per budget and
// exits 1 when one is missed, so it can gate a release. Not part of `npm test`: timings need a quiet machine.
import { clipUploadBudget, type BudgetResult } from "./bench/clip-upload";

async function main(): Promise<void> {
  const checks: Array<() => Promise<BudgetResult>> = [clipUploadBudget];
  let failed = 0;
  for (const check of checks) {
    const result = await check();
    console.log(`\n${result.name}: ${result.ok ? "within budget" : "OVER BUDGET"}`);
    for (const line of result.lines) console.log(`  ${line}`);
    if (!result.ok) failed += 1;
  }
  console.log(failed === 0 ? "\nAll budgets met." : `\n${failed} budget(s) missed.`);
  process.exitCode = failed === 0 ? 0 : 1;
}

main().catch((error: unknown) => {
  console.error(`bench: ${error instanceof Error ? error.message : String(error)}`);
  process.exitCode = 2;
});
