import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { startSession } from "@/db/queries/sessions";
import { deactivateStaff, listStaffMembers, reactivateStaff, setStaffRole } from "@/db/queries/staff";
import { getActorBySession } from "@/db/queries/users";
import { transaction } from "@/db/transaction";
import { hashPassword, verifyPassword } from "@/lib/server/password";
import { checkPassword } from "@/lib/server/sign-in";
import { TOKEN_FAILURES_PER_IP, acceptInvitation, inviteStaff, viewInvite } from "@/lib/server/staff-invites";
import { makeShop } from "../support/fixtures";
import { freshDatabase } from "../support/db";
import { refusalOf } from "../support/refusal";
import { dropAppDatabase, freshAppDatabase } from "../support/mail-world";

// Staff accounts (issue 16 §3): invitations by e-mail, roles, deactivation, the last owner. The
// outbox is read directly (no worker runs here), so this file has a database of its own.
const GOOD = "grey primer on the fuel tank";
let fresh: Awaited<ReturnType<typeof freshDatabase>>;
let db: Knex;
let ipCounter = 0;
const freshIp = () => `203.0.113.${++ipCounter}`; // documentation range (RFC 5737)

const codeOf = async (work: Promise<unknown>) => (await refusalOf(work)).code;

/** The token in the newest invitation e-mail to `to`, read from the outbox row. */
async function tokenMailedTo(to: string, pathPart: string) {
  const row = await db("outbox").where({ to_email: to }).orderBy("id", "desc").first("text", "kind");
  const token = new RegExp(`${pathPart}\\?token=([A-Za-z0-9_-]{43})`).exec(String(row?.text))?.[1];
  if (!token) throw new Error(`no link to ${pathPart} mailed to ${to}`);
  return token;
}

async function signInAs(email: string, password: string) {
  const user = await checkPassword({ email, password, ip: freshIp() });
  const sessionId = await startSession({ userId: user.id, method: "password", maxAgeSeconds: 3600 });
  return { user, sessionId };
}

beforeAll(async () => {
  ({ fresh, k: db } = await freshAppDatabase("http://localhost:3999"));
});
afterAll(() => dropAppDatabase(fresh));

