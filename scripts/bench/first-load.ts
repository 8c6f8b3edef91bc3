// DESIGN.md §5 First Load JS budgets, from the bench build (.next-bench): the JavaScript a browser loads
// on a first visit to a route, gzipped. That is the build's root main files (build-manifest.json:
// runtime, React, Next's client) plus every chunk the route's client reference manifest lists for its
// segments (root and group layouts, the page, their error / not-found boundaries), each file counted
// once. Lazily imported chunks (next/dynamic, import()) are not in these lists, as intended by the budget.
import fs from "node:fs";
import path from "node:path";
import vm from "node:vm";
import zlib from "node:zlib";
import { ceilingBudget, type Part } from "./budget";
import { ROOT } from "./proc";
import { DIST } from "./stack";

const KB = 1000; // kB as Next's build output counts them
const ROUTES = [
  { name: "customer First Load JS", route: "/(owner)/my/jobs/[job]/page", limit: 180 },
  { name: "staff First Load JS", route: "/(staff)/shop/[shop]/jobs/[number]/page", limit: 250 },
];

function clientManifest(route: string): { entryJSFiles: Record<string, string[]> } {
  const file = path.join(ROOT, DIST, "server", "app", `${route}_client-reference-manifest.js`);
  if (!fs.existsSync(file)) throw new Error(`${path.relative(ROOT, file)} is missing: build first (npm run bench without --no-build)`);
  // The manifest is a script that assigns globalThis.__RSC_MANIFEST[route]; run it in a sandbox.
  const sandbox: { globalThis?: unknown; __RSC_MANIFEST?: Record<string, { entryJSFiles: Record<string, string[]> }> } = {};
  sandbox.globalThis = sandbox;
  vm.runInNewContext(fs.readFileSync(file, "utf8"), sandbox);
  const manifest = sandbox.__RSC_MANIFEST?.[route];
  if (!manifest) throw new Error(`${path.relative(ROOT, file)} has no entry for ${route}`);
  return manifest;
}

const gzipCache = new Map<string, number>();
function gzipped(rel: string): number {
  const known = gzipCache.get(rel);
  if (known !== undefined) return known;
  const size = zlib.gzipSync(fs.readFileSync(path.join(ROOT, DIST, rel)), { level: 9 }).length;
  gzipCache.set(rel, size);
  return size;
}

export async function firstLoadBudgets(log: (s: string) => void): Promise<Part> {
  const build = JSON.parse(fs.readFileSync(path.join(ROOT, DIST, "build-manifest.json"), "utf8")) as { rootMainFiles: string[] };
  const shared = build.rootMainFiles.filter((f) => f.endsWith(".js"));
  const sharedBytes = shared.reduce((sum, f) => sum + gzipped(f), 0);
  const lines = [`First Load JS (gzip -9 of the files in ${DIST}; kB = 1000 bytes):`, `  shared by every route (root main files): ${(sharedBytes / KB).toFixed(1)} kB`];
  const budgets = [];
  for (const r of ROUTES) {
    const files = new Set(shared);
    for (const list of Object.values(clientManifest(r.route).entryJSFiles)) for (const f of list) if (f.endsWith(".js")) files.add(f);
    const sizes = [...files].map((f) => ({ f, gz: gzipped(f) })).sort((a, b) => b.gz - a.gz);
    const total = sizes.reduce((sum, s) => sum + s.gz, 0);
    budgets.push(ceilingBudget(r.name, total / KB, r.limit, "kB"));
    lines.push(`  ${r.name} (${r.route}): ${(total / KB).toFixed(1)} kB in ${files.size} files, budget ≤ ${r.limit} kB; largest:`);
    for (const s of sizes.slice(0, 4)) lines.push(`    ${(s.gz / KB).toFixed(1).padStart(7)} kB  ${s.f}`);
    log(`${r.name}: ${(total / KB).toFixed(1)} kB`);
  }
  return { budgets, lines };
}
