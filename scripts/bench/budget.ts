// One budget of DESIGN.md §5 as `npm run bench -- --json` reports it. `measured`, `baseline` and `limit`
// are in `unit`; for a ratio budget ("… / prerendered", "board 50k/1k, …") the limit is the allowed factor
// times the baseline, so the ratio is measured / baseline. `pass`: measured ≤ limit, or ≥ for a floor
// (throughput). baseline is null where the budget is an absolute one.
export type Budget = { name: string; measured: number; baseline: number | null; limit: number; unit: string; pass: boolean };

/** What a part of the bench hands back: its budgets and the lines that explain them. */
export type Part = { budgets: Budget[]; lines: string[] };

const round = (n: number) => (Number.isInteger(n) ? n : Math.round(n * 100) / 100);

/** At most `factor` × baseline. */
export function ratioBudget(name: string, measured: number, baseline: number, factor: number, unit: string): Budget {
  const limit = baseline * factor;
  return { name, measured: round(measured), baseline: round(baseline), limit: round(limit), unit, pass: measured <= limit };
}

export function ceilingBudget(name: string, measured: number, limit: number, unit: string): Budget {
  return { name, measured: round(measured), baseline: null, limit: round(limit), unit, pass: measured <= limit };
}

/** At least `factor` × baseline (throughput). */
export function floorBudget(name: string, measured: number, baseline: number, factor: number, unit: string): Budget {
  const limit = baseline * factor;
  return { name, measured: round(measured), baseline: round(baseline), limit: round(limit), unit, pass: measured >= limit };
}

export function printBudgets(budgets: Budget[], out: NodeJS.WritableStream): void {
  const width = Math.max(20, ...budgets.map((b) => b.name.length));
  out.write(`${"budget".padEnd(width)}  ${"measured".padStart(12)}  ${"baseline".padStart(12)}  ${"limit".padStart(12)}  ratio    verdict\n`);
  for (const b of budgets) {
    const ratio = b.baseline ? `${(b.measured / b.baseline).toFixed(2)}×` : "";
    const cell = (n: number | null) => (n === null ? "" : `${n} ${b.unit}`).padStart(12);
    out.write(`${b.name.padEnd(width)}  ${cell(b.measured)}  ${cell(b.baseline)}  ${cell(b.limit)}  ${ratio.padEnd(7)}  ${b.pass ? "ok" : "OVER BUDGET"}\n`);
  }
}