describe("an invitation", () => {
  it("is mailed with a link; accepting it sets the password and the person signs in with the role", async () => {
    const shop = await makeShop(db, { label: "invite", roles: ["owner"] });
    const email = `new.tech.${shop.slug}@shop.test`;
    await inviteStaff({ shopId: shop.id, shopName: "Test", email, name: "Rosalind Vey", role: "technician", invitedBy: shop.staff.owner!.id });
    const token = await tokenMailedTo(email, "/join");
    // Only the token's hash is stored.
    expect(await db("staff_invites").where({ token_hash: token }).first()).toBeUndefined();

    const seen = await viewInvite({ token, ip: freshIp() });
    expect(seen).toMatchObject({ ok: true, invite: { email, role: "technician", hasPassword: false } });

    // A common password is refused before the invitation is used up.
    expect(await codeOf(acceptInvitation({ token, name: "Rosalind Vey", password: "password123", ip: freshIp() }))).toBe("invalid");
    const accepted = await acceptInvitation({ token, name: "Rosalind Vey", password: GOOD, ip: freshIp() });
    expect(accepted).toMatchObject({ ok: true, setPassword: true, shopId: shop.id });

    const { user, sessionId } = await signInAs(email, GOOD);
    const live = await getActorBySession({ userId: user.id, sessionId });
    expect(live?.actor.memberships).toEqual([expect.objectContaining({ shopId: shop.id, role: "technician" })]);
  });

  it("works once, and not after it expired or was withdrawn", async () => {
    const shop = await makeShop(db, { label: "invite-once", roles: ["owner"] });
    const invite = async (email: string) => {
      await inviteStaff({ shopId: shop.id, shopName: "Test", email, name: "Ned Quill", role: "service_writer", invitedBy: shop.staff.owner!.id });
      return tokenMailedTo(email, "/join");
    };
    const used = await invite(`once.${shop.slug}@shop.test`);
    await acceptInvitation({ token: used, name: "Ned Quill", password: GOOD, ip: freshIp() });
    expect(await codeOf(acceptInvitation({ token: used, name: "Ned Quill", password: GOOD, ip: freshIp() }))).toBe("conflict");
    expect(await viewInvite({ token: used, ip: freshIp() })).toEqual({ ok: false, reason: "used" });

    const late = await invite(`late.${shop.slug}@shop.test`);
    await db("staff_invites").where({ email: `late.${shop.slug}@shop.test` }).update({ expires_at: db.raw("NOW(3) - INTERVAL 1 SECOND") });
    expect(await codeOf(acceptInvitation({ token: late, name: "Ned", password: GOOD, ip: freshIp() }))).toBe("conflict");
    expect(await db("users").where({ email: `late.${shop.slug}@shop.test` }).first()).toBeUndefined();

    // A second invitation to the same address withdraws the first.
    const first = await invite(`twice.${shop.slug}@shop.test`);
    await invite(`twice.${shop.slug}@shop.test`);
    expect(await codeOf(acceptInvitation({ token: first, name: "Ned", password: GOOD, ip: freshIp() }))).toBe("not_found");
  });

  it("adds the membership for someone who already has a password, and keeps that password", async () => {
    const home = await makeShop(db, { label: "invite-home", roles: ["owner", "technician"], password: GOOD });
    const other = await makeShop(db, { label: "invite-other", roles: ["owner"] });
    const tech = home.staff.technician!;
    const before = (await db("users").where({ id: tech.id }).first("password_hash"))!.password_hash;
    await inviteStaff({ shopId: other.id, shopName: "Other", email: tech.email, name: "Tech", role: "service_writer", invitedBy: other.staff.owner!.id });
    const token = await tokenMailedTo(tech.email, "/join");
    expect(await viewInvite({ token, ip: freshIp() })).toMatchObject({ ok: true, invite: { hasPassword: true } });
    expect(await acceptInvitation({ token, name: "Tech", password: undefined, ip: freshIp() })).toMatchObject({ ok: true, setPassword: false });
    expect((await db("users").where({ id: tech.id }).first("password_hash"))!.password_hash).toBe(before);
    const { sessionId } = await signInAs(tech.email, GOOD);
    const roles = (await getActorBySession({ userId: tech.id, sessionId }))!.actor.memberships.map((m) => [m.shopId, m.role]);
    expect(roles).toEqual(expect.arrayContaining([[home.id, "technician"], [other.id, "service_writer"]]));
  });

  it("isn't sent to someone already on the staff", async () => {
    const shop = await makeShop(db, { label: "invite-dup", roles: ["owner", "technician"] });
    expect(await codeOf(inviteStaff({ shopId: shop.id, shopName: "T", email: shop.staff.technician!.email, name: "T", role: "owner", invitedBy: shop.staff.owner!.id }))).toBe("conflict");
  });

  it("links are rate-limited per network address", async () => {
    const ip = freshIp();
    const wrong = "A".repeat(43);
    for (let i = 0; i < TOKEN_FAILURES_PER_IP.max; i++) expect(await viewInvite({ token: wrong, ip })).toEqual({ ok: false, reason: "unknown" });
    expect(await codeOf(viewInvite({ token: wrong, ip }))).toBe("rate_limited");
  });
});

