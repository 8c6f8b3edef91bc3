// The phone's outbox (issue 20 §2): posts made with no network — notes, photo sets, clips, torque
// records, readings, the other bench records (chain wear, measurement sets, teardown steps and
// their torque, reassembly ticks), status moves — are kept in IndexedDB with their files and a client-made
// idempotency key, and sent in the order they were made once the network is back (also after the
// tab was closed: the runner drains on every page load). The server honours the key, so a send
// whose answer was lost is sent again safely. A refusal that needs a person (the job was
// collected, the entry deleted, a field refused) holds the item with the server's words until
// they retry or discard it; nothing is dropped silently. No React or network code here: the
// senders are passed in (lib/client/outbox-senders.ts), so the ordering rules are unit-tested.
import { type DBSchema, type IDBPDatabase, openDB } from "idb";

export type OutboxKind = "note" | "photos" | "clip" | "torque" | "reading" | "chain" | "measurements" | "teardown" | "step-torque" | "tick" | "replaced" | "status";

/** A file kept with its post; `sentAs` is the server's id once it arrived (a photo), so a retry skips it. */
export type QueuedFile = { name: string; type: string; size: number; blob: Blob; sentAs?: string };
/** A clip's upload ticket from the server; kept so a reload resumes the same upload. */
export type ClipTicket = { clipId: string; entryId: number; uploadUrl: string };

export type OutboxItem = {
  /** IndexedDB key: the order the posts were made in. */
  seq: number;
  /** Sent as Idempotency-Key with every attempt. */
  key: string;
  kind: OutboxKind;
  /** The job's public id. */
  job: string;
  /** What the person sees in the list ("Note", "Torque: head bolts"). */
  label: string;
  /** The request body (JSON), or for photos and clips what goes with the files. */
  payload: Record<string, unknown>;
  files: QueuedFile[];
  createdAt: number;
  attempts: number;
  /** waiting: sent by the runner; held: refused, waits for the person to retry or discard. */
  state: "waiting" | "held";
  lastError: string | null;
  /** Not before this time (ms), after a failed attempt. */
  nextAttemptAt: number;
  ticket?: ClipTicket;
  /**
   * The signed-in staff member who made it (users.id). Only they send it: on a shared phone the
   * next person to sign in sees it as someone else's and may discard it, never send it as theirs.
   * null (or missing, on items from before this was kept): nobody's, so never sent by itself.
   */
  by?: number | null;
};
export type NewOutboxItem = Pick<OutboxItem, "kind" | "job" | "label" | "payload"> & { files?: QueuedFile[]; key?: string; by?: number | null };

export type SendResult = { ok: true } | { ok: false; status: number; message: string };
export type SendContext = {
  /** Keeps part of the progress (a photo's id, a clip's ticket) so a later attempt carries on from it. */
  save: (change: Partial<Pick<OutboxItem, "files" | "ticket">>) => Promise<void>;
  progress: (fraction: number) => void;
};
export type Sender = (item: OutboxItem, ctx: SendContext) => Promise<SendResult>;

interface OutboxDb extends DBSchema {
  items: { key: number; value: OutboxItem };
}
const DB_NAME = "benchside-outbox";

// Who is signed in on this page: set by the staff layout (components/outbox-runner.tsx), read
// when a post is queued (its `by`) and when the outbox is sent (only that person's posts go).
let signedIn: number | null = null;
export function setOutboxUser(userId: number | null): void {
  if (signedIn === userId) return;
  signedIn = userId;
  // This page's views redraw (whose posts are whose) and its runner starts on that person's posts.
  changes.dispatchEvent(new Event("change"));
}
export const outboxUser = (): number | null => signedIn;
/** Whether `userId` may send this item: only whoever queued it. */
export const isMine = (item: Pick<OutboxItem, "by">, userId: number | null): boolean => userId !== null && item.by === userId;

/** A fresh idempotency key; getRandomValues where randomUUID is missing (a page served over plain http on the shop's network). */
export function newIdempotencyKey(): string {
  if (typeof crypto.randomUUID === "function") return `bo-${crypto.randomUUID()}`;
  const bytes = crypto.getRandomValues(new Uint8Array(16));
  return `bo-${Array.from(bytes, (b) => b.toString(16).padStart(2, "0")).join("")}`;
}

// --- rules (pure) ---------------------------------------------------------------------------

/**
 * What a failed attempt means. No answer (status 0), a timeout, "too many", a server error or an
 * outage: try again later by itself. Anything else is the server refusing this post (409 the job
 * moved on or was collected, 410/404 what it belongs to is gone, 422 a field, 403 no longer
 * allowed, 401 signed out, 413/415 the file): a person has to decide, so the item is held.
 */
export function failureOutcome(status: number): "retry" | "hold" {
  if (status === 0 || status === 408 || status === 425 || status === 429 || status >= 500) return "retry";
  return "hold";
}

/** The pause before attempt n+1 after n failed ones: 2 s doubling, at most 5 minutes. */
export function retryDelayMs(failedAttempts: number): number {
  return Math.min(5 * 60_000, 2000 * 2 ** Math.max(0, failedAttempts - 1));
}

/** The words on a held item: the server's own message, with what to do next. */
export function heldMessage(status: number, message: string): string {
  const next = "Retry once that is sorted, or discard this post.";
  if (status === 401) return `Not sent: you are signed out. Sign in again on this phone, then retry. (${message})`;
  if (status === 404 || status === 410) return `Not sent: ${message} It may have been deleted or closed meanwhile. ${next}`;
  return `Not sent: ${message} ${next}`;
}

