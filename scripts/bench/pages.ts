// DESIGN.md §5 page budgets, over HTTP against the bench's `next start`:
// - p99 latency of the customer and the staff job page (the 200-entry job) under 32 connections, each
//   within 3× / 5× the p99 of a prerendered page of the same server, measured in the same run
//   (a page loaded again while unchanged comes from the page cache, lib/server/page-cache.ts; the
//   same pages rendered on every request are measured too and reported beside them);
// - database statements per timeline API request (≤ 6), on the 200-entry job and a 5,000-entry one.
import fs from "node:fs";
import path from "node:path";
import autocannon from "autocannon";
import mysql from "mysql2/promise";
import { type Budget, ceilingBudget, ratioBudget, type Part } from "./budget";
import { ROOT } from "./proc";
import type { BenchData } from "./seed";
import { storyPath } from "./lcp";
import { signIn } from "./sessions";
import { DIST, type Stack } from "./stack";

const CONNECTIONS = 32;
const SECONDS = Number(process.env.BENCH_PAGE_SECONDS ?? 15);

/**
 * The baseline the page budgets are measured against: a page the build prerendered (prerender-manifest
 * routes), else the public story page when it is static with on-demand revalidation (rendered once,
 * then served from Next's cache: checked by its x-nextjs-cache header), else a file from public/ served
 * by the same server, and the report says which.
 */
async function prerenderedPath(stack: Stack): Promise<{ path: string; what: string }> {
  const manifest = JSON.parse(fs.readFileSync(path.join(ROOT, DIST, "prerender-manifest.json"), "utf8")) as { routes: Record<string, unknown>; dynamicRoutes: Record<string, unknown> };
  // Pages only: not the build's files with a name ending (icons, the manifest, robots.txt…) or social cards.
  const routes = Object.keys(manifest.routes).filter((r) => !r.startsWith("/_") && !/\.[A-Za-z0-9]+$/.test(r) && !r.includes("opengraph"));
  const chosen = routes.find((r) => r.startsWith("/s/")) ?? routes[0];
  if (chosen) return { path: chosen, what: `prerendered page ${chosen}` };
  let note = "";
  if ("/s/[shop]/[story]" in manifest.dynamicRoutes) {
    const story = await storyPath(stack);
    const seen: string[] = [];
    for (let i = 0; i < 8 && seen.at(-1) !== "HIT"; i += 1) {
      if (i) await new Promise((r) => setTimeout(r, 500)); // a render in the background fills the cache
      const res = await fetch(`${stack.appUrl}${story}`);
      await res.arrayBuffer();
      seen.push(`${res.status} ${res.headers.get("x-nextjs-cache") ?? "no x-nextjs-cache"}`.replace(/^200 /, ""));
    }
    if (seen.at(-1) === "HIT") return { path: story, what: `story page ${story}, static with on-demand revalidation (served from Next's cache: x-nextjs-cache HIT)` };
    note = ` (the story page ${story} was not served from the cache: ${seen.join(", ")})`;
  }
  return { path: "/fonts/ARCHIVO-OFL.txt", what: `NO page is prerendered in this build: baseline is a static file (/fonts/ARCHIVO-OFL.txt) of the same server${note}` };
}

type Load = { p99: number; p50: number; rps: number; bytes: number; refused: string | null };

async function load(url: string, cookie: string | null, status = 200, extra: Record<string, string> = {}): Promise<Load> {
  const headers: Record<string, string> = { accept: "text/html", ...extra };
  if (cookie) headers.cookie = cookie;
  const check = await fetch(url, { headers, redirect: "manual" });
  const body = await check.text();
  if (check.status !== status) throw new Error(`${url} answered ${check.status} before the load run`);
  // A short warm-up first (JIT, caches, pool), not counted.
  await autocannon({ url, connections: CONNECTIONS, duration: 3, headers });
  const result = await autocannon({ url, connections: CONNECTIONS, duration: SECONDS, headers });
  // An answer other than the page's own under load fails the budget (a fast error page is no result).
  const other = Object.entries(result.statusCodeStats ?? {}).filter(([code]) => code !== String(status));
  const unexpected = other.reduce((n, [, s]) => n + s.count, 0);
  // Fewer answers than connections: most requests never finished inside the run, so its p99 means nothing.
  const refused =
    unexpected > 0 || result.errors > 0
      ? `${unexpected} of ${result.requests.total} answers not ${status} (${other.map(([code, s]) => `${s.count}× ${code}`).join(", ") || "?"}), ${result.errors} errors`
      : result.requests.total < CONNECTIONS
        ? `only ${result.requests.total} answers in ${SECONDS} s from ${CONNECTIONS} connections (${result.timeouts} timed out)`
        : null;
  return { p99: result.latency.p99, p50: result.latency.p50, rps: result.requests.average, bytes: Buffer.byteLength(body), refused };
}

