import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { createMailFake, type MailFake } from "@/fakes/mail/server";
import { LIMITS, SIGN_IN_FAILURES, checkPassword, consumeSignInLink, requestSignInLink } from "@/lib/server/sign-in";
import { AppError } from "@/lib/errors";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";
import { failNext, listMail, waitForMail } from "../support/mailbox";

const PASSWORD = "correct horse battery";
let db: Knex;
let mail: MailFake;
let shop: Awaited<ReturnType<typeof makeShop>>;
let ipCounter = 0;
const freshIp = () => `198.51.100.${++ipCounter}`; // documentation range (RFC 5737), one per test

const failureOf = async (work: Promise<unknown>) => {
  try {
    await work;
  } catch (error) {
    return (error as { code?: string }).code;
  }
  return "no failure";
};

beforeAll(async () => {
  db = testKnex();
  mail = await createMailFake({ port: 0, dir: fs.mkdtempSync(path.join(os.tmpdir(), "bs-mail-")) });
  process.env.RESEND_BASE_URL = mail.url;
  process.env.RESEND_API_KEY = "re_test_key";
  process.env.APP_URL = "http://localhost:3999";
  shop = await makeShop(db, { label: "signin", roles: ["owner", "technician"], password: PASSWORD });
});
afterAll(async () => {
  await mail?.close();
  await db?.destroy();
});

describe("staff password sign-in", () => {
  it("accepts the right password", async () => {
    const user = await checkPassword({ email: shop.staff.owner!.email, password: PASSWORD, ip: freshIp() });
    expect(user.id).toBe(shop.staff.owner!.id);
  });

  it("names the problem: unknown address, wrong password", async () => {
    expect(await failureOf(checkPassword({ email: "nobody@nowhere.test", password: PASSWORD, ip: freshIp() }))).toBe("unknown-email");
    expect(await failureOf(checkPassword({ email: shop.staff.technician!.email, password: "nope", ip: freshIp() }))).toBe("wrong-password");
  });

  it(`locks an address after ${LIMITS.passwordFailuresPerEmail.max} failures, even for the right password`, async () => {
    const email = shop.staff.technician!.email;
    const ip = freshIp();
    // one failure already recorded above for this address
    for (let i = 1; i < LIMITS.passwordFailuresPerEmail.max; i++) expect(await failureOf(checkPassword({ email, password: "nope", ip }))).toBe("wrong-password");
    expect(await failureOf(checkPassword({ email, password: PASSWORD, ip }))).toBe("too-many-attempts");
    expect(SIGN_IN_FAILURES["too-many-attempts"]).toMatch(/wait 15 minutes/i);
  });
});

describe("limits hold under simultaneous requests", () => {
  it(`of 12 wrong passwords sent at once, ${LIMITS.passwordFailuresPerEmail.max} are checked and the rest told to wait`, async () => {
    const burst = await makeShop(db, { label: "burst", roles: ["technician"], password: PASSWORD });
    const email = burst.staff.technician!.email;
    const ip = freshIp();
    const codes = await Promise.all(Array.from({ length: 12 }, () => failureOf(checkPassword({ email, password: "guess", ip }))));
    expect(codes.filter((c) => c === "wrong-password")).toHaveLength(LIMITS.passwordFailuresPerEmail.max);
    expect(codes.filter((c) => c === "too-many-attempts")).toHaveLength(12 - LIMITS.passwordFailuresPerEmail.max);
  });

  it(`of 8 link requests sent at once, ${LIMITS.linkRequestsPerEmail.max} send an e-mail`, async () => {
    const email = `burst.${shop.slug}@mail.test`;
    await makeCustomerWithJobs(db, shop.id, { name: "Bo Burst", email, statuses: ["checked_in"] });
    const codes = await Promise.all(Array.from({ length: 8 }, () => failureOf(requestSignInLink({ email, ip: freshIp() }))));
    expect(codes.filter((c) => c === "no failure")).toHaveLength(LIMITS.linkRequestsPerEmail.max);
    expect(codes.filter((c) => c === "too-many-links")).toHaveLength(8 - LIMITS.linkRequestsPerEmail.max);
    expect(await listMail(mail.url, { to: email })).toHaveLength(LIMITS.linkRequestsPerEmail.max);
  });
});

