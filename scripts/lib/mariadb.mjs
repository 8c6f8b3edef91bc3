// A private MariaDB per data folder: initialised, started on loopback, provisioned, stopped.
import { spawn, spawnSync } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { ROOT, SetupError, assertPortFree, isAlive, isRoot, say, sleep } from "./setup.mjs";

// A Unix socket path may hold at most 107 bytes; a deeply nested checkout would exceed it.
function socketPath(dir) {
  const inside = path.join(dir, "mariadb.sock");
  if (Buffer.byteLength(inside) <= 100) return inside;
  return path.join(os.tmpdir(), `benchside-${crypto.createHash("sha256").update(dir).digest("hex").slice(0, 12)}.sock`);
}

export function mariadbPaths(dir) {
  return {
    datadir: path.join(dir, "mariadb"),
    socket: socketPath(dir),
    pidFile: path.join(dir, "mariadb.pid"),
    errorLog: path.join(dir, "mariadb.err"),
  };
}

const osUser = () => os.userInfo().username;

/** Runs SQL as the data folder's administrator, over the socket (no password exists for it). */
export function adminSql(dir, sql) {
  const { socket } = mariadbPaths(dir);
  const result = spawnSync("mariadb", ["--no-defaults", `--socket=${socket}`, `--user=${osUser()}`, "--batch"], {
    input: sql,
    encoding: "utf8",
  });
  if (result.status !== 0) throw new Error(`MariaDB refused: ${result.stderr.trim()}`);
  return result.stdout;
}

function mariadbAnswers(dir) {
  try {
    adminSql(dir, "SELECT 1;");
    return true;
  } catch {
    return false;
  }
}

/** Starts a private mariadbd on 127.0.0.1:port with its files in `dir` (or finds it already up); stop it with stopMariadb. */
export async function startMariadb(dir, port) {
  const p = mariadbPaths(dir);
  fs.mkdirSync(dir, { recursive: true });
  if (fs.existsSync(p.pidFile)) {
    const pid = Number(fs.readFileSync(p.pidFile, "utf8"));
    if (pid && isAlive(pid) && mariadbAnswers(dir)) {
      say("db", `MariaDB already running for ${path.relative(ROOT, dir)} (process ${pid})`);
      return;
    }
  }
  if (!fs.existsSync(path.join(p.datadir, "mysql"))) {
    say("db", `creating a MariaDB data folder in ${path.relative(ROOT, p.datadir)}`);
    const init = spawnSync(
      "mariadb-install-db",
      ["--no-defaults", `--user=${osUser()}`, `--datadir=${p.datadir}`, "--auth-root-authentication-method=socket", "--skip-test-db"],
      { encoding: "utf8" },
    );
    if (init.status !== 0) {
      fs.rmSync(p.datadir, { recursive: true, force: true });
      throw new SetupError(`mariadb-install-db failed (${init.stderr.trim().split("\n").pop()}); fix that and try again.`);
    }
  }
  await assertPortFree(port, "the private MariaDB", "127.0.0.1");
  const args = [
    "--no-defaults",
    `--datadir=${p.datadir}`,
    `--socket=${p.socket}`,
    `--port=${port}`,
    "--bind-address=127.0.0.1",
    `--pid-file=${p.pidFile}`,
    `--log-error=${p.errorLog}`,
    "--skip-log-bin",
    "--skip-name-resolve",
    "--character-set-server=utf8mb4",
    "--collation-server=utf8mb4_unicode_ci",
    "--default-time-zone=+00:00",
    "--innodb-buffer-pool-size=128M",
  ];
  if (isRoot()) args.push("--user=root");
  const child = spawn("/usr/sbin/mariadbd", args, { detached: true, stdio: "ignore" });
  child.unref();
  let exited = false;
  child.on("exit", () => (exited = true));
  for (let i = 0; i < 120; i++) {
    if (mariadbAnswers(dir)) {
      say("db", `MariaDB listening on 127.0.0.1:${port}`);
      return;
    }
    if (exited) break;
    await sleep(500);
  }
  const tail = fs.existsSync(p.errorLog) ? fs.readFileSync(p.errorLog, "utf8").trim().split("\n").slice(-3).join(" | ") : "";
  throw new SetupError(`MariaDB did not start on port ${port}; see ${p.errorLog}: ${tail}`);
}

/** Resolves once the server of this data folder is no longer running (checked every second). */
export async function waitForMariadbExit(dir, everyMs = 1000) {
  const { pidFile } = mariadbPaths(dir);
  const readPid = () => {
    try {
      return Number(fs.readFileSync(pidFile, "utf8")) || null;
    } catch {
      return null;
    }
  };
  const pid = readPid();
  for (;;) {
    if (!pid || !isAlive(pid)) return;
    await new Promise((r) => setTimeout(r, everyMs));
  }
}

export async function stopMariadb(dir) {
  const { pidFile } = mariadbPaths(dir);
  if (!fs.existsSync(pidFile)) return;
  const pid = Number(fs.readFileSync(pidFile, "utf8"));
  if (!pid || !isAlive(pid)) return;
  process.kill(pid, "SIGTERM");
  for (let i = 0; i < 120 && isAlive(pid); i++) await sleep(250);
  if (isAlive(pid)) {
    // 30 s is far beyond a clean InnoDB shutdown here; don't leave a server behind.
    process.kill(pid, "SIGKILL");
    say("db", "MariaDB did not stop in 30 s and was killed; it will recover its files at the next start");
  } else {
    say("db", "MariaDB stopped");
  }
}

const quote = (s) => `'${String(s).replace(/\\/g, "\\\\").replace(/'/g, "\\'")}'`;

/** Creates the application user (never root) with rights on the given databases or name patterns. */
export function provisionDatabase(dir, { databases = [], grantPatterns = [], user, password }) {
  const who = `${quote(user)}@'127.0.0.1'`;
  const sql = [
    ...databases.map((db) => `CREATE DATABASE IF NOT EXISTS \`${db}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;`),
    `CREATE USER IF NOT EXISTS ${who} IDENTIFIED BY ${quote(password)};`,
    `ALTER USER ${who} IDENTIFIED BY ${quote(password)};`,
    ...[...databases.map((db) => `\`${db}\``), ...grantPatterns].map((target) => `GRANT ALL PRIVILEGES ON ${target}.* TO ${who};`),
  ].join("\n");
  adminSql(dir, sql);
}
