import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { countLiveSessions, startSession } from "@/db/queries/sessions";
import { RESET_LIMITS, changeOwnPassword, requestPasswordReset, resetPassword, viewPasswordReset } from "@/lib/server/password-reset";
import { checkPassword } from "@/lib/server/sign-in";
import { makeShop } from "../support/fixtures";
import { freshDatabase } from "../support/db";
import { refusalOf } from "../support/refusal";
import { dropAppDatabase, freshAppDatabase } from "../support/mail-world";

// Forgotten and changed passwords (issue 16 §3). The reset e-mail is read from its outbox row
// (no worker runs here), so this file has a database of its own.
const OLD = "old tyre levers in the drawer";
const NEW = "new chain and sprockets fitted";
let fresh: Awaited<ReturnType<typeof freshDatabase>>;
let db: Knex;
let ipCounter = 0;
const freshIp = () => `192.0.2.${++ipCounter}`; // documentation range (RFC 5737)

const codeOf = async (work: Promise<unknown>) => (await refusalOf(work)).code;
const mailsTo = (to: string) => db("outbox").where({ to_email: to }).orderBy("id");
const tokenIn = (text: unknown) => /\/sign-in\/reset\?token=([A-Za-z0-9_-]{43})/.exec(String(text))?.[1];

beforeAll(async () => {
  ({ fresh, k: db } = await freshAppDatabase("http://localhost:3999"));
});
afterAll(() => dropAppDatabase(fresh));

describe("a forgotten password", () => {
  it("is reset by an e-mailed link, end to end: every session ends, the new password works, the old doesn't", async () => {
    const shop = await makeShop(db, { label: "reset", roles: ["owner", "technician"], password: OLD });
    const tech = shop.staff.technician!;
    await startSession({ userId: tech.id, method: "password", maxAgeSeconds: 3600 });
    await startSession({ userId: tech.id, method: "password", maxAgeSeconds: 3600 });

    await requestPasswordReset({ email: tech.email, ip: freshIp() });
    const [mail] = await mailsTo(tech.email);
    expect(mail).toMatchObject({ kind: "password-reset", priority: 10 });
    const token = tokenIn(mail!.text)!;
    expect(token).toBeDefined();
    expect(await db("password_resets").where({ token_hash: token }).first()).toBeUndefined(); // only the hash is kept
    expect(await viewPasswordReset({ token, ip: freshIp() })).toMatchObject({ ok: true, email: tech.email });

    // A common password is refused, and the link still works afterwards.
    expect(await codeOf(resetPassword({ token, password: "1qaz2wsx3edc", ip: freshIp() }))).toBe("invalid");
    const done = await resetPassword({ token, password: NEW, ip: freshIp() });
    expect(done).toMatchObject({ ok: true, sessionsEnded: 2 });
    expect(await countLiveSessions({ userId: tech.id })).toBe(0);
    expect(await codeOf(checkPassword({ email: tech.email, password: OLD, ip: freshIp() }))).toBe("wrong-credentials");
    expect((await checkPassword({ email: tech.email, password: NEW, ip: freshIp() })).id).toBe(tech.id);

    // Used once only.
    expect(await codeOf(resetPassword({ token, password: "another long passphrase", ip: freshIp() }))).toBe("conflict");
  });

  it("answers the same for an unknown address, and mails nothing", async () => {
    const email = "nobody.here@shop.test";
    await expect(requestPasswordReset({ email, ip: freshIp() })).resolves.toBeUndefined();
    expect(await mailsTo(email)).toEqual([]);
  });

  it("is limited per address, known or not, with the same answer", async () => {
    const shop = await makeShop(db, { label: "reset-limit", roles: ["owner"], password: OLD });
    for (const email of [shop.staff.owner!.email, `ghost.${shop.slug}@shop.test`]) {
      for (let i = 0; i < RESET_LIMITS.requestsPerEmail.max; i++) await requestPasswordReset({ email, ip: freshIp() });
      expect(await codeOf(requestPasswordReset({ email, ip: freshIp() }))).toBe("rate_limited");
    }
    expect(await mailsTo(shop.staff.owner!.email)).toHaveLength(RESET_LIMITS.requestsPerEmail.max);
  });

  it("refuses an expired link", async () => {
    const shop = await makeShop(db, { label: "reset-late", roles: ["owner"], password: OLD });
    const email = shop.staff.owner!.email;
    await requestPasswordReset({ email, ip: freshIp() });
    const token = tokenIn((await mailsTo(email))[0]!.text)!;
    await db("password_resets").where({ user_id: shop.staff.owner!.id }).update({ expires_at: db.raw("NOW(3) - INTERVAL 1 SECOND") });
    expect(await viewPasswordReset({ token, ip: freshIp() })).toEqual({ ok: false, reason: "expired" });
    expect(await codeOf(resetPassword({ token, password: NEW, ip: freshIp() }))).toBe("conflict");
    expect((await checkPassword({ email, password: OLD, ip: freshIp() })).id).toBe(shop.staff.owner!.id);
  });
});

describe("changing one's own password", () => {
  it("needs the current password and ends every other session, keeping this one", async () => {
    const shop = await makeShop(db, { label: "change", roles: ["owner"], password: OLD });
    const owner = shop.staff.owner!;
    const here = await startSession({ userId: owner.id, method: "password", maxAgeSeconds: 3600 });
    await startSession({ userId: owner.id, method: "password", maxAgeSeconds: 3600 });
    expect(await codeOf(changeOwnPassword({ userId: owner.id, sessionId: here, current: "not it at all", next: NEW }))).toBe("invalid");
    expect(await codeOf(changeOwnPassword({ userId: owner.id, sessionId: here, current: OLD, next: "football" }))).toBe("invalid");
    expect(await changeOwnPassword({ userId: owner.id, sessionId: here, current: OLD, next: NEW })).toBe(1);
    expect(await db("user_sessions").where({ user_id: owner.id }).whereNull("ended_at").pluck("id")).toEqual([here]);
    expect((await checkPassword({ email: owner.email, password: NEW, ip: freshIp() })).id).toBe(owner.id);
  });

  it("stops guessing the current password after a few tries", async () => {
    const shop = await makeShop(db, { label: "change-limit", roles: ["owner"], password: OLD });
    const owner = shop.staff.owner!;
    for (let i = 0; i < RESET_LIMITS.changeFailuresPerUser.max; i++) {
      expect(await codeOf(changeOwnPassword({ userId: owner.id, sessionId: null, current: `guess ${i}`, next: NEW }))).toBe("invalid");
    }
    expect(await codeOf(changeOwnPassword({ userId: owner.id, sessionId: null, current: OLD, next: NEW }))).toBe("rate_limited");
  });
});
