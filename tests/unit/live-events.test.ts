import { describe, expect, it } from "vitest";
import { type PolledEvent, advanceCursor, formatEvent, formatReady, inScope, mergeResume, swrKeyMatches } from "@/lib/live-events";

// The live stream's rules (lib/live-events.ts). Not domain computations: no published source
// applies; the expected values follow from the rules as documented beside the code.

const step = (cursor: number, visible: number[], heldSince: Map<number, number>, now: number) => advanceCursor({ cursor, visible, heldSince, now, maxGapMs: 3000 });

describe("the gap rule: only a contiguous run of ids after the cursor goes out", () => {
  it("delivers a contiguous run at once", () => {
    expect(step(4, [5, 6, 7], new Map(), 1000)).toEqual({ deliver: [5, 6, 7], cursor: 7, heldSince: new Map() });
  });

  it("holds ids above a gap, then delivers them in order once the gap fills", () => {
    const first = step(4, [5, 7, 8], new Map(), 1000);
    expect(first.deliver).toEqual([5]);
    expect(first.cursor).toBe(5);
    expect([...first.heldSince]).toEqual([
      [7, 1000],
      [8, 1000],
    ]);
    // 6 commits late (a slower transaction): 6, 7, 8 go out, in that order.
    const second = step(first.cursor, [6, 7, 8], first.heldSince, 1400);
    expect(second).toEqual({ deliver: [6, 7, 8], cursor: 8, heldSince: new Map() });
  });

  it("keeps holding while the gap is younger than the limit, and remembers when each id was first seen", () => {
    const first = step(10, [12], new Map(), 0);
    const second = step(first.cursor, [12, 13], first.heldSince, 2000);
    expect(second.deliver).toEqual([]);
    expect(second.cursor).toBe(10);
    expect([...second.heldSince]).toEqual([
      [12, 0],
      [13, 2000],
    ]);
  });

  it("gives up on a gap after the limit (a rolled-back insert never fills it)", () => {
    const held = new Map([
      [12, 0],
      [13, 2000],
    ]);
    // 12 has waited 3 s: the gap below it (11) is taken for a rollback. 13 follows 12 directly.
    expect(step(10, [12, 13], held, 3000)).toEqual({ deliver: [12, 13], cursor: 13, heldSince: new Map() });
  });

  it("stops at a young gap: ids below it go out, ids above it wait", () => {
    // The gap at 6 has filled (7 had waited above it); 8 is missing and 9 was read only 100 ms ago.
    const held = new Map([
      [7, 0],
      [9, 2900],
    ]);
    const out = step(5, [6, 7, 9], held, 3000);
    expect(out.deliver).toEqual([6, 7]);
    expect(out.cursor).toBe(7);
    expect([...out.heldSince]).toEqual([[9, 2900]]);
  });

  it("ignores ids at or below the cursor, and an empty read changes nothing", () => {
    expect(step(7, [6, 7, 8], new Map(), 0)).toEqual({ deliver: [8], cursor: 8, heldSince: new Map() });
    expect(step(7, [], new Map(), 0)).toEqual({ deliver: [], cursor: 7, heldSince: new Map() });
  });
});

describe("resuming: replay then live, each id once and in order", () => {
  const ev = (id: number) => ({ id });

  it("sends the replay, then what was buffered after it, without the overlap", () => {
    // Replayed up to the poller's cursor 9; the poller delivered 8 and 9 (already in the replay), then 11.
    const { send, lastId } = mergeResume(5, [ev(9), ev(6), ev(8)], [ev(8), ev(9), ev(11)]);
    expect(send.map((e) => e.id)).toEqual([6, 8, 9, 11]);
    expect(lastId).toBe(11);
  });

  it("sends nothing the client already has (a client ahead of this instance's poller)", () => {
    const { send, lastId } = mergeResume(20, [], [ev(18), ev(20), ev(21)]);
    expect(send.map((e) => e.id)).toEqual([21]);
    expect(lastId).toBe(21);
  });

  it("stands at the resume point when nothing is new", () => {
    expect(mergeResume(42, [], [])).toEqual({ send: [], lastId: 42 });
  });
});

describe("who hears an event", () => {
  const e = (over: Partial<PolledEvent>): PolledEvent => ({ id: 1, kind: "entry_added", job: "abc", at: "2026-01-01T00:00:00.000Z", shopId: 1, jobId: 10, ownerVisible: false, ...over });

  it("a shop's staff hear everything in their shop and nothing of another", () => {
    expect(inScope({ kind: "shop", shopId: 1 }, e({}))).toBe(true);
    expect(inScope({ kind: "shop", shopId: 1 }, e({ jobId: null }))).toBe(true);
    expect(inScope({ kind: "shop", shopId: 2 }, e({}))).toBe(false);
  });

  it("a job's owner hears only that job's events marked for the owner; its staff hear all of them", () => {
    expect(inScope({ kind: "job", jobId: 10, ownerVisibleOnly: true }, e({ ownerVisible: true }))).toBe(true);
    expect(inScope({ kind: "job", jobId: 10, ownerVisibleOnly: true }, e({ ownerVisible: false }))).toBe(false);
    expect(inScope({ kind: "job", jobId: 10, ownerVisibleOnly: false }, e({ ownerVisible: false }))).toBe(true);
    expect(inScope({ kind: "job", jobId: 11, ownerVisibleOnly: false }, e({}))).toBe(false);
  });
});

describe("the wire format (Server-Sent Events)", () => {
  it("writes id, event and one data line of JSON, with no payload", () => {
    expect(formatEvent({ id: 7, kind: "owner_answered", job: "Xy_9", at: "2026-01-01T00:00:00.000Z" })).toBe(
      'id: 7\nevent: owner_answered\ndata: {"id":7,"kind":"owner_answered","job":"Xy_9","at":"2026-01-01T00:00:00.000Z"}\n\n',
    );
    expect(formatReady(12, 3000)).toBe('retry: 3000\nid: 12\nevent: ready\ndata: {"lastId":12}\n\n');
  });
});

describe("which SWR keys a live view refetches", () => {
  const prefixes = ["/api/shops/copper-gulch/", "/api/jobs/abc/"];
  it("matches plain and infinite keys under the prefixes", () => {
    expect(swrKeyMatches("/api/shops/copper-gulch/jobs?page=2", prefixes)).toBe(true);
    expect(swrKeyMatches("$inf$/api/jobs/abc/timeline?order=desc", prefixes)).toBe(true);
  });
  it("leaves other shops, other jobs, subscriptions and non-string keys alone", () => {
    expect(swrKeyMatches("/api/shops/copper-gulchx/jobs", prefixes)).toBe(false);
    expect(swrKeyMatches("/api/jobs/abcd/timeline", prefixes)).toBe(false);
    expect(swrKeyMatches("$sub$/api/shops/copper-gulch/jobs", prefixes)).toBe(false);
    expect(swrKeyMatches(undefined, prefixes)).toBe(false);
  });
});
