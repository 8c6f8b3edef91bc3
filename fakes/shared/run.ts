import { realpathSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";

// What every fake's server.ts does when run as a process (npm start, npm test): read its port,
// start, and close cleanly on Ctrl-C or SIGTERM. Imported as a library (tests), it does nothing.

/** The port in `name` (or the fallback), or a clear error. */
export function portFromEnv(name: string, fallback: number): number {
  const raw = process.env[name] ?? String(fallback);
  const port = Number(raw);
  if (!Number.isInteger(port) || port < 0 || port > 65535) throw new Error(`${name} must be a port number, got "${raw}"`);
  return port;
}

/** Where a fake run as a process listens and keeps its files: `${prefix}_PORT`, `${prefix}_DIR` (default .data/dev/<folder>). */
export function serverEnv(prefix: string, fallbackPort: number, folder: string): { port: number; dir: string } {
  return { port: portFromEnv(`${prefix}_PORT`, fallbackPort), dir: process.env[`${prefix}_DIR`] || path.join(".data", "dev", folder) };
}

/**
 * Runs `start` when the module at `moduleUrl` is the process's entry point, and closes what it
 * started once on SIGINT/SIGTERM.
 */
export function runIfMain(moduleUrl: string, label: string, start: () => Promise<{ close(): Promise<void> }>): void {
  if (!isEntry(moduleUrl)) return;
  start().then(
    (fake) => {
      let stopping = false;
      const stop = () => {
        if (stopping) return;
        stopping = true;
        fake.close().then(
          () => process.exit(0),
          (error: unknown) => {
            console.error(`${label}: error while closing`, error);
            process.exit(1);
          },
        );
      };
      process.on("SIGINT", stop);
      process.on("SIGTERM", stop);
    },
    (error: unknown) => {
      console.error(error instanceof Error ? error.message : error);
      process.exit(1);
    },
  );
}

function isEntry(moduleUrl: string): boolean {
  const entry = process.argv[1];
  if (!entry) return false;
  try {
    return realpathSync(path.resolve(entry)) === realpathSync(fileURLToPath(moduleUrl));
  } catch {
    return false;
  }
}
