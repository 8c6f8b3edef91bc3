// Set-up steps shared by `npm start` and `npm test`. Dependency-free on purpose:
// this code runs before `node_modules` exists.
import { spawn, spawnSync } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";

export const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..", "..");

/** A set-up failure the user can fix; its message is one sentence saying what to run. */
export class SetupError extends Error {}

export function say(tag, message) {
  console.log(`\x1b[2m[${tag}]\x1b[0m ${message}`);
}

const isRoot = () => typeof process.getuid === "function" && process.getuid() === 0;

// ---------------------------------------------------------------- npm packages

/** True when every package the lockfile names (bar optional ones for other platforms) is installed at its locked version. */
function nodeModulesMatchLock() {
  const lockFile = path.join(ROOT, "package-lock.json");
  if (!fs.existsSync(path.join(ROOT, "node_modules"))) return false;
  const lock = JSON.parse(fs.readFileSync(lockFile, "utf8"));
  for (const [where, meta] of Object.entries(lock.packages ?? {})) {
    if (where === "" || meta.link) continue;
    const manifest = path.join(ROOT, where, "package.json");
    if (!fs.existsSync(manifest)) {
      if (meta.optional) continue;
      return false;
    }
    const installed = JSON.parse(fs.readFileSync(manifest, "utf8")).version;
    if (meta.version && installed !== meta.version) return false;
  }
  return true;
}

export function ensureNodeModules() {
  if (nodeModulesMatchLock()) return;
  say("setup", "installing npm packages (npm ci)…");
  const result = spawnSync("npm", ["ci", "--no-audit", "--no-fund"], { cwd: ROOT, stdio: "inherit" });
  if (result.status !== 0) {
    throw new SetupError("Installing npm packages failed; run `npm ci` in the project folder, fix what it reports, then try again.");
  }
}

// ------------------------------------------------------------ Debian packages

export const MARIADB = { name: "mariadb-server", binaries: ["/usr/sbin/mariadbd", "/usr/bin/mariadb-install-db", "/usr/bin/mariadb"] };
export const CHROMIUM = { name: "chromium", binaries: ["/usr/bin/chromium"] };

export function ensureDebianPackages(packages) {
  const missing = packages.filter((p) => p.binaries.some((b) => !fs.existsSync(b)));
  if (missing.length === 0) return;
  const names = missing.map((p) => p.name).join(" ");
  if (!fs.existsSync("/usr/bin/apt-get")) {
    throw new SetupError(`This machine lacks ${names} and has no apt-get; install ${names} with its package manager and try again.`);
  }
  if (!isRoot()) {
    throw new SetupError(`${names} is not installed; run \`sudo apt-get update && sudo apt-get install -y ${names}\` and try again.`);
  }
  say("setup", `installing ${names} from Debian (apt-get)…`);
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  const update = spawnSync("apt-get", ["update"], { stdio: "inherit", env });
  const install = spawnSync("apt-get", ["install", "-y", "--no-install-recommends", ...missing.map((p) => p.name)], { stdio: "inherit", env });
  if (update.status !== 0 || install.status !== 0 || missing.some((p) => p.binaries.some((b) => !fs.existsSync(b)))) {
    throw new SetupError(`Installing ${names} failed; run \`apt-get update && apt-get install -y ${names}\` as root, fix what it reports, then try again.`);
  }
}

// ---------------------------------------------------------------- secrets

/** Random secrets generated once per data folder, so restarts keep sessions and the database password. */
export function loadSecrets(dir) {
  const file = path.join(dir, "secrets.json");
  if (fs.existsSync(file)) return JSON.parse(fs.readFileSync(file, "utf8"));
  const secrets = {
    authSecret: crypto.randomBytes(32).toString("base64url"),
    dbPassword: crypto.randomBytes(18).toString("base64url"),
  };
  fs.mkdirSync(dir, { recursive: true });
  fs.writeFileSync(file, JSON.stringify(secrets, null, 2), { mode: 0o600 });
  return secrets;
}

// ---------------------------------------------------------------- run lock

const isAlive = (pid) => {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return error.code === "EPERM";
  }
};

/** One runner per data folder: a second `npm start` is told about the first instead of sharing its database files. */
export function acquireLock(dir, what) {
  fs.mkdirSync(dir, { recursive: true });
  const file = path.join(dir, "run.lock");
  for (let attempt = 0; attempt < 2; attempt++) {
    try {
      fs.writeFileSync(file, JSON.stringify({ pid: process.pid, ...what }), { flag: "wx" });
      return () => fs.rmSync(file, { force: true });
    } catch (error) {
      if (error.code !== "EEXIST") throw error;
      const holder = JSON.parse(fs.readFileSync(file, "utf8") || "{}");
      if (holder.pid && isAlive(holder.pid)) {
        throw new SetupError(
          `${what.label} is already running (process ${holder.pid}${holder.url ? `, ${holder.url}` : ""}); use that one or stop it with Ctrl-C first.`,
        );
      }
      fs.rmSync(file, { force: true }); // left behind by a run that was killed
    }
  }
  throw new SetupError(`Could not take the lock ${file}; remove it if no other run is going and try again.`);
}

// ---------------------------------------------------------------- MariaDB

const sleep = (ms) => new Promise((r) => setTimeout(r, ms));

