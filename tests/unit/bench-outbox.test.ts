// The phone's outbox rules (issue 20 §2): order, retry, hold on a refusal, resume from saved
// progress. IndexedDB is fake-indexeddb (an in-memory implementation of the browser API, the
// same calls the phone makes); the sender stands in for the network and records what it was given.
import "fake-indexeddb/auto";
import { beforeEach, describe, expect, it } from "vitest";
import {
  type OutboxItem,
  type SendResult,
  type Sender,
  discardItem,
  drainOutbox,
  enqueue,
  failureOutcome,
  formPayload,
  heldMessage,
  isMine,
  listOutbox,
  newIdempotencyKey,
  onOutboxChange,
  outboxUser,
  retryDelayMs,
  retryItem,
  setOutboxUser,
} from "@/lib/client/bench-outbox";
import { offlineCapable } from "@/lib/client/queue-post";

/** A sender that answers from a script, per call, and logs the items it was asked to send. */
function scripted(answers: SendResult[]) {
  const sent: OutboxItem[] = [];
  const send: Sender = async (item) => {
    sent.push(item);
    return answers.shift() ?? { ok: true };
  };
  return { send, sent };
}

const note = (job: string, text: string) => ({ kind: "note" as const, job, label: "Note", payload: { kind: "note", note: text, visibility: "shop" } });
/** The staff member signed in on the page (the layout sets it), as users.id. */
const MATEO = 7;
const PRIYA = 12;

