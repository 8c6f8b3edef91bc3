// Child processes of a run (app, fakes, test runners) and the run itself.
import { spawn } from "node:child_process";
import { ROOT, SetupError, acquireLock, say, sleep } from "./setup.mjs";
import { startMariadb, stopMariadb } from "./mariadb.mjs";

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
    // Known before the server answers, so a Ctrl-C during start-up still stops it.
    this.#stopDb = () => stopMariadb(dir);
    await startMariadb(dir, port);
  }

  /** A long-running helper; if it dies on its own, the whole run stops (nothing half-up). */
  serve(name, command, args, env) {
    return startService(name, command, args, env, {
      onExit: (code) => {
        if (this.stopping) return;
        console.error(`${name} stopped unexpectedly (exit ${code}); stopping everything.`);
        void this.stop(1);
      },
    });
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
      // After Ctrl-C, steps fail because their processes were stopped: that is not news.
      if (this.stopping) return;
      console.error(error instanceof SetupError ? `\n${error.message}\n` : error);
      await this.stop(1);
    });
  }
}
