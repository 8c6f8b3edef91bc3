// The checks about the database under the app: what Galera does to concurrent writers (certification
// conflicts as deadlock errors, retried by transaction()), primary keys, SKIP LOCKED claims over
// several nodes, and a node killed while the app writes.
import { spawn } from "node:child_process";
import knex, { type Knex } from "knex";
import { knexConfig } from "@/db/config";
import { enqueueMail } from "@/db/queries/outbox";
import { isLockConflict, transaction } from "@/db/transaction";
import { type Check, type Ctx, checkIn, someMachine } from "./checks-app";
import { sleep } from "./http";

/** DATABASE_URL with HAProxy's port swapped for one node's own. */
export const nodeUrl = (port: number) => {
  const url = new URL(process.env.DATABASE_URL!);
  url.port = String(port);
  return url.toString();
};
export const connect = (url: string, max = 4) => knex({ ...knexConfig(url), pool: { min: 0, max } });

export async function everyTableHasPrimaryKey(k: Knex): Promise<Check> {
  const [rows] = (await k.raw(
    `SELECT t.table_name AS name FROM information_schema.tables t
     LEFT JOIN information_schema.table_constraints c ON c.table_schema = t.table_schema AND c.table_name = t.table_name AND c.constraint_type = 'PRIMARY KEY'
     WHERE t.table_schema = DATABASE() AND t.table_type = 'BASE TABLE' AND c.constraint_name IS NULL`,
  )) as [{ name: string }[]];
  const [[{ n }]] = (await k.raw("SELECT COUNT(*) AS n FROM information_schema.tables WHERE table_schema = DATABASE() AND table_type = 'BASE TABLE'")) as [[{ n: number }]];
  return { name: "every table has a primary key (Galera replicates rows by it)", pass: rows.length === 0, detail: rows.length ? `without one: ${rows.map((r) => r.name).join(", ")}` : `${n} tables, all with a primary key` };
}

const PROBE = "cluster_check_probe";

/**
 * Two writers on two nodes change one row: the later commit fails certification, and MariaDB
 * reports it as a deadlock (1213), which transaction() retries. Then 30 transaction() calls on
 * node 1 (through HAProxy) race 30 writes on node 2 to the same row: all must land.
 */
export async function certificationConflictsRetried(k: Knex, nodes: number[]): Promise<Check> {
  const name = "Galera certification conflicts arrive as deadlock 1213 and transaction() retries them";
  const one = connect(nodeUrl(nodes[0]!));
  const two = connect(nodeUrl(nodes[1]!));
  const warn = console.warn;
  let retries = 0;
  try {
    await k.schema.dropTableIfExists(PROBE);
    await k.schema.createTable(PROBE, (t) => {
      t.integer("id").primary();
      t.integer("n").notNullable();
    });
    await k(PROBE).insert({ id: 1, n: 0 });
    await sleep(500); // replicated to node 2
    let conflict: unknown = null;
    const tx1 = await one.transaction();
    await tx1(PROBE).where({ id: 1 }).update({ n: one.raw("n + 1") });
    await two(PROBE).where({ id: 1 }).update({ n: two.raw("n + 1") }); // commits first, on node 2
    // knex reports a failed COMMIT of a handler-less transaction through executionPromise.
    await tx1.commit().catch(() => undefined);
    await tx1.executionPromise.catch((error: unknown) => (conflict = error));
    const e = conflict as { errno?: number; code?: string; message?: string } | null;
    console.warn = (...args: unknown[]) => {
      if (String(args[0]).includes("lost a lock conflict")) retries += 1;
      else warn(...args);
    };
    const start = Number((await two(PROBE).where({ id: 1 }).first("n"))!.n);
    const outcomes = await Promise.allSettled([
      ...Array.from({ length: 30 }, () => transaction(async (tx) => tx(PROBE).where({ id: 1 }).update({ n: tx.raw("n + 1") }))),
      ...Array.from({ length: 30 }, () => two(PROBE).where({ id: 1 }).update({ n: two.raw("n + 1") })),
    ]);
    await sleep(500);
    const end = Number((await k(PROBE).where({ id: 1 }).first("n"))!.n);
    const failed = outcomes.filter((o) => o.status === "rejected").map((o) => ((o as PromiseRejectedResult).reason as Error).message.slice(0, 80));
    const pass = e?.errno === 1213 && isLockConflict(e) && failed.length === 0 && end === start + 60;
    return {
      name,
      pass,
      detail: `conflicting commit on node 1: ${e ? `errno ${e.errno} ${e.code}` : "no error (no conflict seen)"}, isLockConflict ${isLockConflict(e)}; 60 racing increments: ${failed.length} failed${failed.length ? ` (${[...new Set(failed)].join(" | ")})` : ""}, counter +${end - start}, ${retries} retries by transaction()`,
    };
  } finally {
    console.warn = warn;
    await k.schema.dropTableIfExists(PROBE).catch(() => undefined);
    await Promise.all([one.destroy(), two.destroy()]);
  }
}

/**
 * 200 queued mails, the cluster's two workers (through HAProxy) and a third writing through
 * node 2 directly, so SKIP LOCKED claims race on two nodes: every mail sent, each claimed once
 * (attempts = 1: a second claim would count), one message each in the mailbox.
 */
