// `npm run bench`: every budget of DESIGN.md §5, side by side, on the bench's own instance (private
// MariaDB in .data/bench, build in .next-bench, `next start` and the fakes on ports of their own).
// Reports and exits 1 when a budget is missed. A benchmark, not a test: `npm test` never runs it.
//   --json       the last line of output is one JSON object {"budgets": [{name, measured, baseline, limit, unit, pass}]}
//                (plus "errors": […] when a part could not be measured; exit 2 then)
//   --reseed     drop the bench database and seed it again (otherwise a complete seed is reused)
//   --no-build   reuse the build in .next-bench instead of building first
//   --only=a,b   only these parts: board, pages, queries, bundles, lcp, uploads, clip
import fs from "node:fs";
import knex from "knex";
import { knexConfig } from "../db/config";
import { boardBudgets } from "./bench/board";
import { type Budget, type Part, printBudgets } from "./bench/budget";
import { clipUploadBudget } from "./bench/clip-upload";
import { firstLoadBudgets } from "./bench/first-load";
import { storyLcpBudget } from "./bench/lcp";
import { pageBudgets, timelineQueryBudget } from "./bench/pages";
import { seedBench } from "./bench/seed";
import { DB_NAME, DIST, openStack, type Stack } from "./bench/stack";
import { photoUploadBudget } from "./bench/uploads";

const PARTS = ["board", "pages", "queries", "bundles", "lcp", "uploads", "clip"] as const;
type PartName = (typeof PARTS)[number];

function parseArgs(argv: string[]) {
  const known = new Set(["--json", "--reseed", "--no-build"]);
  let only: PartName[] = [...PARTS];
  for (const arg of argv) {
    if (arg.startsWith("--only=")) {
      const names = arg.slice(7).split(",").filter(Boolean);
      const bad = names.filter((n) => !(PARTS as readonly string[]).includes(n));
      if (bad.length || !names.length) throw new Error(`--only takes a list of ${PARTS.join(", ")}; got "${arg.slice(7)}"`);
      only = names as PartName[];
    } else if (!known.has(arg)) throw new Error(`unknown argument "${arg}"; use --json, --reseed, --no-build, --only=${PARTS.join(",")}`);
  }
  return { json: argv.includes("--json"), reseed: argv.includes("--reseed"), build: !argv.includes("--no-build"), only };
}

async function main(): Promise<void> {
  const args = parseArgs(process.argv.slice(2));
  // With --json, progress goes to stderr so stdout ends with the JSON alone.
  const log = (line: string) => (args.json ? process.stderr : process.stdout).write(`[bench] ${line}\n`);
  const needsApp = args.only.some((p) => p === "pages" || p === "queries" || p === "lcp" || p === "uploads");
  const needsBuild = needsApp || args.only.includes("bundles");
  const needsDb = needsApp || args.only.includes("board");
  let stack: Stack | null = null;
  const budgets: Budget[] = [];
  const text: string[] = [];
  const errors: string[] = [];
  const onSignal = () => void (stack?.stop() ?? Promise.resolve()).finally(() => process.exit(130));
  process.once("SIGINT", onSignal);
  process.once("SIGTERM", onSignal);
  try {
    let data: Awaited<ReturnType<typeof seedBench>> | null = null;
    if (needsDb || needsBuild) {
      stack = await openStack(log);
      if (args.reseed) {
        log(`dropping ${DB_NAME} to seed it again`);
        stack.adminSql(`DROP DATABASE IF EXISTS \`${DB_NAME}\`; CREATE DATABASE \`${DB_NAME}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;`);
        fs.rmSync(stack.env.STORAGE_DIR!, { recursive: true, force: true }); // the photos of the dropped rows
      }
      await stack.exec("migrate", ["--import", "tsx", "db/cli.ts", "migrate"]);
      await stack.exec("seed-demo", ["--import", "tsx", "db/cli.ts", "seed-if-empty"]);
      log("seeding the bench data (reused when complete; the first time takes minutes)");
      const k = knex({ ...knexConfig(stack.databaseUrl), pool: { min: 0, max: 2 } });
      try {
        data = await seedBench(k, stack.env.STORAGE_DIR!, log);
      } finally {
        await k.destroy();
      }
    }
    if (needsBuild && stack) {
      if (args.build) {
        log(`building the app into ${DIST} (next build)`);
        await stack.exec("build", ["node_modules/next/dist/bin/next", "build"]);
      }
      if (needsApp) {
        log("starting the app and the fakes");
        await stack.startServices();
      }
    }
    const parts: Record<PartName, () => Promise<Part>> = {
      board: () => boardBudgets(stack!, data!, log),
      pages: () => pageBudgets(stack!, data!, log),
      queries: () => timelineQueryBudget(stack!, data!, log),
      bundles: () => firstLoadBudgets(log),
      lcp: () => storyLcpBudget(stack!, log),
      uploads: () => photoUploadBudget(stack!, data!, log),
      clip: async () => {
        log("clip upload: video fake against a raw loopback copy");
        return clipUploadBudget();
      },
    };
    // A part that breaks is reported and the others still run; the run then exits 2.
    for (const name of args.only) {
      try {
        const part = await parts[name]();
        budgets.push(...part.budgets);
        text.push("", ...part.lines);
      } catch (error) {
        const message = error instanceof Error ? error.message : String(error);
        errors.push(`${name}: ${message}`);
        log(`part "${name}" failed: ${message}`);
      }
    }
  } finally {
    process.off("SIGINT", onSignal);
    process.off("SIGTERM", onSignal);
    await stack?.stop();
  }
  const missed = budgets.filter((b) => !b.pass);
  if (!args.json) {
    for (const line of text) console.log(line);
    console.log("");
  }
  printBudgets(budgets, args.json ? process.stderr : process.stdout);
  const out = args.json ? process.stderr : process.stdout;
  out.write(missed.length === 0 ? "\nAll budgets measured were met.\n" : `\n${missed.length} of ${budgets.length} budget(s) missed.\n`);
  for (const error of errors) out.write(`NOT MEASURED, the part failed: ${error}\n`);
  if (args.json) process.stdout.write(`${JSON.stringify(errors.length ? { budgets, errors } : { budgets })}\n`);
  process.exitCode = errors.length ? 2 : missed.length === 0 ? 0 : 1;
}

main().catch((error: unknown) => {
  console.error(`bench: ${error instanceof Error ? (error.stack ?? error.message) : String(error)}`);
  process.exitCode = 2;
});
