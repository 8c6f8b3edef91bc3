// A fake's state in one JSON file (`state.json`, rewritten atomically), reloaded at start so `npm start`
// survives restarts, with the log of webhook deliveries kept in it. Each fake's store says what it keeps
// (`snapshot`) and how to take it back (`restore`).
import { randomBytes } from "node:crypto";
import { mkdir, readFile, rename, writeFile } from "node:fs/promises";
import path from "node:path";
import type { BaseDelivery } from "./webhooks";

const STATE_FILE = "state.json";
/** Keeps the delivery log (a test aid) from growing without bound in a long dev session. */
const MAX_DELIVERIES = 1000;
const ALPHANUMERIC = "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789";

/** Alphanumeric like the hosted services' ids, so ids survive being put in URLs unescaped. */
export function randomAlphanumeric(length: number): string {
  let out = "";
  while (out.length < length) {
    for (const byte of randomBytes(length)) {
      // 248 = 4 × 62: rejecting the rest keeps every character equally likely.
      if (byte < 248 && out.length < length) out += ALPHANUMERIC[byte % 62];
    }
  }
  return out;
}

export const isObject = (value: unknown): value is Record<string, unknown> => typeof value === "object" && value !== null && !Array.isArray(value);

export abstract class JsonStateStore<D extends BaseDelivery> {
  deliveries: D[] = [];
  /** "video fake", for warnings. */
  protected abstract readonly label: string;
  private chain: Promise<void> = Promise.resolve();
  private queued: Promise<void> | null = null;

  constructor(readonly dir: string) {}

  /** The store kept in `dir`, with what the last run left there. */
  static open<S extends JsonStateStore<BaseDelivery>>(this: new (dir: string) => S, dir: string): Promise<S> {
    return new this(dir).load();
  }

  /** Everything but the version, in the order the file lists it. */
  protected abstract snapshot(): Record<string, unknown>;
  /** Takes back a version-1 state file's contents; unknown or malformed rows are skipped. */
  protected abstract restore(state: Record<string, unknown>): void | Promise<void>;

  /** Folders the store needs; the fake's dir by default. */
  protected async makeFolders(): Promise<void> {
    await mkdir(this.dir, { recursive: true });
  }

  private async load(): Promise<this> {
    await this.makeFolders();
    const file = path.join(this.dir, STATE_FILE);
    let parsed: unknown;
    try {
      parsed = JSON.parse(await readFile(file, "utf8"));
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code === "ENOENT") return this;
      // Keep the bad file for a human to look at, and start empty rather than refuse to run.
      const aside = `${file}.unreadable-${Date.now()}`;
      await rename(file, aside).catch(() => undefined);
      console.warn(`${this.label}: ${STATE_FILE} was unreadable; moved it to ${aside} and started empty`);
      return this;
    }
    if (!isObject(parsed) || parsed.version !== 1) {
      console.warn(`${this.label}: ${STATE_FILE} is not a ${this.label} state file; starting empty`);
      return this;
    }
    await this.restore(parsed);
    return this;
  }

  addDelivery(delivery: D): void {
    this.deliveries.push(delivery);
    let excess = this.deliveries.length - MAX_DELIVERIES;
    // Settled deliveries go first; pending ones still have retries scheduled.
    if (excess > 0) this.deliveries = this.deliveries.filter((d) => excess <= 0 || d.state === "pending" || excess-- <= 0);
  }

  /** Coalesces bursts: a save requested while another is queued shares that write. */
  save(): Promise<void> {
    if (this.queued) return this.queued;
    const next = this.chain.then(() => {
      this.queued = null;
      return this.writeNow();
    });
    this.queued = next;
    this.chain = next.catch(() => undefined);
    return next;
  }

  private async writeNow(): Promise<void> {
    const file = path.join(this.dir, STATE_FILE);
    // Write-then-rename so a crash never leaves a truncated state file.
    await writeFile(`${file}.tmp`, `${JSON.stringify({ version: 1, ...this.snapshot() }, null, 1)}\n`, "utf8");
    await rename(`${file}.tmp`, file);
  }
}
