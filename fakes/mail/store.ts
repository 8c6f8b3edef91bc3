// The mailbox: one JSON file per message so a restart (or a human with `ls`) sees the same mail.
import { mkdir, readdir, readFile, rename, unlink, writeFile } from "node:fs/promises";
import path from "node:path";
import { isRecord } from "./message";
import type { MailMessage } from "./types";

const IDEMPOTENCY_WINDOW_MS = 24 * 60 * 60 * 1000;
const MESSAGE_FILE = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}\.json$/i;

export type IdempotencyRecord = {
  key: string;
  /** Hash of endpoint + body, to tell a retry from a different request reusing the key. */
  fingerprint: string;
  /** The exact response body to replay. */
  response: unknown;
  created_ms: number;
};

type Pending = { pending: true; created_ms: number };

/** What lives on disk; `meta` stays out of the public message shape. */
type StoredFile = {
  version: 1;
  seq: number;
  message: MailMessage;
  meta: { user_agent: string | null; idempotency: IdempotencyRecord | null };
};

type Entry = { seq: number; message: MailMessage };

function isStoredFile(value: unknown): value is StoredFile {
  if (!isRecord(value) || value.version !== 1 || typeof value.seq !== "number") return false;
  const { message, meta } = value;
  return isRecord(message) && typeof message.id === "string" && Array.isArray(message.to) && isRecord(meta);
}

export class Mailbox {
  private readonly dir: string;
  /** Oldest first; every listing reverses it, which is cheap at dev-mailbox sizes. */
  private entries: Entry[] = [];
  private readonly byId = new Map<string, Entry>();
  private readonly idempotency = new Map<string, IdempotencyRecord | Pending>();
  private nextSeq = 1;

  private constructor(dir: string) {
    this.dir = dir;
  }

  static async open(dir: string): Promise<Mailbox> {
    const box = new Mailbox(dir);
    await mkdir(dir, { recursive: true });
    await box.load();
    return box;
  }

  private async load(): Promise<void> {
    const names = (await readdir(this.dir)).filter((name) => MESSAGE_FILE.test(name));
    const now = Date.now();
    for (const name of names) {
      let parsed: unknown;
      try {
        parsed = JSON.parse(await readFile(path.join(this.dir, name), "utf8"));
      } catch {
        // A half-written or hand-edited file must not stop the fake from starting.
        console.warn(`mail fake: skipping unreadable ${name}`);
        continue;
      }
      if (!isStoredFile(parsed) || `${parsed.message.id}.json`.toLowerCase() !== name.toLowerCase()) {
        console.warn(`mail fake: skipping ${name}, not a mail fake message file`);
        continue;
      }
      const entry = { seq: parsed.seq, message: parsed.message };
      this.entries.push(entry);
      this.byId.set(entry.message.id, entry);
      this.nextSeq = Math.max(this.nextSeq, entry.seq + 1);
      const record = parsed.meta.idempotency;
      // Restoring keys keeps retries across a restart from sending twice, as the hosted API would.
      if (record && now - record.created_ms < IDEMPOTENCY_WINDOW_MS && !this.idempotency.has(record.key)) {
        this.idempotency.set(record.key, record);
      }
    }
    this.entries.sort((a, b) => a.seq - b.seq);
  }

  /** Newest first. */
  list(): MailMessage[] {
    return this.entries.map((entry) => entry.message).reverse();
  }

  get(id: string): MailMessage | undefined {
    return this.byId.get(id)?.message;
  }

  get size(): number {
    return this.entries.length;
  }

  lookupIdempotent(key: string): IdempotencyRecord | Pending | undefined {
    const record = this.idempotency.get(key);
    if (record && Date.now() - record.created_ms >= IDEMPOTENCY_WINDOW_MS) {
      this.idempotency.delete(key);
      return undefined;
    }
    return record;
  }

  /** Claims the key while the first request is still being written, so a parallel retry gets a 409. */
  beginIdempotent(key: string): void {
    this.idempotency.set(key, { pending: true, created_ms: Date.now() });
  }

  abandonIdempotent(key: string): void {
    const record = this.idempotency.get(key);
    if (record && "pending" in record) this.idempotency.delete(key);
  }

  /** Writes every message before any becomes visible, so a failed write never leaves half a batch listed. */
  async add(messages: MailMessage[], meta: StoredFile["meta"]): Promise<void> {
    const entries = messages.map((message) => ({ seq: this.nextSeq++, message }));
    const written: string[] = [];
    try {
      for (const entry of entries) {
        const file = path.join(this.dir, `${entry.message.id}.json`);
        const body: StoredFile = { version: 1, seq: entry.seq, message: entry.message, meta };
        // Write-then-rename so a crash never leaves a truncated message file behind.
        await writeFile(`${file}.tmp`, `${JSON.stringify(body, null, 2)}\n`, "utf8");
        await rename(`${file}.tmp`, file);
        written.push(file);
      }
    } catch (error) {
      await Promise.all(written.map((file) => unlink(file).catch(() => undefined)));
      throw error;
    }
    for (const entry of entries) {
      this.entries.push(entry);
      this.byId.set(entry.message.id, entry);
    }
    if (meta.idempotency) this.idempotency.set(meta.idempotency.key, meta.idempotency);
  }

  /** Empties memory and disk; only files that look like ours are removed. */
  async clear(): Promise<number> {
    const count = this.entries.length;
    this.entries = [];
    this.byId.clear();
    this.idempotency.clear();
    const names = (await readdir(this.dir)).filter((name) => MESSAGE_FILE.test(name) || /\.json\.tmp$/.test(name));
    await Promise.all(names.map((name) => unlink(path.join(this.dir, name)).catch(() => undefined)));
    return count;
  }
}