describe("bench outbox", () => {
  beforeEach(async () => {
    setOutboxUser(MATEO);
    for (const item of await listOutbox()) await discardItem(item.seq);
  });

  it("keeps posts in the order they were made, each with its own key", async () => {
    const a = await enqueue(note("JOB1", "first"));
    const b = await enqueue({ kind: "torque", job: "JOB1", label: "Torque: head bolts", payload: { fastener: "head bolts" } });
    const c = await enqueue(note("JOB2", "third"));
    expect((await listOutbox()).map((i) => i.seq)).toEqual([a.seq, b.seq, c.seq]);
    expect((await listOutbox("JOB1")).map((i) => i.kind)).toEqual(["note", "torque"]);
    expect(new Set([a.key, b.key, c.key]).size).toBe(3);
    expect(a.key).toMatch(/^[A-Za-z0-9_.:-]{8,100}$/); // what the server's header check accepts
  });

  it("sends everything in order and empties the outbox", async () => {
    await enqueue(note("JOB1", "one"));
    await enqueue(note("JOB1", "two"));
    await enqueue(note("JOB1", "three"));
    const { send, sent } = scripted([]);
    const report = await drainOutbox(send);
    expect(sent.map((i) => i.payload.note)).toEqual(["one", "two", "three"]);
    expect(report).toEqual({ sent: 3, held: 0, failed: 0, nextAttemptAt: null });
    expect(await listOutbox()).toEqual([]);
  });

  it("stops at a post that couldn't get through, so nothing overtakes it, and waits before trying again", async () => {
    const first = await enqueue(note("JOB1", "one"));
    await enqueue(note("JOB1", "two"));
    const { send, sent } = scripted([{ ok: false, status: 0, message: "offline" }]);
    const report = await drainOutbox(send, { now: () => 1_000_000 });
    expect(sent).toHaveLength(1);
    expect(report).toMatchObject({ sent: 0, failed: 1, nextAttemptAt: 1_000_000 + retryDelayMs(1) });
    const [kept] = await listOutbox();
    expect(kept).toMatchObject({ seq: first.seq, attempts: 1, state: "waiting", lastError: "offline" });
    // Before the pause is over nothing is sent; after it, both go, in order, with the same key as before.
    expect((await drainOutbox(send, { now: () => 1_000_000 + 1000 })).sent).toBe(0);
    expect(sent).toHaveLength(1);
    const later = await drainOutbox(send, { now: () => 1_000_000 + retryDelayMs(1) });
    expect(later.sent).toBe(2);
    expect(sent.map((i) => i.payload.note)).toEqual(["one", "one", "two"]);
    expect(sent[0]!.key).toBe(sent[1]!.key);
  });

  it("holds a refused post with the server's words and sends the ones after it", async () => {
    await enqueue(note("JOB1", "one"));
    await enqueue({ kind: "status", job: "JOB1", label: "Move to Ready", payload: { from: "in_progress", to: "ready" } });
    await enqueue(note("JOB1", "three"));
    const { send, sent } = scripted([{ ok: true }, { ok: false, status: 409, message: "The job was collected meanwhile." }, { ok: true }]);
    const report = await drainOutbox(send);
    expect(report).toMatchObject({ sent: 2, held: 1 });
    const [held] = await listOutbox();
    expect(held).toMatchObject({ kind: "status", state: "held", attempts: 1 });
    expect(held!.lastError).toContain("The job was collected meanwhile.");
    expect(held!.lastError).toMatch(/Retry .* or discard/);
    // A held post is never sent again by itself…
    expect((await drainOutbox(send)).sent).toBe(0);
    expect(sent).toHaveLength(3);
    // …only when the person retries it.
    await retryItem(held!.seq);
    expect((await drainOutbox(send)).sent).toBe(1);
    expect(sent.at(-1)!.key).toBe(held!.key);
    expect(await listOutbox()).toEqual([]);
  });

  it("when the network comes back, a post waiting out its pause goes at once", async () => {
    await enqueue(note("JOB1", "one"));
    const { send, sent } = scripted([{ ok: false, status: 503, message: "busy" }]);
    await drainOutbox(send, { now: () => 5000 });
    expect((await drainOutbox(send, { now: () => 5001 })).sent).toBe(0);
    expect((await drainOutbox(send, { now: () => 5001, networkBack: true })).sent).toBe(1);
    expect(sent).toHaveLength(2);
  });

  it("a sender that throws counts as no answer, not as a refusal", async () => {
    await enqueue(note("JOB1", "one"));
    const report = await drainOutbox(async () => {
      throw new TypeError("Failed to fetch");
    });
    expect(report.failed).toBe(1);
    expect((await listOutbox())[0]).toMatchObject({ state: "waiting", lastError: "Failed to fetch" });
  });

  it("a later attempt starts from the progress the earlier one saved (photos already sent, a clip's ticket)", async () => {
    const blob = (text: string) => new Blob([text], { type: "image/jpeg" });
    await enqueue({
      kind: "photos",
      job: "JOB1",
      label: "2 photos",
      payload: { caption: "Stator", visibility: "shop" },
      files: [
        { name: "a.jpg", type: "image/jpeg", size: 1, blob: blob("a") },
        { name: "b.jpg", type: "image/jpeg", size: 1, blob: blob("b") },
      ],
    });
    const seen: OutboxItem[] = [];
    const send: Sender = async (item, ctx) => {
      seen.push(item);
      const files = [...item.files];
      for (const [i, f] of files.entries()) {
        if (f.sentAs) continue;
        if (seen.length === 1 && i === 1) return { ok: false, status: 503, message: "busy" }; // first attempt: b fails
        files[i] = { ...f, sentAs: `photo-${f.name}` };
        await ctx.save({ files });
      }
      return { ok: true };
    };
    await drainOutbox(send, { now: () => 0 });
    const [kept] = await listOutbox();
    expect(kept!.files.map((f) => f.sentAs ?? null)).toEqual(["photo-a.jpg", null]);
    expect(await kept!.files[0]!.blob.text()).toBe("a"); // the file itself is still on the phone
    await drainOutbox(send, { now: () => retryDelayMs(1) });
    expect(seen[1]!.files[0]!.sentAs).toBe("photo-a.jpg");
    expect(await listOutbox()).toEqual([]);
  });

  it("each post records who queued it, and only that person's posts are sent", async () => {
    const mine = await enqueue(note("JOB1", "Mateo's first"));
    setOutboxUser(PRIYA); // Mateo signs out, Priya signs in on the same phone
    const hers = await enqueue(note("JOB1", "Priya's"));
    expect([mine.by, hers.by]).toEqual([MATEO, PRIYA]);
    expect((await listOutbox()).map((i) => i.by)).toEqual([MATEO, PRIYA]);

    // Priya's page sends hers only: Mateo's stays on the phone, untouched, not held, not tried.
    const { send, sent } = scripted([]);
    expect(await drainOutbox(send)).toEqual({ sent: 1, held: 0, failed: 0, nextAttemptAt: null });
    expect(sent.map((i) => i.payload.note)).toEqual(["Priya's"]);
    const [left] = await listOutbox();
    expect(left).toMatchObject({ seq: mine.seq, by: MATEO, state: "waiting", attempts: 0, lastError: null });
    expect(isMine(left!, PRIYA)).toBe(false);
    expect(isMine(left!, MATEO)).toBe(true);

    // Mateo signs in again: his post goes, under his name.
    expect((await drainOutbox(send, { userId: MATEO })).sent).toBe(1);
    expect(sent.map((i) => i.payload.note)).toEqual(["Priya's", "Mateo's first"]);
    expect(await listOutbox()).toEqual([]);
  });

  it("a post of nobody known (queued before anyone was known, or from before posts kept their maker) is never sent by itself", async () => {
    setOutboxUser(null);
    expect(outboxUser()).toBeNull();
    const orphan = await enqueue(note("JOB1", "whose?"));
    expect(orphan.by).toBeNull();
    const { send, sent } = scripted([]);
    // Nobody signed in: nothing is sent at all.
    expect((await drainOutbox(send)).sent).toBe(0);
    setOutboxUser(MATEO);
    expect((await drainOutbox(send)).sent).toBe(0);
    expect(sent).toEqual([]);
    expect(isMine({ by: undefined }, MATEO)).toBe(false);
    // The person decides: discarding it is the way out.
    await discardItem(orphan.seq);
    expect(await listOutbox()).toEqual([]);
  });

  it("someone else's post waiting first doesn't hold the line for the signed-in person's", async () => {
    setOutboxUser(PRIYA);
    await enqueue(note("JOB1", "Priya's, made first"));
    setOutboxUser(MATEO);
    await enqueue(note("JOB1", "Mateo's, made later"));
    const { send, sent } = scripted([]);
    expect((await drainOutbox(send)).sent).toBe(1);
    expect(sent.map((i) => i.payload.note)).toEqual(["Mateo's, made later"]);
    expect((await listOutbox()).map((i) => i.by)).toEqual([PRIYA]);
  });

  it("signing in tells the page's views and runner", async () => {
    setOutboxUser(null);
    let calls = 0;
    const stop = onOutboxChange(() => calls++);
    setOutboxUser(MATEO);
    setOutboxUser(MATEO); // the same person again: nothing changed
    stop();
    expect(calls).toBe(1);
  });

  it("tells listeners about every change", async () => {
    let calls = 0;
    const stop = onOutboxChange(() => calls++);
    const item = await enqueue(note("JOB1", "one"));
    await retryItem(item.seq);
    await discardItem(item.seq);
    stop();
    await enqueue(note("JOB1", "two"));
    expect(calls).toBe(3);
  });
});

