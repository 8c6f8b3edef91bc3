// The live stream's rules, kept pure (no I/O) so they can be tested on their own. Used by the
// server's poller (lib/server/event-stream.ts), the two stream routes and the browser hook
// (lib/swr/use-live-events.ts).
import type { ShopEventKind } from "@/lib/shop-events";

/** One event as it travels on the stream: what happened and to which job, never its payload (clients refetch). */
export type LiveEvent = {
  id: number;
  kind: ShopEventKind;
  /** The job's public id (the one in its addresses), or null for a shop-wide event. */
  job: string | null;
  at: string;
};

/** What the poller reads: the stream's event plus what subscribers are matched on. */
export type PolledEvent = LiveEvent & { shopId: number; jobId: number | null; ownerVisible: boolean };

/** Who a stream is for: a shop's staff (everything in the shop) or one job's readers. */
export type StreamScope = { kind: "shop"; shopId: number } | { kind: "job"; jobId: number; ownerVisibleOnly: boolean };

export function inScope(scope: StreamScope, e: Pick<PolledEvent, "shopId" | "jobId" | "ownerVisible">): boolean {
  if (scope.kind === "shop") return e.shopId === scope.shopId;
  return e.jobId === scope.jobId && (!scope.ownerVisibleOnly || e.ownerVisible);
}

/**
 * The gap rule. Auto-increment ids are handed out when a row is inserted but become visible when
 * its transaction commits, so id 7 can be read before id 6. The poller only moves its cursor over
 * a contiguous run of ids; an id seen above a gap is held until the gap fills, or until it has
 * been held `maxGapMs` (a rolled-back insert leaves a gap that never fills, and a transaction
 * that slow is taken for one).
 *
 * `visible`: ids read after `cursor` this round, ascending; `heldSince`: when each id still held
 * was first read. Returns the ids to deliver now (ascending), the new cursor, and the ids held.
 */
export function advanceCursor(input: {
  cursor: number;
  visible: readonly number[];
  heldSince: ReadonlyMap<number, number>;
  now: number;
  maxGapMs: number;
}): { deliver: number[]; cursor: number; heldSince: Map<number, number> } {
  const { visible, heldSince, now, maxGapMs } = input;
  let cursor = input.cursor;
  const deliver: number[] = [];
  let blocked = false;
  const held = new Map<number, number>();
  for (const id of visible) {
    if (id <= cursor) continue;
    const since = heldSince.get(id) ?? now;
    if (!blocked && (id === cursor + 1 || now - since >= maxGapMs)) {
      deliver.push(id);
      cursor = id;
    } else {
      blocked = true;
      held.set(id, since);
    }
  }
  return { deliver, cursor, heldSince: held };
}

/**
 * A subscriber that resumes (Last-Event-ID) gets the events read from the database up to the
 * poller's cursor at the moment it joined, then what the poller delivered since (buffered while
 * the replay was read). Each id goes out once, in order, and nothing at or below `after` (what
 * the client already has) goes out again.
 */
export function mergeResume<E extends { id: number }>(after: number, replay: readonly E[], buffered: readonly E[]): { send: E[]; lastId: number } {
  const send: E[] = [];
  let lastId = after;
  for (const e of [...replay].sort((a, b) => a.id - b.id).concat(buffered)) {
    if (e.id <= lastId) continue;
    send.push(e);
    lastId = e.id;
  }
  return { send, lastId };
}

/** Last-Event-ID from the header (EventSource's reconnects) or `?lastEventId=` (its first connect); null when absent. */
export const EVENT_ID_PATTERN = /^\d{1,15}$/;

/** One Server-Sent Events message (the `data` line is JSON, so it holds no newline). */
export function formatEvent(e: LiveEvent): string {
  return `id: ${e.id}\nevent: ${e.kind}\ndata: ${JSON.stringify({ id: e.id, kind: e.kind, job: e.job, at: e.at })}\n\n`;
}

/** Sent first on every connection: how long the browser waits before reconnecting, and where this stream stands. */
export function formatReady(lastId: number, retryMs: number): string {
  return `retry: ${retryMs}\nid: ${lastId}\nevent: ready\ndata: ${JSON.stringify({ lastId })}\n\n`;
}

/** A comment line: keeps proxies from closing an idle connection; EventSource ignores it. */
export const HEARTBEAT = ": keep-alive\n\n";

/**
 * Whether an SWR cache key belongs to one of the live view's prefixes. useSWRInfinite stores its
 * key as "$inf$" + the first page's key; subscription keys ("$sub$") are never refetched.
 */
export function swrKeyMatches(key: unknown, prefixes: readonly string[]): boolean {
  if (typeof key !== "string" || key.startsWith("$sub$")) return false;
  const plain = key.startsWith("$inf$") ? key.slice("$inf$".length) : key;
  return prefixes.some((p) => plain.startsWith(p));
}