export async function pageBudgets(stack: Stack, data: BenchData, log: (s: string) => void): Promise<Part> {
  const staffCookie = await signIn(stack, "staff");
  const ownerCookie = await signIn(stack, "owner");
  const base = await prerenderedPath(stack);
  const customerUrl = `${stack.appUrl}/my/jobs/${data.pageJob.publicId}`;
  const staffUrl = `${stack.appUrl}/shop/copper-gulch/jobs/${data.pageJob.number}`;
  log(`pages: ${CONNECTIONS} connections, ${SECONDS} s each; baseline: the faster of ${base.what}, and the prerendered not-found page`);
  // The story page carries its stylesheet and cover inside it (for a slow phone's first paint), which
  // makes it several times heavier than a plain page: measured against it alone, the job pages would
  // look faster for no change of theirs. So the app's own prerendered screen, the not-found page (the
  // build's /_not-found, answered 404 from Next's cache for any unknown address; stylesheet linked),
  // is measured too, and the faster of the two is the baseline: the stricter ratio.
  const plain = await load(`${stack.appUrl}/bench-no-such-page`, null, 404);
  const story = await load(`${stack.appUrl}${base.path}`, null);
  const baseline = plain.refused === null && plain.p99 < story.p99 ? plain : story;
  const baselineName = baseline === plain ? "not-found page (prerendered, 404)" : base.what;
  // Not a budget: the floor under the job pages' ratios. The owner's list of machines is the lightest
  // page rendered per request (three statements: the session and its lists), so no job page gets under it.
  const floor = await load(`${stack.appUrl}/my`, ownerCookie);
  const customer = await load(customerUrl, ownerCookie);
  const staff = await load(staffUrl, staffCookie);
  // Not budgets: the same pages rendered on every request (Cache-Control: no-cache goes past the
  // page cache, lib/server/page-cache.ts), what a load costs right after a change to the job.
  const noCache = { "cache-control": "no-cache" };
  const customerRendered = await load(customerUrl, ownerCookie, 200, noCache);
  const staffRendered = await load(staffUrl, staffCookie, 200, noCache);
  const fmt = (name: string, l: Load) =>
    `  ${name.padEnd(32)} p99 ${String(l.p99).padStart(6)} ms   p50 ${String(l.p50).padStart(6)} ms   ${l.rps.toFixed(0).padStart(5)} req/s   ${(l.bytes / 1024).toFixed(0)} kB HTML`;
  const lines = [
    `Job pages (${CONNECTIONS} connections, ${SECONDS} s each after a 3 s warm-up, autocannon):`,
    `  baseline: the faster of ${base.what}, and the prerendered not-found page: ${baselineName}`,
    fmt("story page (prerendered)", story),
    fmt("not-found page (prerendered)", plain),
    fmt("floor: owner's list /my", floor),
    `  floor: the lightest page rendered per request is ${(floor.p99 / baseline.p99).toFixed(1)}× the baseline (not a budget; what no per-request page gets under)`,
    fmt(`customer job page (${data.pageJob.publicId})`, customer),
    fmt(`staff job page (J-${data.pageJob.number})`, staff),
    `  budgets: customer p99 ≤ 3× baseline (2× is the goal), staff ≤ 5×; loads again of an unchanged page come from the page cache`,
    fmt("customer job page, rendered", customerRendered),
    fmt("staff job page, rendered", staffRendered),
    `  rendered on every request (no-cache, as right after a change): customer ${(customerRendered.p99 / baseline.p99).toFixed(1)}×, staff ${(staffRendered.p99 / baseline.p99).toFixed(1)}× the baseline (not budgets)`,
    ...[baseline, customer, staff].flatMap((l, i) => (l.refused ? [`  ${["baseline", "customer page", "staff page"][i]}: ${l.refused} — budget failed`] : [])),
  ];
  for (const line of lines.slice(2)) log(line.trim());
  const clean = (b: Budget, ...loads: Load[]) => ({ ...b, pass: b.pass && loads.every((l) => l.refused === null) });
  return {
    budgets: [
      clean(ratioBudget("customer job page p99 / prerendered", customer.p99, baseline.p99, 3, "ms"), customer, baseline),
      clean(ratioBudget("staff job page p99 / prerendered", staff.p99, baseline.p99, 5, "ms"), staff, baseline),
    ],
    lines,
  };
}

