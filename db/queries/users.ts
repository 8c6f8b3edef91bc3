import "server-only";
import { db } from "@/db/client";
import { transaction } from "@/db/transaction";
import type { Actor, StaffRole } from "@/lib/permissions";
import { claimFollowerRows, isFollowerAddress } from "./following";

/**
 * The signed-in person with their shop roles, as every authorisation check sees them, if the
 * session is still live (not ended, not past its end). One query for both, on every request.
 * `method` is how the session was signed in, as recorded when it began.
 */
export async function getActorBySession({ userId, sessionId }: { userId: number; sessionId: string }): Promise<{ actor: Actor; method: "password" | "link" } | null> {
  const rows = (await db()("user_sessions as us")
    .join("users as u", "u.id", "us.user_id")
    // A deactivated membership (memberships.deactivated_at) gives no role.
    .leftJoin("memberships as m", (j) => j.on("m.user_id", "u.id").andOnNull("m.deactivated_at"))
    .leftJoin("shops as s", "s.id", "m.shop_id")
    .where({ "us.id": sessionId, "us.user_id": userId })
    .whereNull("us.ended_at")
    .where("us.expires_at", ">", db().fn.now(3))
    .orderBy("s.name")
    .select("u.id", "u.email", "u.name", "us.method", "m.shop_id", "m.role", "s.slug", "s.name as shop_name")) as Record<string, unknown>[];
  const first = rows[0];
  if (!first) return null;
  return {
    method: first.method === "password" ? "password" : "link",
    actor: {
      userId: Number(first.id),
      email: String(first.email),
      name: String(first.name),
      memberships: rows
        .filter((m) => m.shop_id != null)
        .map((m) => ({ shopId: Number(m.shop_id), shopSlug: String(m.slug), shopName: String(m.shop_name), role: m.role as StaffRole })),
    },
  };
}

/**
 * What a staff password sign-in needs, in one query whether or not the address is known (so
 * known and unknown addresses take the same path): the hash, and whether the person has a role
 * in any shop (a deactivated membership doesn't count).
 */
export async function getStaffSignIn({ email }: { email: string }) {
  const row = (await db()("users as u")
    .leftJoin("memberships as m", (j) => j.on("m.user_id", "u.id").andOnNull("m.deactivated_at"))
    .where("u.email", email)
    .groupBy("u.id", "u.email", "u.name", "u.password_hash")
    .first("u.id", "u.email", "u.name", "u.password_hash", db().raw("COUNT(m.id) AS roles"))) as Record<string, unknown> | undefined;
  if (!row) return null;
  return { id: Number(row.id), email: String(row.email), name: String(row.name), passwordHash: (row.password_hash as string | null) ?? null, roles: Number(row.roles) };
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
  return transaction(async (tx) => {
    const customer = await tx("customers").where({ email }).orderBy("created_at", "desc").first("name");
    await tx("users")
      .insert({ email, name: customer?.name ?? email.split("@")[0] })
      .onConflict("email")
      .ignore();
    // A locking read sees the row even when another sign-in inserted it after this
    // transaction's snapshot was taken (a plain read would not, under REPEATABLE READ).
    const user = (await tx("users").where({ email }).forUpdate().first("id", "name"))!;
    await tx("customers").where({ email }).whereNull("user_id").update({ user_id: user.id });
    await claimFollowerRows(tx, { email, userId: Number(user.id) });
    await tx("users").where({ id: user.id }).update({ last_sign_in_at: tx.fn.now() });
    return { id: Number(user.id), email, name: String(user.name) };
  });
}
