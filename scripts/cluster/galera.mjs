// The three Galera nodes of `npm run cluster`: each a private mariadbd (scripts/lib/mariadb.mjs's
// layout: datadir, socket, pid file and error log in .data/cluster/nodeN) started from an option
// file of its own (config.mjs), node 1 bootstrapping the cluster, 2 and 3 joining it.
import { spawn, spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { SetupError, assertPortFree, isAlive, isRoot, say, sleep } from "../lib/setup.mjs";
import { adminSql, mariadbPaths, stopMariadb } from "../lib/mariadb.mjs";
import { galeraNodeConfig, nodeDir } from "./config.mjs";

export const GALERA = { name: "galera-4", binaries: ["/usr/lib/galera/libgalera_smm.so"] };
export const RSYNC = { name: "rsync", binaries: ["/usr/bin/rsync"] };

/** wsrep status variables of node n as a map ({} when it doesn't answer). */
export function wsrepStatus(clusterDir, n) {
  try {
    const out = adminSql(nodeDir(clusterDir, n), "SHOW GLOBAL STATUS LIKE 'wsrep_%';");
    return Object.fromEntries(
      out
        .trim()
        .split("\n")
        .slice(1)
        .map((line) => line.split("\t")),
    );
  } catch {
    return {};
  }
}

const pidOf = (clusterDir, n) => {
  try {
    return Number(fs.readFileSync(mariadbPaths(nodeDir(clusterDir, n)).pidFile, "utf8")) || null;
  } catch {
    return null;
  }
};

/**
 * As root, the nodes run as Debian's `mysql` user: the rsync daemon a joining node starts for its
 * state transfer drops root for `nobody` and could not write a root-owned data folder, while one
 * started by an unprivileged mariadbd keeps that user, who owns the folder.
 */
const runUser = () => (isRoot() ? "mysql" : os.userInfo().username);

function prepare(clusterDir, node, nodes) {
  const dir = nodeDir(clusterDir, node.n);
  const paths = mariadbPaths(dir);
  fs.mkdirSync(dir, { recursive: true });
  const cnf = path.join(dir, "my.cnf");
  fs.writeFileSync(cnf, galeraNodeConfig({ node, nodes, paths, user: runUser() }));
  if (!fs.existsSync(path.join(paths.datadir, "mysql"))) {
    // Nodes 2 and 3 get node 1's files by state transfer on their first join; an initialised
    // folder is only what mariadbd needs to start and ask for it.
    const init = spawnSync(
      "mariadb-install-db",
      ["--no-defaults", `--user=${runUser()}`, `--datadir=${paths.datadir}`, "--auth-root-authentication-method=socket", "--skip-test-db"],
      { encoding: "utf8" },
    );
    if (init.status !== 0) {
      fs.rmSync(paths.datadir, { recursive: true, force: true });
      throw new SetupError(`mariadb-install-db failed for node ${node.n} (${init.stderr.trim().split("\n").pop()}).`);
    }
  }
  if (isRoot()) spawnSync("chown", ["-R", `${runUser()}:`, dir]);
  return { dir, paths, cnf };
}

/**
 * The cluster is down and node 1 starts it again: Galera refuses to bootstrap from a node that
 * wasn't the last to leave (safe_to_bootstrap: 0) so as not to lose the others' newer commits.
 * Here every node stopped together (or the run was killed), and node 1 is the one we bootstrap.
 */
function allowBootstrap(datadir) {
  const file = path.join(datadir, "grastate.dat");
  if (!fs.existsSync(file)) return;
  fs.writeFileSync(file, fs.readFileSync(file, "utf8").replace(/safe_to_bootstrap:\s*0/, "safe_to_bootstrap: 1"));
}

/** Starts node n (bootstrapping a new cluster when `bootstrap`) and waits until it is Synced. */
export async function startNode(clusterDir, nodes, n, { bootstrap = false, timeoutMs = 180_000 } = {}) {
  const node = nodes.find((x) => x.n === n);
  const { paths, cnf } = prepare(clusterDir, node, nodes);
  const running = pidOf(clusterDir, n);
  if (running && isAlive(running) && wsrepStatus(clusterDir, n).wsrep_local_state_comment === "Synced") {
    say("galera", `node ${n} already running and synced (process ${running})`);
    return;
  }
  for (const [port, what] of [
    [node.sql, "SQL"],
    [node.gcomm, "replication"],
    [node.ist, "IST"],
    [node.sst, "SST"],
  ]) {
    await assertPortFree(port, `Galera node ${n} (${what})`, "127.0.0.1");
  }
  if (bootstrap) allowBootstrap(paths.datadir);
  const child = spawn("/usr/sbin/mariadbd", [`--defaults-file=${cnf}`, ...(bootstrap ? ["--wsrep-new-cluster"] : [])], { detached: true, stdio: "ignore" });
  child.unref();
  let exited = false;
  child.on("exit", () => (exited = true));
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline && !exited) {
    const status = wsrepStatus(clusterDir, n);
    if (status.wsrep_local_state_comment === "Synced" && status.wsrep_ready === "ON") {
      say("galera", `node ${n} synced on 127.0.0.1:${node.sql} (cluster size ${status.wsrep_cluster_size})`);
      return;
    }
    await sleep(500);
  }
  const tail = fs.existsSync(paths.errorLog) ? fs.readFileSync(paths.errorLog, "utf8").trim().split("\n").slice(-4).join(" | ") : "";
  throw new SetupError(`Galera node ${n} did not ${exited ? "stay up" : "sync in time"}; see ${paths.errorLog}: ${tail}`);
}

/** A clean stop (SIGTERM, waits for the process to end). */
export const stopNode = (clusterDir, n) => stopMariadb(nodeDir(clusterDir, n));

/** A crash: SIGKILL to node n's mariadbd; resolves once it is gone. */
export async function killNode(clusterDir, n) {
  const pid = pidOf(clusterDir, n);
  if (!pid || !isAlive(pid)) throw new Error(`node ${n} is not running`);
  process.kill(pid, "SIGKILL");
  for (let i = 0; i < 100 && isAlive(pid); i++) await sleep(100);
}

/** The whole cluster: node 1 bootstraps, 2 and 3 join (one at a time: each takes a state transfer). */
export async function startCluster(clusterDir, nodes) {
  await startNode(clusterDir, nodes, 1, { bootstrap: true });
  for (const node of nodes.slice(1)) await startNode(clusterDir, nodes, node.n);
}

/** Stops the nodes last to first, so node 1 leaves last and may bootstrap the next start. */
export async function stopCluster(clusterDir, nodes) {
  for (const node of [...nodes].reverse()) await stopNode(clusterDir, node.n);
}