describe("outbox rules", () => {
  it("retries what never got an answer or hit a server problem; holds every refusal", () => {
    for (const status of [0, 408, 429, 500, 502, 503, 504]) expect(failureOutcome(status), String(status)).toBe("retry");
    for (const status of [400, 401, 403, 404, 409, 410, 413, 415, 422]) expect(failureOutcome(status), String(status)).toBe("hold");
  });

  it("waits 2 s, then twice as long each time, never more than 5 minutes", () => {
    expect([1, 2, 3, 4].map(retryDelayMs)).toEqual([2000, 4000, 8000, 16000]);
    expect(retryDelayMs(20)).toBe(300_000);
  });

  it("a form becomes the route's JSON: its text fields as typed, without files or React's own fields", () => {
    const form = new FormData();
    form.append("job", "AB12CD34");
    form.append("specValue", "1.200,5");
    form.append("share", "on");
    form.append("$ACTION_ID_abc", "");
    form.append("photo", new Blob(["x"]), "x.jpg");
    expect(formPayload(form)).toEqual({ job: "AB12CD34", specValue: "1.200,5", share: "on" });
  });

  it("says what happened and what to do", () => {
    expect(heldMessage(410, "The entry was deleted.")).toBe("Not sent: The entry was deleted. It may have been deleted or closed meanwhile. Retry once that is sorted, or discard this post.");
    expect(heldMessage(401, "Sign in first.")).toMatch(/signed out/);
    expect(newIdempotencyKey()).not.toBe(newIdempotencyKey());
  });
});

describe("a bench form with no network", () => {
  beforeEach(async () => {
    setOutboxUser(MATEO);
    for (const item of await listOutbox()) await discardItem(item.seq);
  });
  const form = () => {
    const f = new FormData();
    f.append("job", "JOB9");
    f.append("fastener", "Head bolts");
    f.append("specValue", "12");
    return f;
  };

  it("an action that can't be reached puts the form's fields in the outbox for its route", async () => {
    const action = offlineCapable(
      async () => {
        throw new TypeError("Failed to fetch");
      },
      { kind: "torque", job: "JOB9", label: (f) => `Torque: ${String(f.get("fastener"))}` },
    );
    expect(await action(null, form())).toEqual({ ok: true, data: { queued: true } });
    const [queued] = await listOutbox();
    expect(queued).toMatchObject({ kind: "torque", job: "JOB9", label: "Torque: Head bolts", by: MATEO, payload: { job: "JOB9", fastener: "Head bolts", specValue: "12" } });
  });

  it("an action that answers, even with a refusal, is shown as before and nothing is queued", async () => {
    const refusal = { ok: false as const, error: { code: "invalid" as const, message: "Some fields need attention.", fields: { specValue: ["Type the spec torque."] } } };
    const action = offlineCapable(async () => refusal, { kind: "torque", job: "JOB9", label: () => "Torque" });
    expect(await action(null, form())).toBe(refusal);
    expect(await listOutbox()).toEqual([]);
  });
});
