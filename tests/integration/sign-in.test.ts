import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { createMailFake, type MailFake } from "@/fakes/mail/server";
import { LIMITS, SIGN_IN_FAILURES, checkPassword, consumeSignInLink, requestSignInLink } from "@/lib/server/sign-in";
import { enqueueMail } from "@/db/queries/outbox";
import { runOutboxOnce, startOutboxWorker } from "@/lib/server/outbox-worker";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { freshDatabase } from "../support/db";
import { failNext, listMail, waitForMail } from "../support/mailbox";

// Sign-in links go through the outbox, and a worker claims every due row it can see: so this
// file has a database of its own, and sends what it queued with deliver() (or its own worker).
const PASSWORD = "correct horse battery";
let fresh: Awaited<ReturnType<typeof freshDatabase>>;
let db: Knex;
let mail: MailFake;
let shop: Awaited<ReturnType<typeof makeShop>>;
let ipCounter = 0;
const freshIp = () => `198.51.100.${++ipCounter}`; // documentation range (RFC 5737), one per test
const pool = globalThis as { benchsideDb?: Knex };

const failureOf = async (work: Promise<unknown>) => {
  try {
    await work;
  } catch (error) {
    return (error as { code?: string }).code;
  }
  return "no failure";
};

/** Runs the mail worker until nothing is due (retries here wait 0 ms). */
async function deliver() {
  for (let i = 0; i < 50; i++) {
    const run = await runOutboxOnce({ backoffBaseMs: 0, backoffMaxMs: 0, priorityBackoffBaseMs: 0, priorityBackoffMaxMs: 0 });
    if (run.claimed === 0) return;
  }
  throw new Error("the outbox never emptied");
}

beforeAll(async () => {
  fresh = await freshDatabase();
  await fresh.knex.migrate.latest();
  db = fresh.knex;
  process.env.DATABASE_URL = fresh.url;
  mail = await createMailFake({ port: 0, dir: fs.mkdtempSync(path.join(os.tmpdir(), "bs-mail-")) });
  process.env.RESEND_BASE_URL = mail.url;
  process.env.RESEND_API_KEY = "re_test_key";
  process.env.APP_URL = "http://localhost:3999";
  shop = await makeShop(db, { label: "signin", roles: ["owner", "technician"], password: PASSWORD });
});
afterAll(async () => {
  await pool.benchsideDb?.destroy();
  await mail?.close();
  await fresh?.drop();
});

