// Set-up steps shared by `npm start` and `npm test`. Dependency-free on purpose:
// this code runs before `node_modules` exists.
import { spawnSync } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import net from "node:net";
import path from "node:path";
import { fileURLToPath } from "node:url";

export const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..", "..");

/** A set-up failure the user can fix; its message is one sentence saying what to run. */
export class SetupError extends Error {}

export function say(tag, message) {
  console.log(`\x1b[2m[${tag}]\x1b[0m ${message}`);
}

export const sleep = (ms) => new Promise((r) => setTimeout(r, ms));

export const isRoot = () => typeof process.getuid === "function" && process.getuid() === 0;

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
export const FFMPEG = { name: "ffmpeg", binaries: ["/usr/bin/ffmpeg", "/usr/bin/ffprobe"] };

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
  const known = fs.existsSync(file) ? JSON.parse(fs.readFileSync(file, "utf8")) : {};
  const wanted = {
    authSecret: () => crypto.randomBytes(32).toString("base64url"),
    dbPassword: () => crypto.randomBytes(18).toString("base64url"),
    videoTokenSecret: () => crypto.randomBytes(18).toString("base64url"),
    videoWebhookSecret: () => crypto.randomBytes(24).toString("base64url"),
    // Shaped like the hosted service's test keys; the payments fake accepts only sk_test_ keys.
    paymentsSecretKey: () => `sk_test_${crypto.randomBytes(18).toString("hex")}`,
    paymentsWebhookSecret: () => `whsec_${crypto.randomBytes(24).toString("hex")}`,
    // Standard Webhooks secret (whsec_ + base64 key) the mail service signs its webhooks with (replies by e-mail).
    mailWebhookSecret: () => `whsec_${crypto.randomBytes(24).toString("base64")}`,
    // Shaped like the SMS service's account sid (AC + 32 hex digits); the token signs its webhooks.
    smsAccountSid: () => `AC${crypto.randomBytes(16).toString("hex")}`,
    smsAuthToken: () => crypto.randomBytes(16).toString("hex"),
  };
  // A folder made before a secret existed gets just the missing ones; the others stay as they were.
  const missing = Object.keys(wanted).filter((key) => !known[key]);
  if (!missing.length) return known;
  const secrets = { ...known, ...Object.fromEntries(missing.map((key) => [key, wanted[key]()])) };
  fs.mkdirSync(dir, { recursive: true });
  fs.writeFileSync(file, JSON.stringify(secrets, null, 2), { mode: 0o600 });
  return secrets;
}

// ---------------------------------------------------------------- run lock

export const isAlive = (pid) => {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return error.code === "EPERM";
  }
};

/** Is this process still a Node run (and not an unrelated program that reused the number)? */
function isOurRun(pid) {
  if (!isAlive(pid)) return false;
  try {
    return fs.readFileSync(`/proc/${pid}/cmdline`, "utf8").includes("node");
  } catch {
    return true; // no /proc to ask: trust the lock
  }
}

/** Fails with one sentence when something already listens on the port we are about to use. */
export function assertPortFree(port, what, host) {
  return new Promise((resolve, reject) => {
    const probe = net.createServer();
    probe.once("error", (error) =>
      reject(
        error.code === "EADDRINUSE"
          ? new SetupError(`Port ${port}, needed for ${what}, is already in use; stop what is using it or pick another port (see .env.example).`)
          : error,
      ),
    );
    probe.listen({ port, host }, () => probe.close(() => resolve()));
  });
}

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
      if (holder.pid && isOurRun(holder.pid)) {
        throw new SetupError(
          `${what.label} is already running (process ${holder.pid}${holder.url ? `, ${holder.url}` : ""}); use that one or stop it with Ctrl-C first.`,
        );
      }
      fs.rmSync(file, { force: true }); // left behind by a run that was killed
    }
  }
  throw new SetupError(`Could not take the lock ${file}; remove it if no other run is going and try again.`);
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