export async function mailsSentOnce(k: Knex, node2Port: number, count = 200): Promise<Check> {
  const name = `workers over ${count} queued mails: each sent exactly once`;
  const run = `cluster-${Date.now().toString(36)}`;
  const ids: number[] = [];
  for (let i = 0; i < count; i += 20) {
    await k.transaction(async (tx) => {
      for (let j = i; j < Math.min(count, i + 20); j++) ids.push(await enqueueMail(tx, { shopId: null, kind: "cluster_check", to: `cluster.${j}@mail.test`, subject: `Cluster check ${run} #${j}`, html: `<p>${j}</p>`, text: `${j}` }));
    });
  }
  const third = spawn(process.execPath, ["node_modules/tsx/dist/cli.mjs", "--tsconfig", "tsconfig.worker.json", "scripts/outbox-worker.ts"], {
    env: { ...process.env, DATABASE_URL: nodeUrl(node2Port), OUTBOX_POLL_MS: "300" },
    stdio: "ignore",
  });
  try {
    const deadline = Date.now() + 120_000;
    let rows: { id: number; state: string; attempts: number }[] = [];
    while (Date.now() < deadline) {
      rows = await k("outbox").whereIn("id", ids).select("id", "state", "attempts");
      if (rows.every((r) => r.state === "sent" || r.state === "dead")) break;
      await sleep(1000);
    }
    const res = await fetch(`${process.env.RESEND_BASE_URL}/_fake/messages`);
    const messages = ((await res.json()) as { data: { subject: string }[] }).data.filter((m) => m.subject.startsWith(`Cluster check ${run} #`));
    const perSubject = new Map<string, number>();
    for (const m of messages) perSubject.set(m.subject, (perSubject.get(m.subject) ?? 0) + 1);
    const sent = rows.filter((r) => r.state === "sent").length;
    const reclaimed = rows.filter((r) => Number(r.attempts) !== 1).length;
    const twice = [...perSubject.values()].filter((n) => n > 1).length;
    const pass = sent === count && reclaimed === 0 && perSubject.size === count && twice === 0;
    return { name, pass, detail: `${sent}/${count} sent; ${reclaimed} claimed more than once; ${perSubject.size} distinct in the mailbox, ${twice} there twice (3 workers: 2 through HAProxy, 1 on node 2)` };
  } finally {
    third.kill("SIGTERM");
  }
}

/**
 * Check-ins through HAProxy while node 1 (the one taking writes) is SIGKILLed: every check-in
 * the app acknowledged (redirected to its job) must be on the surviving nodes, and the app must
 * answer again through nodes 2 and 3 (HAProxy moves the database connections to a backup).
 */
export async function nodeKilledMidRun(ctx: Ctx, killNode: () => Promise<void>, survivors: number[], { seconds = 25, killAfter = 5, writers = 6 } = {}): Promise<Check> {
  const name = "one Galera node killed mid-run: no acknowledged write lost, the app keeps answering";
  const machine = await someMachine(ctx);
  const acknowledged: number[] = [];
  const failures: { at: number; what: string }[] = [];
  let killedAt = Infinity;
  const until = Date.now() + seconds * 1000;
  const writer = async (w: number) => {
    for (let i = 0; Date.now() < until; i++) {
      try {
        const { answer, number } = await checkIn(ctx, machine, `Cluster check: writer ${w} #${i} while a node dies`);
        if (number != null) acknowledged.push(number);
        else failures.push({ at: Date.now(), what: `HTTP ${answer.status} ${answer.message ?? ""}`.trim() });
      } catch (error) {
        failures.push({ at: Date.now(), what: (error as Error).message.slice(0, 60) });
        await sleep(200);
      }
    }
  };
  const killer = (async () => {
    await sleep(killAfter * 1000);
    await killNode();
    killedAt = Date.now();
  })();
  await Promise.all([killer, ...Array.from({ length: writers }, (_, w) => writer(w))]);
  const afterKill = acknowledged.length;
  const lastFailure = failures.length ? Math.max(...failures.map((f) => f.at)) : null;
  const missing: Record<number, number[]> = {};
  for (const port of survivors) {
    const k = connect(nodeUrl(port), 1);
    try {
      const have = new Set((await k("jobs").where({ shop_id: ctx.shop.id }).whereIn("number", acknowledged).pluck("number")).map(Number));
      missing[port] = acknowledged.filter((n) => !have.has(n));
    } finally {
      await k.destroy();
    }
  }
  const lost = Object.values(missing).some((m) => m.length > 0);
  const recovered = lastFailure == null || lastFailure < until - 5000;
  const kinds = [...new Set(failures.map((f) => f.what))].slice(0, 4).join(" | ");
  return {
    name,
    pass: !lost && recovered && Number.isFinite(killedAt),
    detail: `${afterKill} check-ins acknowledged by ${writers} writers over ${seconds} s, node 1 killed after ${killAfter} s; missing on nodes ${Object.entries(missing).map(([p, m]) => `${p}: ${m.length}`).join(", ")}; ${failures.length} refused or failed${failures.length ? `, the last ${((lastFailure! - killedAt) / 1000).toFixed(1)} s after the kill (${kinds})` : ""}`,
  };
}