describe("roles and deactivation", () => {
  it("a role change ends the person's sessions; the next request carries the new role", async () => {
    const shop = await makeShop(db, { label: "role", roles: ["owner", "service_writer"], password: GOOD });
    const writer = shop.staff.service_writer!;
    const { sessionId } = await signInAs(writer.email, GOOD);
    expect(await transaction((tx) => setStaffRole(tx, { shopId: shop.id, userId: writer.id, role: "technician" }))).toBe(true);
    expect(await getActorBySession({ userId: writer.id, sessionId })).toBeNull();
    const again = await signInAs(writer.email, GOOD);
    expect((await getActorBySession({ userId: writer.id, sessionId: again.sessionId }))!.actor.memberships[0]!.role).toBe("technician");
  });

  it("a deactivated member is refused on the next request and can't sign in; reactivated, they can", async () => {
    const shop = await makeShop(db, { label: "deact-ui", roles: ["owner", "technician"], password: GOOD });
    const tech = shop.staff.technician!;
    const { sessionId } = await signInAs(tech.email, GOOD);
    await transaction((tx) => deactivateStaff(tx, { shopId: shop.id, userId: tech.id }));
    expect(await getActorBySession({ userId: tech.id, sessionId })).toBeNull();
    expect(await codeOf(signInAs(tech.email, GOOD))).toBe("wrong-credentials");
    expect((await listStaffMembers({ shopId: shop.id })).find((m) => m.userId === tech.id)?.deactivatedAt).toBeInstanceOf(Date);
    await transaction((tx) => reactivateStaff(tx, { shopId: shop.id, userId: tech.id }));
    const back = await signInAs(tech.email, GOOD);
    expect((await getActorBySession({ userId: tech.id, sessionId: back.sessionId }))!.actor.memberships[0]).toMatchObject({ shopId: shop.id, role: "technician" });
  });

  it("the last active owner can't be demoted or deactivated", async () => {
    const shop = await makeShop(db, { label: "last-owner", roles: ["owner", "technician"] });
    const owner = shop.staff.owner!.id;
    expect(await codeOf(transaction((tx) => setStaffRole(tx, { shopId: shop.id, userId: owner, role: "service_writer" })))).toBe("conflict");
    expect(await codeOf(transaction((tx) => deactivateStaff(tx, { shopId: shop.id, userId: owner })))).toBe("conflict");
    // A deactivated owner doesn't count as the second one.
    await db("memberships").where({ shop_id: shop.id, user_id: shop.staff.technician!.id }).update({ role: "owner", deactivated_at: db.fn.now(3) });
    expect(await codeOf(transaction((tx) => deactivateStaff(tx, { shopId: shop.id, userId: owner })))).toBe("conflict");
    expect((await db("memberships").where({ shop_id: shop.id, user_id: owner }).first())).toMatchObject({ role: "owner", deactivated_at: null });
  });

  it("two owners demoting each other at the same moment leave one owner", async () => {
    for (let round = 0; round < 5; round++) {
      const shop = await makeShop(db, { label: `owners-${round}`, roles: ["owner", "technician"] });
      const a = shop.staff.owner!.id;
      const b = shop.staff.technician!.id;
      await db("memberships").where({ shop_id: shop.id, user_id: b }).update({ role: "owner" });
      const demote = (userId: number) => transaction((tx) => setStaffRole(tx, { shopId: shop.id, userId, role: "technician" }));
      const deactivate = (userId: number) => transaction((tx) => deactivateStaff(tx, { shopId: shop.id, userId }));
      const results = await Promise.allSettled(round % 2 ? [demote(a), demote(b)] : [demote(a), deactivate(b)]);
      expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
      expect(results.filter((r) => r.status === "rejected").map((r) => (r as PromiseRejectedResult).reason.code)).toEqual(["conflict"]);
      const owners = await db("memberships").where({ shop_id: shop.id, role: "owner" }).whereNull("deactivated_at");
      expect(owners).toHaveLength(1);
    }
  });
});

describe("password hashing", () => {
  it("never truncates: passwords past bcrypt's 72 bytes differ in their tail", async () => {
    // NIST SP 800-63B §5.1.1.2: "Truncation of the secret SHALL NOT be performed."
    const long = "the carburettor float needle sticks when the bike sits all winter ".repeat(2);
    const hash = await hashPassword(`${long}A`);
    expect(await verifyPassword(`${long}A`, hash)).toBe(true);
    expect(await verifyPassword(`${long}B`, hash)).toBe(false);
    // NFKC: the ligature "ﬁ" and "fi" are the same password.
    expect(await verifyPassword("ﬁlter the fuel twice", await hashPassword("filter the fuel twice"))).toBe(true);
  });
});