describe("staff password sign-in", () => {
  it("accepts the right password", async () => {
    const user = await checkPassword({ email: shop.staff.owner!.email, password: PASSWORD, ip: freshIp() });
    expect(user.id).toBe(shop.staff.owner!.id);
  });

  it("gives one answer for an unknown address, a wrong password and an account with no shop role", async () => {
    const [customerOnly] = await db("users").insert({ email: `customer.${shop.slug}@mail.test`, name: "Cy Only" });
    expect(customerOnly).toBeGreaterThan(0);
    const answers = await Promise.all([
      failureOf(checkPassword({ email: "nobody@nowhere.test", password: PASSWORD, ip: freshIp() })),
      failureOf(checkPassword({ email: shop.staff.technician!.email, password: "nope", ip: freshIp() })),
      failureOf(checkPassword({ email: `customer.${shop.slug}@mail.test`, password: PASSWORD, ip: freshIp() })),
    ]);
    expect(answers).toEqual(["wrong-credentials", "wrong-credentials", "wrong-credentials"]);
    expect(SIGN_IN_FAILURES["wrong-credentials"]).not.toMatch(/no .*account uses|doesn't match this account/i);
  });

  it(`locks an address after ${LIMITS.passwordFailuresPerEmail.max} failures, even for the right password`, async () => {
    const email = shop.staff.technician!.email;
    const ip = freshIp();
    // one failure already recorded above for this address
    for (let i = 1; i < LIMITS.passwordFailuresPerEmail.max; i++) expect(await failureOf(checkPassword({ email, password: "nope", ip }))).toBe("wrong-credentials");
    expect(await failureOf(checkPassword({ email, password: PASSWORD, ip }))).toBe("too-many-attempts");
    expect(SIGN_IN_FAILURES["too-many-attempts"]).toMatch(/wait 15 minutes/i);
  });

  it("locks an unknown address the same way, so the lock tells nothing either", async () => {
    const email = `ghost.${shop.slug}@shop.test`;
    const ip = freshIp();
    for (let i = 0; i < LIMITS.passwordFailuresPerEmail.max; i++) expect(await failureOf(checkPassword({ email, password: "nope", ip }))).toBe("wrong-credentials");
    expect(await failureOf(checkPassword({ email, password: "nope", ip }))).toBe("too-many-attempts");
  });
});

describe("limits hold under simultaneous requests", () => {
  it(`of 12 wrong passwords sent at once, ${LIMITS.passwordFailuresPerEmail.max} are checked and the rest told to wait`, async () => {
    const burst = await makeShop(db, { label: "burst", roles: ["technician"], password: PASSWORD });
    const email = burst.staff.technician!.email;
    const ip = freshIp();
    const codes = await Promise.all(Array.from({ length: 12 }, () => failureOf(checkPassword({ email, password: "guess", ip }))));
    expect(codes.filter((c) => c === "wrong-credentials")).toHaveLength(LIMITS.passwordFailuresPerEmail.max);
    expect(codes.filter((c) => c === "too-many-attempts")).toHaveLength(12 - LIMITS.passwordFailuresPerEmail.max);
  });

  it(`of 8 link requests sent at once, ${LIMITS.linkRequestsPerEmail.max} send an e-mail`, async () => {
    const email = `burst.${shop.slug}@mail.test`;
    await makeCustomerWithJobs(db, shop.id, { name: "Bo Burst", email, statuses: ["checked_in"] });
    const codes = await Promise.all(Array.from({ length: 8 }, () => failureOf(requestSignInLink({ email, ip: freshIp() }))));
    expect(codes.filter((c) => c === "no failure")).toHaveLength(LIMITS.linkRequestsPerEmail.max);
    expect(codes.filter((c) => c === "too-many-links")).toHaveLength(8 - LIMITS.linkRequestsPerEmail.max);
    await deliver();
    expect(await listMail(mail.url, { to: email })).toHaveLength(LIMITS.linkRequestsPerEmail.max);
  });
});

describe("the link request answers alike for known and unknown addresses", () => {
  it("the same answer, and only the known address gets a link; nothing is left behind for the other", async () => {
    const known = `known.${shop.slug}@mail.test`;
    const stranger = `stranger.${shop.slug}@mail.test`;
    await makeCustomerWithJobs(db, shop.id, { name: "Kit Known", email: known, statuses: ["checked_in"] });
    const answers = await Promise.all([known, stranger].map((email) => requestSignInLink({ email, ip: freshIp() }).then((value) => ({ value }), (error: unknown) => ({ error }))));
    expect(answers[0]).toEqual(answers[1]);
    expect(answers[0]).toEqual({ value: undefined });
    await deliver();
    expect(await listMail(mail.url, { to: known })).toHaveLength(1);
    expect(await listMail(mail.url, { to: stranger })).toHaveLength(0);
    expect(await db("sign_in_links").where({ email: stranger }).first()).toBeUndefined();
    expect(await db("outbox").where({ to_email: stranger }).first()).toBeUndefined();
  });

  it("a staff address is answered the same and gets no link: staff sign in with their password", async () => {
    const email = shop.staff.owner!.email;
    expect(await failureOf(requestSignInLink({ email, ip: freshIp() }))).toBe("no failure");
    await deliver();
    expect(await listMail(mail.url, { to: email })).toHaveLength(0);
  });

  it(`the per-address limit (${LIMITS.linkRequestsPerEmail.max} in ${LIMITS.linkRequestsPerEmail.minutes} minutes) is reached alike by both`, async () => {
    const known = `eager.${shop.slug}@mail.test`;
    const stranger = `eager-stranger.${shop.slug}@mail.test`;
    await makeCustomerWithJobs(db, shop.id, { name: "Eli Eager", email: known, statuses: ["checked_in"] });
    for (const email of [known, stranger]) {
      for (let i = 0; i < LIMITS.linkRequestsPerEmail.max; i++) expect(await failureOf(requestSignInLink({ email, ip: freshIp() }))).toBe("no failure");
      expect(await failureOf(requestSignInLink({ email, ip: freshIp() }))).toBe("too-many-links");
    }
    await deliver();
    expect(await listMail(mail.url, { to: known })).toHaveLength(LIMITS.linkRequestsPerEmail.max);
  });
});

describe("owner sign-in links, through the outbox", () => {
  const linkFrom = async (to: string, since: Date) => {
    const message = await waitForMail({ baseUrl: mail.url, to, since, subjectIncludes: "sign-in link" });
    const link = message.links.find((l) => l.includes("/sign-in/link?token="));
    expect(link, "sign-in link in the e-mail").toBeDefined();
    return new URL(link!).searchParams.get("token")!;
  };
  const request = async (email: string) => {
    const since = new Date();
    await requestSignInLink({ email, ip: freshIp() });
    await deliver();
    return linkFrom(email, since);
  };

  it("mails a one-time link that signs the owner in once and links their customer records", async () => {
    const email = `owner.${shop.slug}@mail.test`;
    const { customerId } = await makeCustomerWithJobs(db, shop.id, { name: "Lio Marsh", email, statuses: ["in_progress"] });
    const token = await request(email);
    expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/);
    // Only the hash is stored.
    expect(await db("sign_in_links").where({ email }).whereRaw("token_hash = ?", [token]).first()).toBeUndefined();

    const user = await consumeSignInLink({ token, ip: freshIp() });
    expect(user.email).toBe(email);
    expect(user.name).toBe("Lio Marsh");
    expect((await db("customers").where({ id: customerId }).first())?.user_id).toBe(user.id);

    expect(await failureOf(consumeSignInLink({ token, ip: freshIp() }))).toBe("link-used");
  });

  it("two clicks at the same moment sign in once", async () => {
    const email = `twice.${shop.slug}@mail.test`;
    await makeCustomerWithJobs(db, shop.id, { name: "Pat Twice", email, statuses: ["checked_in"] });
    const token = await request(email);
    const results = await Promise.allSettled([consumeSignInLink({ token, ip: freshIp() }), consumeSignInLink({ token, ip: freshIp() })]);
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
  });

  it("refuses an expired link and an unknown token, each with its own reason", async () => {
    const email = `late.${shop.slug}@mail.test`;
    await makeCustomerWithJobs(db, shop.id, { name: "Rae Late", email, statuses: ["checked_in"] });
    const token = await request(email);
    await db("sign_in_links").where({ email }).update({ expires_at: db.raw("NOW() - INTERVAL 1 MINUTE") });
    expect(await failureOf(consumeSignInLink({ token, ip: freshIp() }))).toBe("link-expired");
    expect(await failureOf(consumeSignInLink({ token: "x".repeat(43), ip: freshIp() }))).toBe("link-unknown");
  });

  it("two first sign-ins at the same moment end with one account", async () => {
    const email = `first.${shop.slug}@mail.test`;
    await makeCustomerWithJobs(db, shop.id, { name: "Fay First", email, statuses: ["checked_in"] });
    const tokens = [await request(email), await request(email)];
    const users = await Promise.all(tokens.map((token) => consumeSignInLink({ token, ip: freshIp() })));
    expect(users[0]!.id).toBe(users[1]!.id);
    expect(await db("users").where({ email }).count({ n: "*" }).first()).toEqual({ n: 1 });
  });

  it("a link asked for while the mail service fails is sent once it is back, and still works", async () => {
    const email = `unlucky.${shop.slug}@mail.test`;
    await makeCustomerWithJobs(db, shop.id, { name: "Una Lucky", email, statuses: ["checked_in"] });
    await failNext(mail.url, 3, 500);
    const since = new Date();
    // The owner is told the link is on its way; the outbox holds it at sign-in priority until the link's end.
    expect(await failureOf(requestSignInLink({ email, ip: freshIp() }))).toBe("no failure");
    const row = await db("outbox").where({ to_email: email }).first();
    const link = await db("sign_in_links").where({ email }).first();
    expect(row?.priority).toBeGreaterThan(0);
    expect(Math.abs(row!.send_before!.getTime() - link!.expires_at.getTime())).toBeLessThan(5_000);
    for (let i = 0; i < 3; i++) expect(await runOutboxOnce({ priorityBackoffBaseMs: 0, priorityBackoffMaxMs: 0 }, "priority")).toMatchObject({ claimed: 1, retrying: 1 });
    expect(await listMail(mail.url, { to: email })).toHaveLength(0);
    // Mail is back.
    expect(await runOutboxOnce({}, "priority")).toMatchObject({ claimed: 1, sent: 1 });
    const token = await linkFrom(email, since);
    expect((await consumeSignInLink({ token, ip: freshIp() })).email).toBe(email);
  });

  it("a link whose time ran out while mail was down is not sent at all", async () => {
    const email = `too-late.${shop.slug}@mail.test`;
    await makeCustomerWithJobs(db, shop.id, { name: "Tom Late", email, statuses: ["checked_in"] });
    await requestSignInLink({ email, ip: freshIp() });
    await db("outbox").where({ to_email: email }).update({ send_before: db.raw("NOW(3) - INTERVAL 1 SECOND") });
    await deliver();
    expect(await listMail(mail.url, { to: email })).toHaveLength(0);
    expect((await db("outbox").where({ to_email: email }).first())?.state).toBe("dead");
  });

  it("the worker's fast lane takes sign-in links only, and sends one within a second or two", async () => {
    const email = `prompt.${shop.slug}@mail.test`;
    await makeCustomerWithJobs(db, shop.id, { name: "Pru Prompt", email, statuses: ["checked_in"] });
    // Ordinary mail waits for the ordinary rounds (every minute here); the link doesn't.
    const digestTo = `digest.${shop.slug}@mail.test`;
    const worker = startOutboxWorker({ intervalMs: 60_000, priorityIntervalMs: 200 });
    try {
      await new Promise((resolve) => setTimeout(resolve, 500)); // past the first ordinary round
      await db.transaction((tx) => enqueueMail(tx, { shopId: shop.id, kind: "test", to: digestTo, subject: "Ordinary", html: "<p>x</p>", text: "x" }));
      const since = new Date();
      await requestSignInLink({ email, ip: freshIp() });
      const message = await waitForMail({ baseUrl: mail.url, to: email, since, subjectIncludes: "sign-in link", timeoutMs: 2_000 });
      expect(message.links.some((l) => l.includes("/sign-in/link?token="))).toBe(true);
      expect(await listMail(mail.url, { to: digestTo })).toHaveLength(0);
    } finally {
      await worker.stop();
    }
  });
});

describe("housekeeping", () => {
  it("forgets attempts and links older than a day, and keeps recent ones", async () => {
    const { pruneSignInRecords } = await import("@/db/queries/sign-in");
    const subject = `old.${shop.slug}@mail.test`;
    await db("auth_attempts").insert([
      { kind: "password", subject, succeeded: false, created_at: db.raw("NOW() - INTERVAL 25 HOUR") },
      { kind: "password", subject, succeeded: false },
    ]);
    await db("sign_in_links").insert({ email: subject, token_hash: "f".repeat(64), expires_at: db.raw("NOW() - INTERVAL 25 HOUR") });
    await pruneSignInRecords({ olderThanHours: 24 });
    expect(await db("auth_attempts").where({ subject }).count({ n: "*" }).first()).toEqual({ n: 1 });
    expect(await db("sign_in_links").where({ email: subject }).first()).toBeUndefined();
  });
});
