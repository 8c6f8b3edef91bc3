import "server-only";
import { z } from "zod";
import { listScopeEventsBetween, listStreamEventsAfter } from "@/db/queries/event-stream";
import { latestEventId } from "@/db/queries/shop-events";
import { AppError } from "@/lib/errors";
import { EVENT_ID_PATTERN, HEARTBEAT, type PolledEvent, type StreamScope, advanceCursor, formatEvent, formatReady, inScope, mergeResume } from "@/lib/live-events";

// Live updates for open pages, over Server-Sent Events. Each app instance runs one poller (per
// Node process, while anyone is connected) that reads shop_events from MariaDB after its cursor
// and hands each event to the connections whose scope it is in. The database is the only source:
// an event written through instance A reaches a client connected to instance B at B's next poll,
// so any instance can serve any client and no sticky sessions or message bus are needed.

/** How often the poller reads (the issue asks for an update within 2 s). */
export const POLL_MS = 450;
/** How long an id above a gap waits for the gap to fill (lib/live-events.ts advanceCursor). */
export const MAX_GAP_MS = 3_000;
const BATCH = 200;
/** At most this many missed events are replayed to a resuming client (the newest). */
export const REPLAY_LIMIT = 500;
/** The browser's wait before it reconnects. */
const RETRY_MS = 3_000;
const HEARTBEAT_MS = 15_000;
/** A stream ends after this long; EventSource reconnects at once, and access is checked again. */
const MAX_STREAM_MS = 10 * 60_000;

type Subscriber = { scope: StreamScope; send: (e: PolledEvent) => void; lastId: number; buffer: PolledEvent[] | null };
type Run = { cursor: number; heldSince: Map<number, number>; ready: Promise<void>; timer: ReturnType<typeof setTimeout> | null; stopped: boolean; failing: boolean };
type Hub = { run: Run | null; subscribers: Set<Subscriber> };

// On globalThis: each route is its own bundle, and both must share the one poller of the process.
const holder = globalThis as unknown as { benchsideEventHub?: Hub };
const hub = (): Hub => (holder.benchsideEventHub ??= { run: null, subscribers: new Set() });

function start(h: Hub): Run {
  const run: Run = { cursor: 0, heldSince: new Map(), ready: Promise.resolve(), timer: null, stopped: false, failing: false };
  // A fresh poller starts at the newest event: what came before, its subscribers replay themselves.
  run.ready = latestEventId().then((id) => {
    run.cursor = id;
    schedule(h, run, POLL_MS);
  });
  // Couldn't start (database away): the subscriber waiting is answered 503; the next one tries again.
  run.ready.catch(() => {
    if (h.run === run) h.run = null;
  });
  return run;
}

function schedule(h: Hub, run: Run, ms: number) {
  if (run.stopped) return;
  run.timer = setTimeout(() => void poll(h, run), ms);
  run.timer.unref?.();
}

async function poll(h: Hub, run: Run) {
  let next = POLL_MS;
  try {
    const batch = await listStreamEventsAfter({ afterId: run.cursor, limit: BATCH });
    if (run.stopped) return;
    const step = advanceCursor({ cursor: run.cursor, visible: batch.map((e) => e.id), heldSince: run.heldSince, now: Date.now(), maxGapMs: MAX_GAP_MS });
    // Cursor and fan-out move together, with no await between: a subscriber joining at any
    // await point has been handed every event at or below the cursor it reads.
    run.cursor = step.cursor;
    run.heldSince = step.heldSince;
    const byId = new Map(batch.map((e) => [e.id, e]));
    for (const id of step.deliver) fanOut(h, byId.get(id)!);
    if (batch.length === BATCH && step.deliver.length) next = 0;
    if (run.failing) console.info("live events: reading shop_events again");
    run.failing = false;
  } catch (error) {
    // The database is away: keep the connections, read again a little later, lose nothing.
    if (!run.failing) console.error("live events: reading shop_events failed; retrying", error);
    run.failing = true;
    next = POLL_MS * 4;
  }
  schedule(h, run, next);
}

function fanOut(h: Hub, e: PolledEvent) {
  for (const sub of h.subscribers) {
    if (!inScope(sub.scope, e)) continue;
    if (sub.buffer) sub.buffer.push(e);
    else if (e.id > sub.lastId) {
      sub.lastId = e.id;
      sub.send(e);
    }
  }
}

function stop(run: Run) {
  run.stopped = true;
  if (run.timer) clearTimeout(run.timer);
}

/**
 * Joins the live feed of `scope`. With `after` (the client's Last-Event-ID), the events of the
 * scope after it are sent first, read from the database, then the live ones, each once and in
 * order. Returns the id the stream now stands at, and the way out (the last one out stops the poller).
 */