export function mariadbPaths(dir) {
  return {
    datadir: path.join(dir, "mariadb"),
    socket: path.join(dir, "mariadb.sock"),
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

/** Starts a private mariadbd on 127.0.0.1:port with its files in `dir`; returns a stop function. */
export async function startMariadb(dir, port) {
  const p = mariadbPaths(dir);
  fs.mkdirSync(dir, { recursive: true });
  if (fs.existsSync(p.pidFile)) {
    const pid = Number(fs.readFileSync(p.pidFile, "utf8"));
    if (pid && isAlive(pid) && mariadbAnswers(dir)) {
      say("db", `MariaDB already running for ${path.relative(ROOT, dir)} (process ${pid})`);
      return async () => stopMariadb(dir);
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
      return async () => stopMariadb(dir);
    }
    if (exited) break;
    await sleep(500);
  }
  const tail = fs.existsSync(p.errorLog) ? fs.readFileSync(p.errorLog, "utf8").trim().split("\n").slice(-3).join(" | ") : "";
  throw new SetupError(`MariaDB did not start on port ${port} (is the port taken?); see ${p.errorLog}: ${tail}`);
}

export async function stopMariadb(dir) {
  const { pidFile } = mariadbPaths(dir);
  if (!fs.existsSync(pidFile)) return;
  const pid = Number(fs.readFileSync(pidFile, "utf8"));
  if (!pid || !isAlive(pid)) return;
  process.kill(pid, "SIGTERM");
  for (let i = 0; i < 120 && isAlive(pid); i++) await sleep(250);
  say("db", "MariaDB stopped");
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

// ---------------------------------------------------------------- child services

const children = new Set();

/** Starts a long-running helper in its own process group, its output prefixed with its name. */
export function startService(name, command, args, env, { onExit } = {}) {
  const child = spawn(command, args, { cwd: ROOT, env: { ...process.env, ...env }, detached: true, stdio: ["ignore", "pipe", "pipe"] });
  const prefix = (stream, out) => {
    let buffered = "";
    stream.on("data", (chunk) => {
      buffered += chunk;
      const lines = buffered.split("\n");
      buffered = lines.pop() ?? "";
      for (const line of lines) out.write(`\x1b[2m[${name}]\x1b[0m ${line}\n`);
    });
  };
  prefix(child.stdout, process.stdout);
  prefix(child.stderr, process.stderr);
  children.add(child);
  child.on("exit", (code, signal) => {
    children.delete(child);
    onExit?.(code, signal);
  });
  return child;
}

/** Runs a command to completion with inherited output; resolves with its exit code. */
export function run(command, args, env = {}) {
  return new Promise((resolve) => {
    const child = spawn(command, args, { cwd: ROOT, env: { ...process.env, ...env }, stdio: "inherit" });
    children.add(child);
    child.on("exit", (code, signal) => {
      children.delete(child);
      resolve(code ?? (signal ? 1 : 0));
    });
  });
}

export async function stopServices() {
  const waiting = [...children].map(
    (child) =>
      new Promise((resolve) => {
        if (child.exitCode !== null || child.signalCode !== null) return resolve();
        child.once("exit", resolve);
        try {
          process.kill(-child.pid, "SIGTERM");
        } catch {
          try {
            child.kill("SIGTERM");
          } catch {
            /* already gone */
          }
        }
        setTimeout(() => {
          try {
            process.kill(-child.pid, "SIGKILL");
          } catch {
            /* already gone */
          }
          resolve();
        }, 8000).unref();
      }),
  );
  await Promise.all(waiting);
}

export async function waitForHttp(url, { timeoutMs = 60_000, label = url } = {}) {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    try {
      const res = await fetch(url, { signal: AbortSignal.timeout(3000) });
      if (res.status < 500) return;
    } catch {
      /* not up yet */
    }
    await sleep(300);
  }
  throw new SetupError(`${label} did not answer within ${Math.round(timeoutMs / 1000)} s; see the log lines above.`);
}

/** Reads KEY=VALUE lines from a .env file (optional) so real service keys can be configured without code. */
export function readDotEnv(file = path.join(ROOT, ".env")) {
  if (!fs.existsSync(file)) return {};
  const out = {};
  for (const raw of fs.readFileSync(file, "utf8").split("\n")) {
    const line = raw.trim();
    if (!line || line.startsWith("#") || !line.includes("=")) continue;
    const at = line.indexOf("=");
    out[line.slice(0, at).trim()] = line.slice(at + 1).trim().replace(/^(['"])(.*)\1$/, "$2");
  }
  return out;
}

export const bin = {
  next: path.join(ROOT, "node_modules", "next", "dist", "bin", "next"),
  tsx: path.join(ROOT, "node_modules", "tsx", "dist", "cli.mjs"),
  vitest: path.join(ROOT, "node_modules", "vitest", "vitest.mjs"),
  playwright: path.join(ROOT, "node_modules", "@playwright", "test", "cli.js"),
  eslint: path.join(ROOT, "node_modules", "eslint", "bin", "eslint.js"),
};

// ---------------------------------------------------------------- one run

/**
 * One `npm start` / `npm test` run: holds the data folder's lock and the MariaDB it
 * started, and on Ctrl-C, failure or `stop()` takes down everything it started.
 */
export class Run {
  #releaseLock = null;
  #stopDb = null;
  stopping = false;

  constructor(tag) {
    this.tag = tag;
    process.on("SIGINT", () => void this.stop(130));
    process.on("SIGTERM", () => void this.stop(143));
  }

  lock(dir, what) {
    this.#releaseLock = acquireLock(dir, what);
  }

  async startDb(dir, port) {
    this.#stopDb = await startMariadb(dir, port);
  }

  async stop(code) {
    if (this.stopping) return;
    this.stopping = true;
    if (this.#releaseLock) say(this.tag, "stopping…");
    await stopServices();
    await this.#stopDb?.();
    this.#releaseLock?.();
    process.exit(code);
  }

  /** Runs `main`; a SetupError is shown as its one sentence, anything else in full. */
  go(main) {
    main().catch(async (error) => {
      console.error(error instanceof SetupError ? `\n${error.message}\n` : error);
      await this.stop(1);
    });
  }
}
