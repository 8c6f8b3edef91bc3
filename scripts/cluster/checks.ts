// `npm run cluster -- --test`: run by scripts/cluster.mjs once the cluster is up, with its
// environment. Drives the product through HAProxy and writes {"checks": [{name, pass, detail}]}
// to CLUSTER_REPORT (printed last by the orchestrator); exits 1 when a check failed. The
// destructive checks (a node, then an instance killed) come last.
import fs from "node:fs";
import path from "node:path";
import { pathToFileURL } from "node:url";
import { db } from "@/db/client";
import { oneDecisionFromManyAnswers } from "./checks-approval";
import { appInstanceKilled, type Check, concurrentCheckIns, openContext, photoCrossesInstances, sessionCrossesInstances, liveUpdateCrossesInstances } from "./checks-app";
import { certificationConflictsRetried, connect, everyTableHasPrimaryKey, mailsSentOnce, nodeKilledMidRun } from "./checks-db";
import { sleep } from "./http";

type Ports = { apps: number[]; nodes: { n: number; sql: number }[] };
type GaleraLib = {
  killNode(dir: string, n: number): Promise<void>;
  startNode(dir: string, nodes: unknown[], n: number): Promise<void>;
  wsrepStatus(dir: string, n: number): Record<string, string>;
};
const lib = async <T>(file: string) => (await import(pathToFileURL(path.resolve("scripts", "cluster", file)).href)) as T;

async function main() {
  const dir = process.env.CLUSTER_DIR!;
  const { clusterPorts } = await lib<{ clusterPorts(): Ports }>("config.mjs");
  const galera = await lib<GaleraLib>("galera.mjs");
  const ports = clusterPorts();
  const checks: Check[] = [];
  const k = connect(process.env.DATABASE_URL!, 4);
  // CLUSTER_CHECKS=session,photo runs only those (by the names below), e.g. while working on one.
  const only = process.env.CLUSTER_CHECKS?.split(",").map((s) => s.trim());
  const attempt = async (name: string, body: () => Promise<Check>) => {
    if (only && !only.includes(name)) return;
    process.stderr.write(`[checks] ${name}…\n`);
    try {
      checks.push(await body());
    } catch (error) {
      checks.push({ name, pass: false, detail: `could not run: ${(error as Error).message}` });
    }
    const last = checks.at(-1)!;
    process.stderr.write(`[checks] ${last.pass ? "pass" : "FAIL"}: ${last.detail}\n`);
  };
  try {
    const ctx = await openContext(k);
    await attempt("primary keys", () => everyTableHasPrimaryKey(k));
    await attempt("session", () => sessionCrossesInstances(ctx));
    await attempt("live update", () => liveUpdateCrossesInstances(ctx));
    await attempt("photo", () => photoCrossesInstances(ctx));
    await attempt("check-ins", () => concurrentCheckIns(ctx));
    await attempt("approval", () => oneDecisionFromManyAnswers(ctx));
    await attempt("certification", () => certificationConflictsRetried(k, [ports.nodes[0]!.sql, ports.nodes[1]!.sql]));
    await attempt("mail", () => mailsSentOnce(k, ports.nodes[1]!.sql));
    await attempt("galera node killed", () =>
      nodeKilledMidRun(ctx, () => galera.killNode(dir, 1), [ports.nodes[1]!.sql, ports.nodes[2]!.sql]),
    );
    // Node 1 comes back (incremental state transfer) before the last check.
    await attempt("node rejoins", async () => {
      await galera.startNode(dir, ports.nodes, 1);
      const status = galera.wsrepStatus(dir, 1);
      await sleep(3000); // HAProxy's rise 3 × 1 s: writes move back to node 1
      return { name: "the killed node rejoins and syncs", pass: status.wsrep_local_state_comment === "Synced" && status.wsrep_cluster_size === "3", detail: `node 1: ${status.wsrep_local_state_comment}, cluster size ${status.wsrep_cluster_size}` };
    });
    await attempt("app instance killed", () => appInstanceKilled(ctx, ports.apps[1]!));
  } finally {
    await k.destroy();
    await db().destroy();
  }
  const report = JSON.stringify({ checks });
  if (process.env.CLUSTER_REPORT) fs.writeFileSync(process.env.CLUSTER_REPORT, `${report}\n`);
  console.log(report);
  process.exit(checks.every((c) => c.pass) ? 0 : 1);
}

main().catch((error) => {
  console.error(error);
  process.exit(2);
});