export async function subscribe(scope: StreamScope, after: number | null, send: (e: PolledEvent) => void): Promise<{ lastId: number; unsubscribe: () => void }> {
  const h = hub();
  const run = (h.run ??= start(h));
  // Buffers what the poller delivers while the replay is read.
  const sub: Subscriber = { scope, send, lastId: 0, buffer: [] };
  h.subscribers.add(sub);
  const unsubscribe = () => {
    if (!h.subscribers.delete(sub)) return;
    if (h.subscribers.size === 0 && h.run) {
      stop(h.run);
      h.run = null;
    }
  };
  try {
    await run.ready;
    const through = run.cursor;
    const replay = after !== null && after < through ? await listScopeEventsBetween({ scope, afterId: after, throughId: through, limit: REPLAY_LIMIT }) : [];
    const { send: out, lastId } = mergeResume(after ?? through, replay, sub.buffer ?? []);
    sub.buffer = null;
    sub.lastId = lastId;
    for (const e of out) send(e);
    return { lastId, unsubscribe };
  } catch (error) {
    unsubscribe();
    throw error;
  }
}

/** For tests and health: whether this process polls, where, and for how many connections. */
export function liveStats(): { running: boolean; cursor: number | null; subscribers: number } {
  const h = hub();
  return { running: h.run !== null, cursor: h.run?.cursor ?? null, subscribers: h.subscribers.size };
}

const eventId = z.string().regex(EVENT_ID_PATTERN, "An event id is a whole number.").transform(Number);

/** `?lastEventId=`: where a first connection starts (EventSource can't set a header before it has one). */
export const streamQuerySchema = z.object({ lastEventId: eventId.optional() });

/** The resume point: the Last-Event-ID header of a reconnect, else the query's; null for "from now". */
export function resumePoint(req: Request, query: { lastEventId?: number } | undefined): number | null {
  const header = req.headers.get("last-event-id")?.trim();
  if (header) {
    const parsed = eventId.safeParse(header);
    if (!parsed.success) throw new AppError("invalid", "Last-Event-ID is not an event id.", { "last-event-id": ["An event id is a whole number."] });
    return parsed.data;
  }
  return query?.lastEventId ?? null;
}

const STREAM_HEADERS = {
  "content-type": "text/event-stream; charset=utf-8",
  // no-transform also keeps Next's compression (and proxies) from holding the stream back.
  "cache-control": "no-cache, no-transform",
  "x-accel-buffering": "no",
};

/**
 * The answer of the two stream routes (access already checked by route()). A client that asks
 * for a stream (`Accept: text/event-stream`, as EventSource does) gets one; any other gets the
 * missed events after its resume point and the answer ends (plain HTTP clients, the access and
 * fuzz tests, a catch-up fetch).
 */
export async function streamResponse(req: Request, scope: StreamScope, after: number | null): Promise<Response> {
  if (!(req.headers.get("accept") ?? "").toLowerCase().includes("text/event-stream")) {
    const through = await latestEventId();
    const replay = after !== null && after < through ? await listScopeEventsBetween({ scope, afterId: after, throughId: through, limit: REPLAY_LIMIT }) : [];
    const lastId = Math.max(after ?? through, ...replay.map((e) => e.id));
    return new Response(replay.map(formatEvent).join("") + formatReady(lastId, RETRY_MS), { headers: STREAM_HEADERS });
  }

  const encoder = new TextEncoder();
  let controller: ReadableStreamDefaultController<Uint8Array> | null = null;
  let closed = false;
  const cleanups: (() => void)[] = [];
  const close = () => {
    if (closed) return;
    closed = true;
    for (const f of cleanups) f();
    try {
      controller?.close();
    } catch {
      // Already closed or cancelled by the reader.
    }
  };
  const write = (text: string) => {
    if (closed || !controller) return;
    try {
      controller.enqueue(encoder.encode(text));
    } catch {
      close();
    }
  };
  const stream = new ReadableStream<Uint8Array>({
    start: (c) => {
      controller = c;
    },
    cancel: close,
  });
  const onAbort = () => close();
  req.signal.addEventListener("abort", onAbort);
  cleanups.push(() => req.signal.removeEventListener("abort", onAbort));

  let joined: Awaited<ReturnType<typeof subscribe>>;
  try {
    joined = await subscribe(scope, after, (e) => write(formatEvent(e)));
  } catch (error) {
    close();
    throw error;
  }
  const { lastId, unsubscribe } = joined;
  cleanups.push(unsubscribe);
  if (closed || req.signal.aborted) {
    close();
    unsubscribe();
    return new Response(null, { status: 204 });
  }
  write(formatReady(lastId, RETRY_MS));
  const heartbeat = setInterval(() => write(HEARTBEAT), HEARTBEAT_MS);
  const lifetime = setTimeout(close, MAX_STREAM_MS);
  cleanups.push(() => clearInterval(heartbeat), () => clearTimeout(lifetime));
  return new Response(stream, { headers: STREAM_HEADERS });
}
