import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { createMailFake, type MailFake } from "@/fakes/mail/server";
import { claimBatch, enqueueMail, listOutboxProblems, retryOutboxMail } from "@/db/queries/outbox";
import { db } from "@/db/client";
import { resend } from "@/lib/server/mail";
import { runOutboxOnce } from "@/lib/server/outbox-worker";
import { freshDatabase } from "../support/db";
import { makeShop } from "../support/fixtures";
import { failNext, listMail, mailStats } from "../support/mailbox";

// The outbox on a database of its own: the worker claims every due row it can see, so mail
// queued by other test files must not be in reach (nor this file's in theirs).
let fresh: Awaited<ReturnType<typeof freshDatabase>>;
let k: Knex;
let fake: MailFake;
let shop: Awaited<ReturnType<typeof makeShop>>;
const pool = globalThis as { benchsideDb?: Knex };
const now = { backoffBaseMs: 0, backoffMaxMs: 0 };

async function queue(to: string, count: number, over: Partial<Parameters<typeof enqueueMail>[1]> = {}): Promise<number[]> {
  return db().transaction(async (tx) => {
    const ids: number[] = [];
    for (let i = 1; i <= count; i++) ids.push(await enqueueMail(tx, { shopId: shop.id, kind: "test", to, subject: `Mail ${i} of ${count}`, html: `<p>Body ${i}</p>`, text: `Body ${i}`, ...over }));
    return ids;
  });
}

/** Runs the worker until a round finds nothing due (retries here wait 0 ms). */
async function drain(overrides: Parameters<typeof runOutboxOnce>[0] = {}) {
  const runs = [];
  for (let i = 0; i < 200; i++) {
    const run = await runOutboxOnce({ ...now, ...overrides });
    runs.push(run);
    if (run.claimed === 0) return runs;
  }
  throw new Error("the outbox never emptied");
}

beforeAll(async () => {
  fresh = await freshDatabase();
  await fresh.knex.migrate.latest();
  k = fresh.knex;
  process.env.DATABASE_URL = fresh.url;
  fake = await createMailFake({ port: 0, dir: fs.mkdtempSync(path.join(os.tmpdir(), "bs-outbox-")) });
  process.env.RESEND_BASE_URL = fake.url;
  process.env.RESEND_API_KEY = "re_test_key";
  shop = await makeShop(k, { label: "outbox" });
  await k("shops").where({ id: shop.id }).update({ name: 'Ridge, "Rock" & Son', email: "desk@ridge-rock.test" });
});
afterAll(async () => {
  await pool.benchsideDb?.destroy();
  await fake?.close();
  await fresh?.drop();
});

describe("enqueueMail", () => {
  it("writes nothing when the caller's transaction rolls back", async () => {
    const to = "rolled-back@mail.test";
    await expect(
      db().transaction(async (tx) => {
        await enqueueMail(tx, { shopId: shop.id, kind: "test", to, subject: "Never", html: "<p>x</p>", text: "x" });
        throw new Error("the change failed");
      }),
    ).rejects.toThrow("the change failed");
    expect(await k("outbox").where({ to_email: to }).count({ n: "*" }).first()).toEqual({ n: 0 });
  });

  it("speaks for the shop (its name in From, its address as Reply-To) and queues a dedupe key once", async () => {
    const to = "dedupe@mail.test";
    const [a] = await queue(to, 1, { dedupeKey: "reminder:7" });
    const [b] = await queue(to, 1, { dedupeKey: "reminder:7" });
    expect(b).toBe(a);
    const row = await k("outbox").where({ id: a }).first();
    // RFC 5322 §3.2.4: a quoted display name, its quote escaped, keeps the comma from splitting the header.
    expect(row!.from_address).toBe('"Ridge, \\"Rock\\" & Son" <no-reply@benchside.test>');
    expect(row!.reply_to).toBe("desk@ridge-rock.test");
    expect(row!.idempotency_key).toMatch(/^[0-9a-f-]{36}$/);
  });

  it("refuses a subject with a line break or a forged From header, writing nothing", async () => {
    const to = "injected@mail.test";
    await expect(queue(to, 1, { subject: "Hi\r\nBcc: all@mail.test" })).rejects.toThrow();
    await expect(queue(to, 1, { headers: { From: "someone@else.test" } })).rejects.toThrow();
    expect(await k("outbox").where({ to_email: to }).count({ n: "*" }).first()).toEqual({ n: 0 });
  });
});

