import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { startSession } from "@/db/queries/sessions";
import { listShopStaff, listShopTechnicians } from "@/db/queries/shops";
import { getActorBySession, getStaffSignIn } from "@/db/queries/users";
import { makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";

// A deactivated membership (memberships.deactivated_at, migration 20261204_13) gives no role: a
// session that outlived the deactivation acts with the person's other roles only, a password
// sign-in needs an active membership, and the staff lists leave the person out.
let db: Knex;
let shop: Awaited<ReturnType<typeof makeShop>>;
let other: Awaited<ReturnType<typeof makeShop>>;
const pool = globalThis as { benchsideDb?: Knex };

beforeAll(async () => {
  db = testKnex();
  shop = await makeShop(db, { label: "deact", roles: ["owner", "technician"], password: "pw" });
  other = await makeShop(db, { label: "deact-other", roles: ["owner"] });
  const tech = shop.staff.technician!.id;
  // The technician also works at the other shop, and stays there.
  await db("memberships").insert({ shop_id: other.id, user_id: tech, role: "technician" });
  await db("memberships").where({ shop_id: shop.id, user_id: tech }).update({ deactivated_at: db.fn.now(3) });
});
afterAll(async () => {
  await pool.benchsideDb?.destroy();
  await db?.destroy();
});

describe("a deactivated membership", () => {
  it("is left out of the actor of a session that began before it was deactivated", async () => {
    const tech = shop.staff.technician!;
    const sessionId = await startSession({ userId: tech.id, method: "password", maxAgeSeconds: 3600 });
    const live = await getActorBySession({ userId: tech.id, sessionId });
    expect(live?.actor.memberships.map((m) => m.shopId)).toEqual([other.id]);
  });

  it("leaves a person with no other membership signed in as nobody's staff", async () => {
    const [userId] = await db("users").insert({ email: `gone.${shop.slug}@shop.test`, name: "Gone" });
    await db("memberships").insert({ shop_id: shop.id, user_id: userId, role: "service_writer", deactivated_at: db.fn.now(3) });
    const sessionId = await startSession({ userId: Number(userId), method: "password", maxAgeSeconds: 3600 });
    expect((await getActorBySession({ userId: Number(userId), sessionId }))?.actor.memberships).toEqual([]);
    // Nothing active to sign in to with a password.
    expect((await getStaffSignIn({ email: `gone.${shop.slug}@shop.test` }))?.roles).toBe(0);
  });

  it("isn't offered as staff or as a technician for a job", async () => {
    const ids = (rows: { id: number }[]) => rows.map((r) => r.id);
    expect(ids(await listShopStaff({ shopId: shop.id }))).toEqual([shop.staff.owner!.id]);
    expect(ids(await listShopTechnicians({ shopId: shop.id }))).toEqual([shop.staff.owner!.id]);
    expect(ids(await listShopTechnicians({ shopId: other.id }))).toContain(shop.staff.technician!.id);
  });
});