/** A form's fields as the JSON its route takes: text as typed (the server reads numbers); files and React's own `$…` fields left out. */
export function formPayload(form: FormData): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [name, value] of form.entries()) {
    if (typeof value === "string" && !name.startsWith("$")) out[name] = value;
  }
  return out;
}

/** The browser knows it has no network (it can't know the opposite for sure). */
export const browserOffline = () => typeof navigator !== "undefined" && navigator.onLine === false;

// --- the store ------------------------------------------------------------------------------

const changes = new EventTarget();
let channel: BroadcastChannel | null = null;
function announce() {
  changes.dispatchEvent(new Event("change"));
  channel?.postMessage("change");
}
/** Calls `listener` whenever the outbox changes, in this tab or another one. */
export function onOutboxChange(listener: () => void): () => void {
  if (!channel && typeof BroadcastChannel !== "undefined") {
    channel = new BroadcastChannel(DB_NAME);
    channel.onmessage = () => changes.dispatchEvent(new Event("change"));
  }
  changes.addEventListener("change", listener);
  return () => changes.removeEventListener("change", listener);
}

let opened: Promise<IDBPDatabase<OutboxDb>> | null = null;
function database() {
  opened ??= openDB<OutboxDb>(DB_NAME, 1, {
    upgrade(db) {
      db.createObjectStore("items", { keyPath: "seq", autoIncrement: true });
    },
  });
  return opened;
}

export async function enqueue(input: NewOutboxItem, now = Date.now()): Promise<OutboxItem> {
  const item: Omit<OutboxItem, "seq"> = {
    key: input.key ?? newIdempotencyKey(),
    by: input.by !== undefined ? input.by : signedIn,
    kind: input.kind,
    job: input.job,
    label: input.label,
    payload: input.payload,
    files: input.files ?? [],
    createdAt: now,
    attempts: 0,
    state: "waiting",
    lastError: null,
    nextAttemptAt: 0,
  };
  const seq = await (await database()).add("items", item as OutboxItem);
  announce();
  return { ...item, seq };
}

/** Every queued post in the order it was made (optionally one job's). */
export async function listOutbox(job?: string): Promise<OutboxItem[]> {
  const all = await (await database()).getAll("items");
  return (job ? all.filter((i) => i.job === job) : all).sort((a, b) => a.seq - b.seq);
}

async function update(seq: number, change: Partial<OutboxItem>) {
  const db = await database();
  const tx = db.transaction("items", "readwrite");
  const current = await tx.store.get(seq);
  if (current) await tx.store.put({ ...current, ...change, seq });
  await tx.done;
  announce();
}

/** A held (or waiting) item goes back in line now. */
export const retryItem = (seq: number) => update(seq, { state: "waiting", nextAttemptAt: 0 });

/** The person gives up on a post: it leaves the phone. */
export async function discardItem(seq: number): Promise<void> {
  await (await database()).delete("items", seq);
  announce();
}

// --- sending --------------------------------------------------------------------------------

export type DrainReport = { sent: number; held: number; failed: number; nextAttemptAt: number | null };
type Progress = (seq: number, fraction: number) => void;

/**
 * Sends what is waiting, oldest first, one at a time. A sent post leaves the outbox; a refused one
 * is held with the server's message and the next one goes; a post that could not get through stops
 * the run (so later posts don't overtake it) and is tried again after a growing pause. Only the
 * posts of the person signed in (`userId`, else the page's) are sent; anyone else's stay as they are.
 */
export async function drainOutbox(send: Sender, opts: { now?: () => number; onProgress?: Progress; networkBack?: boolean; userId?: number | null } = {}): Promise<DrainReport> {
  const now = opts.now ?? Date.now;
  const report: DrainReport = { sent: 0, held: 0, failed: 0, nextAttemptAt: null };
  const userId = opts.userId !== undefined ? opts.userId : signedIn;
  for (const item of await listOutbox()) {
    // Held: waits for a person. Someone else's: waits for them to sign in on this phone.
    if (item.state === "held" || !isMine(item, userId)) continue;
    // The network just came back: what waited out a pause goes now rather than at its time.
    if (item.nextAttemptAt > now() && !opts.networkBack) {
      report.nextAttemptAt = item.nextAttemptAt;
      return report;
    }
    const ctx: SendContext = {
      save: (change) => update(item.seq, change),
      progress: (fraction) => opts.onProgress?.(item.seq, fraction),
    };
    let result: SendResult;
    try {
      result = await send(item, ctx);
    } catch (error) {
      result = { ok: false, status: 0, message: error instanceof Error ? error.message : String(error) };
    }
    if (result.ok) {
      await discardItem(item.seq);
      report.sent++;
      continue;
    }
    const attempts = item.attempts + 1;
    if (failureOutcome(result.status) === "hold") {
      await update(item.seq, { state: "held", attempts, lastError: heldMessage(result.status, result.message) });
      report.held++;
      continue;
    }
    const nextAttemptAt = now() + retryDelayMs(attempts);
    await update(item.seq, { attempts, lastError: result.message, nextAttemptAt });
    report.failed++;
    report.nextAttemptAt = nextAttemptAt;
    return report;
  }
  return report;
}