describe("the outbox worker", () => {
  it("delivers 50 mails exactly once after the provider fails the next 20 calls", async () => {
    await drain();
    const to = "fifty@mail.test";
    const before = await mailStats(fake.url);
    const ids = await queue(to, 50);
    await failNext(fake.url, 20, 500);
    await drain({ batchSize: 20 });
    const got = await listMail(fake.url, { to });
    expect(got).toHaveLength(50);
    expect(new Set(got.map((m) => m.subject)).size).toBe(50);
    const after = await mailStats(fake.url);
    expect(after.failed - before.failed).toBe(20);
    expect(after.accepted - before.accepted).toBe(50);
    const rows = await k("outbox").whereIn("id", ids).select("state", "attempts");
    expect(rows.every((r) => r.state === "sent")).toBe(true);
    // The 20 refused calls were 20 second tries, nothing more.
    expect(rows.reduce((sum, r) => sum + Number(r.attempts), 0)).toBe(70);
    expect(got[0]?.reply_to).toEqual(["desk@ridge-rock.test"]);
  });

  it("two workers at once send each mail once", async () => {
    const to = "two-workers@mail.test";
    const before = await mailStats(fake.url);
    const ids = await queue(to, 30);
    const [a, b] = await Promise.all([drain({ batchSize: 4 }), drain({ batchSize: 4 })]);
    const claimed = [...a, ...b].reduce((sum, r) => sum + r.claimed, 0);
    expect(claimed).toBe(30);
    expect(await listMail(fake.url, { to })).toHaveLength(30);
    expect((await mailStats(fake.url)).accepted - before.accepted).toBe(30);
    const attempts = await k("outbox").whereIn("id", ids).pluck("attempts");
    expect(attempts.every((n) => Number(n) === 1)).toBe(true);
  });

  it("a worker that dies after sending leaves the row to come back, and the idempotency key stops a second mail", async () => {
    const to = "crashed@mail.test";
    const id = (await queue(to, 1))[0]!;
    const [claimed] = await claimBatch({ limit: 1, leaseMs: 200 });
    expect(claimed?.id).toBe(id);
    // Sent, then the worker "dies" before recording it.
    await resend().emails.send({ from: claimed!.from, to, subject: claimed!.subject, html: claimed!.html, text: claimed!.text, replyTo: claimed!.replyTo ?? undefined }, { idempotencyKey: claimed!.idempotencyKey });
    expect(await runOutboxOnce(now)).toMatchObject({ claimed: 0 }); // still leased
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(await runOutboxOnce(now)).toMatchObject({ claimed: 1, sent: 1 });
    expect(await listMail(fake.url, { to })).toHaveLength(1);
    expect(await k("outbox").where({ id }).first("state", "attempts")).toEqual({ state: "sent", attempts: 2 });
  });

  it("dead-letters a mail after the set number of tries, lists it for staff, and sends it on retry", async () => {
    const to = "dead-letter@mail.test";
    const id = (await queue(to, 1))[0]!;
    await failNext(fake.url, 3, 503);
    const runs = await drain({ maxAttempts: 3 });
    expect(runs.map((r) => r.dead).reduce((x, y) => x + y, 0)).toBe(1);
    expect(await k("outbox").where({ id }).first("state", "attempts")).toEqual({ state: "dead", attempts: 3 });
    const problems = await listOutboxProblems({ shopId: shop.id });
    expect(problems.find((p) => p.id === id)).toMatchObject({ state: "dead", to, lastError: expect.stringContaining("503") });
    expect(await listMail(fake.url, { to })).toHaveLength(0);

    expect(await retryOutboxMail({ shopId: shop.id + 1000, id })).toBe(false); // another shop's id changes nothing
    expect(await retryOutboxMail({ shopId: shop.id, id })).toBe(true);
    await drain({ maxAttempts: 3 });
    expect(await listMail(fake.url, { to })).toHaveLength(1);
    expect(await k("outbox").where({ id }).first("state", "last_error")).toEqual({ state: "sent", last_error: null });
    expect(await retryOutboxMail({ shopId: shop.id, id })).toBe(false); // sent mail is not sent again
  });

  it("dead-letters a mail whose workers keep dying before recording anything, without sending it", async () => {
    const to = "keeps-crashing@mail.test";
    const id = (await queue(to, 1))[0]!;
    for (let i = 0; i < 2; i++) {
      expect((await claimBatch({ limit: 1, leaseMs: 50 })).map((m) => m.id)).toEqual([id]);
      await new Promise((resolve) => setTimeout(resolve, 80));
    }
    expect(await runOutboxOnce({ ...now, maxAttempts: 2 })).toMatchObject({ claimed: 1, dead: 1, sent: 0 });
    expect(await k("outbox").where({ id }).first("state", "last_error")).toEqual({ state: "dead", last_error: "no outcome recorded after 2 claims" });
    expect(await listMail(fake.url, { to })).toHaveLength(0);
  });

  it("dead-letters at once what the provider refuses as invalid (a retry would be refused again)", async () => {
    // Mail already due (the desk's notice of the mail given up on above) goes first, so the refusal meets this one.
    await drain();
    const to = "refused@mail.test";
    const id = (await queue(to, 1))[0]!;
    await failNext(fake.url, 1, 422);
    await drain();
    expect(await k("outbox").where({ id }).first("state", "attempts")).toEqual({ state: "dead", attempts: 1 });
  });

  it("on 429 puts the rest of the batch back untried, after the provider's retry-after", async () => {
    const to = "rate-limited@mail.test";
    const ids = await queue(to, 3);
    await failNext(fake.url, 1, 429);
    const run = await runOutboxOnce({ ...now, batchSize: 3 });
    expect(run).toMatchObject({ claimed: 3, sent: 0, retrying: 1, released: 2 });
    const rows = await k("outbox").whereIn("id", ids).orderBy("id").select("state", "attempts", { later: k.raw("next_attempt_at > NOW(3) + INTERVAL 500000 MICROSECOND") });
    expect(rows.map((r) => [r.state, Number(r.attempts), Number(r.later)])).toEqual([
      ["retrying", 1, 1],
      ["retrying", 0, 1],
      ["retrying", 0, 1],
    ]);
    await new Promise((resolve) => setTimeout(resolve, 1100));
    await drain();
    expect(await listMail(fake.url, { to })).toHaveLength(3);
  });
});
