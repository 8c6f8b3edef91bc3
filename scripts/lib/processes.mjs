// Child processes of a run (app, fakes, test runners) and the run itself.
import { spawn } from "node:child_process";
import { ROOT, SetupError, acquireLock, say, sleep } from "./setup.mjs";
import { startMariadb, stopMariadb, waitForMariadbExit } from "./mariadb.mjs";
import { Restarter } from "./restart.mjs";

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
  // A command that can't be spawned at all reports 'error' (and maybe no 'exit'): one ending either way.
  let ended = false;
  const end = (code, signal, error) => {
    if (ended) return;
    ended = true;
    children.delete(child);
    onExit?.(code, signal, error);
  };
  child.on("exit", (code, signal) => end(code, signal));
  child.on("error", (error) => end(null, null, error));
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

// ---------------------------------------------------------------- one run

/**
 * One `npm start` / `npm test` run: holds the data folder's lock and the MariaDB it
 * started, and on Ctrl-C, failure or `stop()` takes down everything it started.
 */
export class Run {
  #releaseLock = null;
  #stopDb = null;
  #restarters = [];
  #atStop = [];
  stopping = false;

  /**
   * `restart: true` (npm start): a service that dies on its own is started again with back-off
   * (scripts/lib/restart.mjs). Without it (npm test) one dying service stops the whole run, so a
   * test never runs against half a set-up.
   */
  constructor(tag, { restart = false } = {}) {
    this.tag = tag;
    this.restart = restart;
    process.on("SIGINT", () => void this.stop(130));
    process.on("SIGTERM", () => void this.stop(143));
  }

  /** Also undone on stop, after the services: servers this run started outside startDb (the cluster's Galera nodes). */
  atStop(undo) {
    this.#atStop.push(undo);
  }

  lock(dir, what) {
    this.#releaseLock = acquireLock(dir, what);
  }

  async startDb(dir, port) {
    // Known before the server answers, so a Ctrl-C during start-up still stops it.
    this.#stopDb = () => stopMariadb(dir);
    await startMariadb(dir, port);
    if (!this.restart) return;
    // Already up: the first round only watches it; later rounds start it again.
    let first = true;
    this.#restarters.push(
      new Restarter({
        name: "MariaDB",
        start: async () => {
          if (!first) await startMariadb(dir, port);
          first = false;
          await waitForMariadbExit(dir);
          return { reason: "its process is gone" };
        },
      }),
    );
  }

  /**
   * A long-running helper. Under `restart` it is started again when it dies on its own; otherwise
   * its death stops the whole run (nothing half-up).
   */
  serve(name, command, args, env) {
    if (this.restart) {
      const restarter = new Restarter({
        name,
        start: () => new Promise((resolve) => startService(name, command, args, env, { onExit: (code, signal, error) => resolve({ code, signal, error }) })),
      });
      this.#restarters.push(restarter);
      return restarter;
    }
    return startService(name, command, args, env, {
      onExit: (code, signal, error) => {
        if (this.stopping) return;
        console.error(`${name} stopped unexpectedly (${error ? error.message : `exit ${code}`}); stopping everything.`);
        void this.stop(1);
      },
    });
  }

  async stop(code) {
    if (this.stopping) return;
    this.stopping = true;
    // First no more restarts, then everything this run started.
    for (const restarter of this.#restarters) restarter.stop();
    if (this.#releaseLock) say(this.tag, "stopping…");
    await stopServices();
    for (const undo of this.#atStop) await undo().catch((error) => console.error(error));
    await this.#stopDb?.();
    this.#releaseLock?.();
    process.exit(code);
  }

  /** Runs `main`; a SetupError is shown as its one sentence, anything else in full. */
  go(main) {
    main().catch(async (error) => {
      // After Ctrl-C, steps fail because their processes were stopped: that is not news.
      if (this.stopping) return;
      console.error(error instanceof SetupError ? `\n${error.message}\n` : error);
      await this.stop(1);
    });
  }
}