describe("owner sign-in links", () => {
  const linkFrom = async (to: string, since: Date) => {
    const message = await waitForMail({ baseUrl: mail.url, to, since, subjectIncludes: "sign-in link" });
    const link = message.links.find((l) => l.includes("/sign-in/link?token="));
    expect(link, "sign-in link in the e-mail").toBeDefined();
    return new URL(link!).searchParams.get("token")!;
  };

  it("mails a one-time link that signs the owner in once and links their customer records", async () => {
    const email = `owner.${shop.slug}@mail.test`;
    const { customerId } = await makeCustomerWithJobs(db, shop.id, { name: "Lio Marsh", email, statuses: ["in_progress"] });
    const since = new Date();
    await requestSignInLink({ email, ip: freshIp() });
    const token = await linkFrom(email, since);
    expect(token).toMatch(/^[A-Za-z0-9_-]{43}$/);
    // Only the hash is stored.
    expect(await db("sign_in_links").where({ email }).whereRaw("token_hash = ?", [token]).first()).toBeUndefined();

    const user = await consumeSignInLink({ token, ip: freshIp() });
    expect(user.email).toBe(email);
    expect(user.name).toBe("Lio Marsh");
    expect((await db("customers").where({ id: customerId }).first()).user_id).toBe(user.id);

    expect(await failureOf(consumeSignInLink({ token, ip: freshIp() }))).toBe("link-used");
  });

  it("two clicks at the same moment sign in once", async () => {
    const email = `twice.${shop.slug}@mail.test`;
    await makeCustomerWithJobs(db, shop.id, { name: "Pat Twice", email, statuses: ["checked_in"] });
    const since = new Date();
    await requestSignInLink({ email, ip: freshIp() });
    const token = await linkFrom(email, since);
    const results = await Promise.allSettled([consumeSignInLink({ token, ip: freshIp() }), consumeSignInLink({ token, ip: freshIp() })]);
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
  });

  it("refuses an expired link and an unknown token, each with its own reason", async () => {
    const email = `late.${shop.slug}@mail.test`;
    await makeCustomerWithJobs(db, shop.id, { name: "Rae Late", email, statuses: ["checked_in"] });
    const since = new Date();
    await requestSignInLink({ email, ip: freshIp() });
    const token = await linkFrom(email, since);
    await db("sign_in_links").where({ email }).update({ expires_at: db.raw("NOW() - INTERVAL 1 MINUTE") });
    expect(await failureOf(consumeSignInLink({ token, ip: freshIp() }))).toBe("link-expired");
    expect(await failureOf(consumeSignInLink({ token: "x".repeat(43), ip: freshIp() }))).toBe("link-unknown");
  });

  it("says so when nobody by that address has a job, and sends nothing", async () => {
    const email = `stranger.${shop.slug}@mail.test`;
    expect(await failureOf(requestSignInLink({ email, ip: freshIp() }))).toBe("unknown-customer");
    expect(await listMail(mail.url, { to: email })).toHaveLength(0);
  });

  it("never sends a link to a staff address: staff sign in with their password", async () => {
    const email = shop.staff.owner!.email;
    expect(await failureOf(requestSignInLink({ email, ip: freshIp() }))).toBe("unknown-customer");
    expect(await listMail(mail.url, { to: email })).toHaveLength(0);
  });

  it("two first sign-ins at the same moment end with one account", async () => {
    const email = `first.${shop.slug}@mail.test`;
    await makeCustomerWithJobs(db, shop.id, { name: "Fay First", email, statuses: ["checked_in"] });
    const tokens: string[] = [];
    for (let i = 0; i < 2; i++) {
      const since = new Date();
      await requestSignInLink({ email, ip: freshIp() });
      tokens.push(await linkFrom(email, since));
    }
    const users = await Promise.all(tokens.map((token) => consumeSignInLink({ token, ip: freshIp() })));
    expect(users[0]!.id).toBe(users[1]!.id);
    expect(await db("users").where({ email }).count({ n: "*" }).first()).toEqual({ n: 1 });
  });

  it(`sends at most ${LIMITS.linkRequestsPerEmail.max} links per address in ${LIMITS.linkRequestsPerEmail.minutes} minutes`, async () => {
    const email = `eager.${shop.slug}@mail.test`;
    await makeCustomerWithJobs(db, shop.id, { name: "Eli Eager", email, statuses: ["checked_in"] });
    for (let i = 0; i < LIMITS.linkRequestsPerEmail.max; i++) await requestSignInLink({ email, ip: freshIp() });
    expect(await failureOf(requestSignInLink({ email, ip: freshIp() }))).toBe("too-many-links");
    expect(await listMail(mail.url, { to: email })).toHaveLength(LIMITS.linkRequestsPerEmail.max);
  });

  it("when the mail service fails, says so and leaves no usable link behind", async () => {
    const email = `unlucky.${shop.slug}@mail.test`;
    await makeCustomerWithJobs(db, shop.id, { name: "Una Lucky", email, statuses: ["checked_in"] });
    await failNext(mail.url, 1, 500);
    const error = await requestSignInLink({ email, ip: freshIp() }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(AppError);
    expect((error as AppError).status).toBe(503);
    expect(await db("sign_in_links").where({ email }).count({ n: "*" }).first()).toEqual({ n: 0 });
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
