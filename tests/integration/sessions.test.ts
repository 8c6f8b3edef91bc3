import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { deactivateStaff, setStaffRole } from "@/db/queries/staff";
import { transaction } from "@/db/transaction";
import { changePassword, countLiveSessions, endEverySession, endSession, endUserSessions, pruneSessions, startSession } from "@/db/queries/sessions";
import { getActorBySession } from "@/db/queries/users";
import { sameAppPath } from "@/lib/server/auth";
import { makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";

// Server-side sessions behind the JWT cookie: what getActor (lib/server/actor.ts) checks on
// every request. The cookie itself is next-auth's; here, the rows it names.
let db: Knex;
let shop: Awaited<ReturnType<typeof makeShop>>;
const DAY = 24 * 60 * 60;
const pool = globalThis as { benchsideDb?: Knex };

beforeAll(async () => {
  db = testKnex();
  shop = await makeShop(db, { label: "sessions", roles: ["owner", "service_writer", "technician"] });
});
afterAll(async () => {
  await pool.benchsideDb?.destroy();
  await db?.destroy();
});

describe("a live session", () => {
  it("gives the person and their shop roles in one query, with how they signed in", async () => {
    const owner = shop.staff.owner!;
    const sessionId = await startSession({ userId: owner.id, method: "password", maxAgeSeconds: DAY });
    expect(sessionId).toMatch(/^[0-9a-f]{32}$/);
    const queries: string[] = [];
    const count = (q: { sql: string }) => queries.push(q.sql);
    const knex = pool.benchsideDb!;
    knex.on("query", count);
    const live = await getActorBySession({ userId: owner.id, sessionId });
    knex.off("query", count);
    expect(queries).toHaveLength(1);
    expect(live).toEqual({
      method: "password",
      actor: { userId: owner.id, email: owner.email, name: expect.any(String), memberships: [{ shopId: shop.id, shopSlug: shop.slug, shopName: expect.any(String), role: "owner" }] },
    });
  });

  it("works for someone with no shop role (a machine owner by link)", async () => {
    const [userId] = await db("users").insert({ email: `owner.${shop.slug}@mail.test`, name: "Nell Ashby" });
    const sessionId = await startSession({ userId: Number(userId), method: "link", maxAgeSeconds: DAY });
    const live = await getActorBySession({ userId: Number(userId), sessionId });
    expect(live?.method).toBe("link");
    expect(live?.actor.memberships).toEqual([]);
  });

  it("is refused under another person's id, or when unknown", async () => {
    const sessionId = await startSession({ userId: shop.staff.owner!.id, method: "password", maxAgeSeconds: DAY });
    expect(await getActorBySession({ userId: shop.staff.technician!.id, sessionId })).toBeNull();
    expect(await getActorBySession({ userId: shop.staff.owner!.id, sessionId: "0".repeat(32) })).toBeNull();
  });

  it("ends at its absolute end, whatever the cookie says", async () => {
    const sessionId = await startSession({ userId: shop.staff.owner!.id, method: "password", maxAgeSeconds: DAY });
    await db("user_sessions").where({ id: sessionId }).update({ expires_at: db.raw("NOW(3) - INTERVAL 1 SECOND") });
    expect(await getActorBySession({ userId: shop.staff.owner!.id, sessionId })).toBeNull();
  });
});

describe("ending sessions", () => {
  it("signing out ends that session only", async () => {
    const userId = shop.staff.technician!.id;
    const phone = await startSession({ userId, method: "password", maxAgeSeconds: DAY });
    const bench = await startSession({ userId, method: "password", maxAgeSeconds: DAY });
    await endSession({ sessionId: phone, reason: "sign-out" });
    expect(await getActorBySession({ userId, sessionId: phone })).toBeNull();
    expect(await getActorBySession({ userId, sessionId: bench })).not.toBeNull();
    expect((await db("user_sessions").where({ id: phone }).first())?.ended_reason).toBe("sign-out");
    // Twice is harmless and keeps the first reason.
    await endSession({ sessionId: phone, reason: "everywhere" });
    expect((await db("user_sessions").where({ id: phone }).first())?.ended_reason).toBe("sign-out");
  });

  it("sign out everywhere ends every session of the person and no one else's", async () => {
    const people = await makeShop(db, { label: "everywhere", roles: ["owner", "service_writer"] });
    const me = people.staff.owner!.id;
    const colleague = people.staff.service_writer!.id;
    const mine = await Promise.all([1, 2, 3].map(() => startSession({ userId: me, method: "password", maxAgeSeconds: DAY })));
    const theirs = await startSession({ userId: colleague, method: "password", maxAgeSeconds: DAY });
    expect(await endEverySession({ userId: me })).toBe(3);
    for (const sessionId of mine) expect(await getActorBySession({ userId: me, sessionId })).toBeNull();
    expect(await countLiveSessions({ userId: me })).toBe(0);
    expect(await getActorBySession({ userId: colleague, sessionId: theirs })).not.toBeNull();
  });

  it("a change (a new password, a lost role) ends the other sessions with it, in its transaction", async () => {
    const people = await makeShop(db, { label: "change", roles: ["technician"] });
    const userId = people.staff.technician!.id;
    const here = await startSession({ userId, method: "password", maxAgeSeconds: DAY });
    const elsewhere = await startSession({ userId, method: "password", maxAgeSeconds: DAY });
    // Rolled back with the change: nothing ends.
    await expect(
      db.transaction(async (tx) => {
        await endUserSessions(tx, { userId, reason: "password", keep: here });
        throw new Error("the password change failed");
      }),
    ).rejects.toThrow("the password change failed");
    expect(await countLiveSessions({ userId })).toBe(2);
    // Committed: the other session ends, the one that made the change stays.
    await db.transaction((tx) => endUserSessions(tx, { userId, reason: "password", keep: here }));
    expect(await getActorBySession({ userId, sessionId: here })).not.toBeNull();
    expect(await getActorBySession({ userId, sessionId: elsewhere })).toBeNull();
    expect((await db("user_sessions").where({ id: elsewhere }).first())?.ended_reason).toBe("password");
  });

  it("deleting the person ends their sessions with them", async () => {
    const [userId] = await db("users").insert({ email: `gone.${shop.slug}@mail.test`, name: "Gone" });
    const sessionId = await startSession({ userId: Number(userId), method: "link", maxAgeSeconds: DAY });
    await db("users").where({ id: userId }).delete();
    expect(await db("user_sessions").where({ id: sessionId }).first()).toBeUndefined();
  });

  it("housekeeping forgets sessions ended or expired over a day ago, and keeps the rest", async () => {
    const userId = shop.staff.owner!.id;
    const old = await startSession({ userId, method: "password", maxAgeSeconds: DAY });
    const recent = await startSession({ userId, method: "password", maxAgeSeconds: DAY });
    await db("user_sessions").where({ id: old }).update({ ended_at: db.raw("NOW(3) - INTERVAL 25 HOUR") });
    await endSession({ sessionId: recent, reason: "sign-out" });
    await pruneSessions({ olderThanHours: 24 });
    expect(await db("user_sessions").where({ id: old }).first()).toBeUndefined();
    expect(await db("user_sessions").where({ id: recent }).first()).toBeDefined();
  });
});

describe("account changes end sessions with them", () => {
  it("a new password ends every other session, in the same transaction, and keeps the one that changed it", async () => {
    const userId = shop.staff.technician!.id;
    const here = await startSession({ userId, method: "password", maxAgeSeconds: DAY });
    const phone = await startSession({ userId, method: "password", maxAgeSeconds: DAY });
    expect(await changePassword({ userId, passwordHash: "$2b$10$abcdefghijklmnopqrstuu5bIoYxSKdVH4ZlOEpUfVeUl6tyAHXS2", keep: here })).toBeGreaterThanOrEqual(1);
    expect(await getActorBySession({ userId, sessionId: phone })).toBeNull();
    expect(await getActorBySession({ userId, sessionId: here })).not.toBeNull();
    expect((await db("user_sessions").where({ id: phone }).first("ended_reason"))?.ended_reason).toBe("password");
  });

  it("a role change or a deactivation ends the person's sessions; nothing else's", async () => {
    const writer = shop.staff.service_writer!.id;
    const owner = shop.staff.owner!.id;
    const writerSession = await startSession({ userId: writer, method: "password", maxAgeSeconds: DAY });
    const ownerSession = await startSession({ userId: owner, method: "password", maxAgeSeconds: DAY });
    expect(await transaction((tx) => setStaffRole(tx, { shopId: shop.id, userId: writer, role: "technician" }))).toBe(true);
    expect(await getActorBySession({ userId: writer, sessionId: writerSession })).toBeNull();
    const again = await startSession({ userId: writer, method: "password", maxAgeSeconds: DAY });
    expect((await getActorBySession({ userId: writer, sessionId: again }))?.actor.memberships.map((m) => m.role)).toEqual(["technician"]);
    expect(await transaction((tx) => deactivateStaff(tx, { shopId: shop.id, userId: writer }))).toBe(true);
    expect(await getActorBySession({ userId: writer, sessionId: again })).toBeNull();
    expect((await db("user_sessions").where({ id: again }).first("ended_reason"))?.ended_reason).toBe("deactivated");
    // Already off the staff: nothing more to change, and the owner was never touched.
    expect(await transaction((tx) => deactivateStaff(tx, { shopId: shop.id, userId: writer }))).toBe(false);
    // The last active owner can't be taken off the staff or demoted.
    await expect(transaction((tx) => deactivateStaff(tx, { shopId: shop.id, userId: owner }))).rejects.toMatchObject({ code: "conflict" });
    await expect(transaction((tx) => setStaffRole(tx, { shopId: shop.id, userId: owner, role: "technician" }))).rejects.toMatchObject({ code: "conflict" });
    expect(await getActorBySession({ userId: owner, sessionId: ownerSession })).not.toBeNull();
  });
});

describe("where signing in or out sends you", () => {
  const base = "http://localhost:3110";
  it.each([
    ["/shop", "/shop"],
    ["/my/jobs/abc?x=1#top", "/my/jobs/abc?x=1#top"],
    [`${base}/shop/copper-gulch`, "/shop/copper-gulch"],
    // Another host (a forged X-Forwarded-Host would have made the base this), protocol-relative, backslash, control characters.
    ["http://evil.test/shop", "/"],
    ["//evil.test/shop", "/"],
    ["/\\evil.test", "/"],
    ["/\t/evil.test", "/"],
    [`${base}//evil.test`, "/"],
    ["javascript:alert(1)", "/"],
    ["not a url", "/"],
  ])("%s → %s", (url, expected) => {
    expect(sameAppPath(url, base)).toBe(expected);
  });
});
