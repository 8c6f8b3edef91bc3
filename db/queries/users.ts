import "server-only";
import { db } from "@/lib/server/db";
import type { Actor, StaffRole } from "@/lib/permissions";
import { claimFollowerRows, isFollowerAddress } from "./following";

export async function getUserByEmail({ email }: { email: string }) {
  const row = await db()("users").where({ email }).first("id", "email", "name", "password_hash");
  return row ? { id: Number(row.id), email: String(row.email), name: String(row.name), passwordHash: (row.password_hash as string | null) ?? null } : null;
}

export async function countMemberships({ userId }: { userId: number }): Promise<number> {
  const row = await db()("memberships").where({ user_id: userId }).count({ n: "*" }).first();
  return Number(row?.n ?? 0);
}

/** The signed-in person with their shop roles, as every authorisation check sees them. */
export async function getActorById({ userId }: { userId: number }): Promise<Actor | null> {
  const user = await db()("users").where({ id: userId }).first("id", "email", "name");
  if (!user) return null;
  const memberships = await db()("memberships as m")
    .join("shops as s", "s.id", "m.shop_id")
    .where("m.user_id", userId)
    .orderBy("s.name")
    .select("m.shop_id", "m.role", "s.slug", "s.name");
  return {
    userId: Number(user.id),
    email: String(user.email),
    name: String(user.name),
    memberships: memberships.map((m: Record<string, unknown>) => ({
      shopId: Number(m.shop_id),
      shopSlug: String(m.slug),
      shopName: String(m.name),
      role: m.role as StaffRole,
    })),
  };
}

export async function touchLastSignIn({ userId }: { userId: number }) {
  await db()("users").where({ id: userId }).update({ last_sign_in_at: db().fn.now() });
}

/** Does any shop have a customer, or any job a follower, with this address? Sign-in links go only to them. */
export async function isCustomerAddress({ email }: { email: string }): Promise<boolean> {
  return !!(await db()("customers").where({ email }).first("id")) || (await isFollowerAddress({ email }));
}

/**
 * After a link sign-in: the user for this address (created on first sign-in, named as the
 * shop wrote it down), and every customer record and job follower row with that address linked to them.
 * INSERT IGNORE, so two first sign-ins at the same moment both end with the one user.
 */
export async function claimCustomerRecords({ email }: { email: string }) {
  return db().transaction(async (tx) => {
    const customer = await tx("customers").where({ email }).orderBy("created_at", "desc").first("name");
    await tx("users")
      .insert({ email, name: customer?.name ?? email.split("@")[0] })
      .onConflict("email")
      .ignore();
    // A locking read sees the row even when another sign-in inserted it after this
    // transaction's snapshot was taken (a plain read would not, under REPEATABLE READ).
    const user = await tx("users").where({ email }).forUpdate().first("id", "name");
    await tx("customers").where({ email }).whereNull("user_id").update({ user_id: user.id });
    await claimFollowerRows(tx, { email, userId: Number(user.id) });
    await tx("users").where({ id: user.id }).update({ last_sign_in_at: tx.fn.now() });
    return { id: Number(user.id), email, name: String(user.name) };
  });
}
