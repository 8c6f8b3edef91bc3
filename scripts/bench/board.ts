// DESIGN.md §5 board budget: every filter, search and sort at 50,000 jobs / 1,000,000 entries within 1.5×
// its time at 1,000 jobs. Times listJobs (db/queries/jobs.ts, the production query the board page and
// GET /api/shops/[shop]/jobs run) directly against the bench database: the HTTP and rendering around it
// do not grow with the shop, so the ratio is the query's. Median of several runs, shops interleaved.
import type { BenchData } from "./seed";
import { SEARCH } from "./seed";
import { ratioBudget, type Part } from "./budget";
import type { Stack } from "./stack";

const FACTOR = 1.5;
const WARM = 2;
const RUNS = Number(process.env.BENCH_BOARD_RUNS ?? 7);

type Case = { name: string; params: (technician: number) => Record<string, string> };

const CASES: Case[] = [
  { name: "default order", params: () => ({}) },
  { name: "sort by number", params: () => ({ sort: "number" }) },
  { name: "sort by status", params: () => ({ sort: "status", dir: "asc" }) },
  { name: "sort by promised date", params: () => ({ sort: "promised", dir: "asc" }) },
  { name: "sort by owner", params: () => ({ sort: "customer", dir: "asc" }) },
  { name: "filter status on the bench", params: () => ({ status: "in_progress" }) },
  { name: "filter overdue", params: () => ({ attention: "overdue" }) },
  { name: "filter waiting on parts", params: () => ({ attention: "waiting_parts" }) },
  { name: "filter answered, not started", params: () => ({ attention: "answered" }) },
  { name: "filter ready, unpaid", params: () => ({ attention: "ready_unpaid" }) },
  { name: "filter owner slow to answer", params: () => ({ attention: "owner_slow" }) },
  { name: "filter technician", params: (technician) => ({ technician: String(technician) }) },
  { name: "search by owner", params: () => ({ q: SEARCH.owner }) },
  { name: "search by job number", params: () => ({ q: SEARCH.number }) },
  { name: "search by serial", params: () => ({ q: SEARCH.serial }) },
  { name: "search by make", params: () => ({ q: SEARCH.make }) },
  { name: "page 40, default order", params: () => ({ page: "40" }) },
];

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

export async function boardBudgets(stack: Stack, data: BenchData, log: (s: string) => void): Promise<Part> {
  // db/client.ts reads DATABASE_URL when the pool is first made, which is below.
  process.env.DATABASE_URL = stack.databaseUrl;
  const { listJobs } = await import("../../db/queries/jobs");
  const { jobListQuerySchema } = await import("../../lib/schemas/jobs");
  const { db } = await import("../../db/client");
  const technicianOf = async (shopId: number) =>
    Number((await db()("memberships").where({ shop_id: shopId, role: "technician" }).orderBy("user_id").first("user_id"))?.user_id);
  const shops = [
    { id: data.smallShopId, technician: await technicianOf(data.smallShopId) },
    { id: data.bigShopId, technician: await technicianOf(data.bigShopId) },
  ];
  const budgets = [];
  const lines = [`Board (listJobs timed directly, median of ${RUNS} after ${WARM} warm-up runs; 25 a page):`];
  try {
    for (const c of CASES) {
      const times: number[][] = [[], []];
      const totals: number[] = [0, 0];
      for (let run = 0; run < WARM + RUNS; run += 1) {
        for (const [i, shop] of shops.entries()) {
          const query = jobListQuerySchema.parse(c.params(shop.technician));
          const began = performance.now();
          const page = await listJobs({ shopId: shop.id, query });
          const ms = performance.now() - began;
          totals[i] = page.total;
          if (run >= WARM) times[i]!.push(ms);
        }
      }
      const [small, big] = [median(times[0]!), median(times[1]!)];
      budgets.push(ratioBudget(`board 50k/1k, ${c.name}`, big, small, FACTOR, "ms"));
      const line = `  ${c.name.padEnd(30)} 1k: ${small.toFixed(1).padStart(7)} ms (${totals[0]} jobs)   50k: ${big.toFixed(1).padStart(8)} ms (${totals[1]} jobs)   ${(big / small).toFixed(1)}×`;
      lines.push(line);
      log(line.trim());
    }
  } finally {
    await db().destroy();
  }
  lines.push(`  budget: 50k time ≤ ${FACTOR}× the 1k time for each`);
  return { budgets, lines };
}
