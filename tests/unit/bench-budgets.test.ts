import { Writable } from "node:stream";
import { describe, expect, it } from "vitest";
import { ceilingBudget, floorBudget, printBudgets, ratioBudget } from "../../scripts/bench/budget";

// The shape `npm run bench -- --json` reports (scripts/bench/budget.ts): measured, baseline and limit in
// one unit, the limit of a ratio budget being factor × baseline.
describe("bench budgets", () => {
  it("a ratio budget allows factor × baseline and no more", () => {
    expect(ratioBudget("board 50k/1k, default order", 15, 10, 1.5, "ms")).toEqual({ name: "board 50k/1k, default order", measured: 15, baseline: 10, limit: 15, unit: "ms", pass: true });
    expect(ratioBudget("board 50k/1k, default order", 15.01, 10, 1.5, "ms").pass).toBe(false);
  });

  it("a floor budget (throughput) passes at or above factor × baseline", () => {
    expect(floorBudget("clip upload throughput / raw", 60, 100, 0.6, "MB/s")).toMatchObject({ limit: 60, pass: true });
    expect(floorBudget("clip upload throughput / raw", 59.9, 100, 0.6, "MB/s").pass).toBe(false);
  });

  it("a ceiling budget has no baseline and rounds to two places", () => {
    expect(ceilingBudget("customer First Load JS", 180.004, 180, "kB")).toEqual({ name: "customer First Load JS", measured: 180, baseline: null, limit: 180, unit: "kB", pass: false });
    expect(ceilingBudget("timeline queries", 6, 6, "queries").pass).toBe(true);
  });

  it("the table shows the ratio and the verdict of each budget", () => {
    let text = "";
    const out = new Writable({ write: (chunk: Buffer, _enc, done) => ((text += chunk.toString()), done()) });
    printBudgets([ratioBudget("staff job page p99 / prerendered", 50, 10, 5, "ms"), ceilingBudget("story LCP", 3.1, 2.5, "s")], out);
    expect(text).toMatch(/staff job page p99 \/ prerendered\s+50 ms\s+10 ms\s+50 ms\s+5\.00×\s+ok/);
    expect(text).toMatch(/story LCP\s+3\.1 s\s+2\.5 s\s+OVER BUDGET/);
  });
});