/**
 * Statements the database receives for one timeline request, from MariaDB's own counter (global
 * `Questions`): the bench's server has no other client while this runs (no mail worker; API paths skip
 * the proxy's health check), the counter read itself is calibrated away, and the fewest of five is
 * kept, so a stray statement from elsewhere can only be left out, never added. Counts everything the
 * request does: the session check and access, not only the timeline's own reads.
 */
export async function timelineQueryBudget(stack: Stack, data: BenchData, log: (s: string) => void): Promise<Part> {
  const staffCookie = await signIn(stack, "staff");
  const ownerCookie = await signIn(stack, "owner");
  const conn = await mysql.createConnection(stack.databaseUrl);
  const longJob = await conn.query<mysql.RowDataPacket[]>("SELECT public_id FROM jobs WHERE id = ?", [data.longJobId]);
  const questions = async () => Number((await conn.query<mysql.RowDataPacket[]>("SHOW GLOBAL STATUS LIKE 'Questions'"))[0][0]!.Value);
  const gaps: number[] = [];
  for (let i = 0; i < 3; i += 1) gaps.push(-(await questions()) + (await questions()));
  const own = Math.min(...gaps);
  const count = async (url: string, cookie: string) => {
    const seen: number[] = [];
    for (let i = 0; i < 6; i += 1) {
      const before = await questions();
      const res = await fetch(url, { headers: { cookie } });
      if (res.status !== 200) throw new Error(`${url} answered ${res.status}`);
      await res.arrayBuffer();
      const after = await questions();
      if (i > 0) seen.push(after - before - own); // the first one warms caches
    }
    return Math.min(...seen);
  };
  const timeline = (publicId: string, extra = "") => `${stack.appUrl}/api/jobs/${publicId}/timeline?order=desc&limit=50${extra}`;
  const cases = [
    { what: `staff, ${data.pageJob.publicId} (200 entries)`, n: await count(timeline(data.pageJob.publicId), staffCookie) },
    { what: `owner, ${data.pageJob.publicId} (200 entries)`, n: await count(timeline(data.pageJob.publicId), ownerCookie) },
    { what: `staff, ${String(longJob[0][0]?.public_id)} (5,000 entries)`, n: await count(timeline(String(longJob[0][0]?.public_id)), staffCookie) },
  ];
  await conn.end();
  const worst = Math.max(...cases.map((c) => c.n));
  const lines = [
    "Timeline API (GET /api/jobs/:job/timeline?order=desc&limit=50): statements per request, MariaDB's Questions counter",
    ...cases.map((c) => `  ${c.what.padEnd(44)} ${c.n}`),
    `  (the counter read costs ${own}, subtracted; fewest of 5 after a warm-up)  budget ≤ 6 and the same for every length`,
  ];
  for (const line of lines.slice(1, 4)) log(line.trim());
  const constant = new Set(cases.map((c) => c.n)).size === 1;
  const budget = ceilingBudget("timeline queries", worst, 6, "queries");
  return { budgets: [{ ...budget, pass: budget.pass && constant }], lines: constant ? lines : [...lines, "  NOT constant: the count changes with the timeline's length"] };
}
