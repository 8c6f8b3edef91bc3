import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { recordEvent } from "@/db/queries/shop-events";
import type { PolledEvent } from "@/lib/live-events";
import { MAX_GAP_MS, liveStats, streamResponse, subscribe } from "@/lib/server/event-stream";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";

// The live stream's poller against the real database: events written in any order of commit
// (one held open in a slow transaction, one rolled back) reach each subscriber in id order,
// exactly once, and only those of its scope. Other test files write shop_events at the same time,
// so each check looks at this file's own shop and jobs, and waits generously.

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function waitFor(check: () => boolean, ms: number, what: string) {
  const until = Date.now() + ms;
  while (!check()) {
    if (Date.now() > until) throw new Error(`timed out waiting for ${what}`);
    await sleep(50);
  }
}

describe("the live event poller", () => {
  let k: Knex;
  let shopId: number;
  let jobA: number;
  let jobB: number;
  let jobC: number;
  let otherShopJob: { shopId: number; jobId: number };

  beforeAll(async () => {
    k = testKnex();
    const shop = await makeShop(k, { label: "live" });
    shopId = shop.id;
    [jobA, jobB, jobC] = (await makeCustomerWithJobs(k, shopId, { name: "Lise Okafor", statuses: ["in_progress", "in_progress", "in_progress"] })).jobIds as [number, number, number];
    const other = await makeShop(k, { label: "live-other" });
    otherShopJob = { shopId: other.id, jobId: (await makeCustomerWithJobs(k, other.id, { name: "Tam Reyes", statuses: ["in_progress"] })).jobIds[0]! };
  });
  afterAll(async () => {
    await k?.destroy();
  });

  const note = (jobId: number, ownerVisible = false, kk: Knex = k) => recordEvent(kk, { shopId, jobId, kind: "entry_added", actorUserId: null, ownerVisible });

  it("delivers events committed out of order, and one after a rolled-back id, in id order exactly once, to the right scopes", async () => {
    const shopSeen: PolledEvent[] = [];
    const ownerSeen: PolledEvent[] = [];
    const shopSub = await subscribe({ kind: "shop", shopId }, null, (e) => shopSeen.push(e));
    const ownerSub = await subscribe({ kind: "job", jobId: jobA, ownerVisibleOnly: true }, null, (e) => ownerSeen.push(e));
    expect(liveStats().running).toBe(true);

    const first = await note(jobA, true);
    // A slow transaction takes the next id and commits only after later ids are visible. (Writers
    // on one job wait for each other's commit, on its page-version counter: db/page-versions.ts;
    // so the later events are on the shop's other jobs.)
    let slowId = 0;
    let commit!: () => void;
    const committed = new Promise<void>((r) => (commit = r));
    const slow = k.transaction(async (tx) => {
      slowId = await note(jobB, false, tx);
      await committed;
    });
    await waitFor(() => slowId > 0, 5000, "the slow transaction's insert");
    const later = [await note(jobA, false), await note(jobC, true)];
    const otherShop = await recordEvent(k, { ...otherShopJob, kind: "entry_added", actorUserId: null, ownerVisible: true });
    expect(slowId).toBeGreaterThan(first);
    expect(later[0]).toBeGreaterThan(slowId);

    await waitFor(() => shopSeen.some((e) => e.id === first), 3000, "the first event");
    // The ids after the open transaction's are held: not delivered ahead of it.
    await sleep(1000);
    expect(shopSeen.map((e) => e.id)).toEqual([first]);
    commit();
    await slow;
    await waitFor(() => shopSeen.length >= 4, 5000, "the held events");

    // A rolled-back insert leaves a gap that never fills: what follows goes out after the wait.
    await k
      .transaction(async (tx) => {
        await note(jobA, false, tx);
        throw new Error("roll back");
      })
      .catch(() => undefined);
    const afterGap = await note(jobA, true);
    const start = Date.now();
    await waitFor(() => shopSeen.some((e) => e.id === afterGap), MAX_GAP_MS + 5000, "the event after the rolled-back id");
    expect(Date.now() - start).toBeGreaterThanOrEqual(MAX_GAP_MS - 1000);
    await sleep(600);

    expect(shopSeen.map((e) => e.id)).toEqual([first, slowId, ...later, afterGap]);
    expect(shopSeen.map((e) => e.id)).not.toContain(otherShop);
    expect(shopSeen.every((e) => e.shopId === shopId && e.kind === "entry_added" && typeof e.job === "string")).toBe(true);
    // The owner of job A hears job A's owner-visible events only.
    expect(ownerSeen.map((e) => e.id)).toEqual([first, afterGap]);

    shopSub.unsubscribe();
    ownerSub.unsubscribe();
    // The last one out stops this process's poller.
    expect(liveStats()).toMatchObject({ running: false, subscribers: 0 });
  }, 30_000);

  it("a resuming subscriber gets what it missed from the database, then the live feed, without duplicates", async () => {
    const missed = [await note(jobA), await note(jobB)];
    const before = missed[0]! - 1;
    // Another subscriber keeps the poller running and past the missed events.
    const keeper = await subscribe({ kind: "shop", shopId }, null, () => undefined);
    const seen: number[] = [];
    const resumed = await subscribe({ kind: "shop", shopId }, before, (e) => seen.push(e.id));
    expect(seen).toEqual(missed);
    expect(resumed.lastId).toBe(missed[1]);
    const live = await note(jobA);
    await waitFor(() => seen.includes(live), 5000, "the live event");
    await sleep(600);
    expect(seen).toEqual([...missed, live]);
    resumed.unsubscribe();
    keeper.unsubscribe();
  }, 20_000);

  it("streams as Server-Sent Events, and a closed connection leaves the poller", async () => {
    const abort = new AbortController();
    const req = new Request("http://localhost/api/shops/x/events", { headers: { accept: "text/event-stream" }, signal: abort.signal });
    const res = await streamResponse(req, { kind: "shop", shopId }, null);
    expect(res.headers.get("content-type")).toBe("text/event-stream; charset=utf-8");
    expect(res.headers.get("cache-control")).toBe("no-cache, no-transform");
    expect(res.headers.get("x-accel-buffering")).toBe("no");
    const reader = res.body!.getReader();
    const decoder = new TextDecoder();
    let text = "";
    const readUntil = async (needle: string) => {
      const until = Date.now() + 5000;
      while (!text.includes(needle)) {
        if (Date.now() > until) throw new Error(`no "${needle}" in ${JSON.stringify(text)}`);
        const { value, done } = await reader.read();
        if (done) throw new Error("stream ended");
        text += decoder.decode(value, { stream: true });
      }
    };
    await readUntil("event: ready");
    expect(text).toMatch(/^retry: \d+\nid: \d+\nevent: ready\n/);
    const id = await note(jobB);
    await readUntil(`id: ${id}\n`);
    expect(text).toContain(`id: ${id}\nevent: entry_added\ndata: {"id":${id},"kind":"entry_added","job":"`);
    expect(text).not.toContain("payload");
    abort.abort();
    await waitFor(() => liveStats().subscribers === 0, 2000, "the connection to leave");
    expect(liveStats().running).toBe(false);
  }, 20_000);

  it("answers a plain HTTP client (no event-stream Accept) with the missed events, and ends", async () => {
    const id = await note(jobA, true);
    const res = await streamResponse(new Request("http://localhost/x", { headers: { accept: "*/*" } }), { kind: "job", jobId: jobA, ownerVisibleOnly: true }, id - 1);
    const text = await res.text();
    expect(text).toMatch(new RegExp(`^id: ${id}\\nevent: entry_added\\n`));
    expect(text).toContain(`event: ready\ndata: {"lastId":`);
    expect(liveStats().running).toBe(false);
  });
});
