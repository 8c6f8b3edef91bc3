import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";

// A shop waiting for its owner to confirm the address (issue 16 §1), and what the board's
// first-run checklist reads.

export async function isSlugTaken({ slug }: { slug: string }, k: Knex = db()): Promise<boolean> {
  return !!(await k("shops").where({ slug }).first("id"));
}

export async function hasUserAccount({ email }: { email: string }, k: Knex = db()): Promise<boolean> {
  return !!(await k("users").where({ email }).first("id"));
}

export type NewSignup = {
  tokenHash: string;
  email: string;
  ownerName: string;
  passwordHash: string;
  shopName: string;
  slug: string;
  timezone: string;
  currency: string;
  ttlMinutes: number;
};

/** Inside the caller's transaction, with the e-mail that carries the link. */
export async function insertShopSignup(k: Knex, s: NewSignup): Promise<number> {
  const [id] = await k("shop_signups").insert({
    token_hash: s.tokenHash,
    email: s.email,
    owner_name: s.ownerName,
    password_hash: s.passwordHash,
    shop_name: s.shopName,
    slug: s.slug,
    timezone: s.timezone,
    currency: s.currency,
    expires_at: k.raw("NOW(3) + INTERVAL ? MINUTE", [s.ttlMinutes]) as unknown as Date,
  });
  return Number(id);
}

export type PendingSignup = {
  id: number;
  email: string;
  ownerName: string;
  passwordHash: string;
  shopName: string;
  slug: string;
  timezone: string;
  currency: string;
  state: "open" | "used" | "expired";
  /** The address already has an account with a password (its own password proves it is them). */
  accountPasswordHash: string | null;
  accountExists: boolean;
};

/** The sign-up behind a token, and the account its address already has; `lock` inside a transaction. */
export async function findShopSignup({ tokenHash, lock = false }: { tokenHash: string; lock?: boolean }, k: Knex = db()): Promise<PendingSignup | null> {
  const query = k("shop_signups")
    .where({ token_hash: tokenHash })
    .first("id", "email", "owner_name", "password_hash", "shop_name", "slug", "timezone", "currency", "used_at", k.raw("expires_at > NOW(3) AS fresh"));
  const row = (await (lock ? query.forUpdate() : query)) as Record<string, unknown> | undefined;
  if (!row) return null;
  const user = await k("users").where({ email: String(row.email) }).first("id", "password_hash");
  return {
    id: Number(row.id),
    email: String(row.email),
    ownerName: String(row.owner_name),
    passwordHash: String(row.password_hash),
    shopName: String(row.shop_name),
    slug: String(row.slug),
    timezone: String(row.timezone),
    currency: String(row.currency),
    state: row.used_at ? "used" : Number(row.fresh) ? "open" : "expired",
    accountPasswordHash: user?.password_hash ?? null,
    accountExists: !!user,
  };
}

/**
 * Creates the shop, the owner's account (or gives an existing one the shop) and the owner's
 * membership, and marks the sign-up used: in the caller's transaction, with the sign-up row
 * locked. An account without a password (a machine owner who signs in by link) takes the one
 * chosen at sign-up. Throws the driver's ER_DUP_ENTRY when the address was taken meanwhile.
 */
export async function createShopFromSignup(tx: Knex.Transaction, s: PendingSignup): Promise<{ shopId: number; userId: number }> {
  const [shopId] = await tx("shops").insert({ slug: s.slug, name: s.shopName, timezone: s.timezone, currency: s.currency, email: s.email });
  await tx("users").insert({ email: s.email, name: s.ownerName, password_hash: s.passwordHash }).onConflict("email").ignore();
  const user = (await tx("users").where({ email: s.email }).forUpdate().first("id", "password_hash"))!;
  if (!user.password_hash) await tx("users").where({ id: user.id }).update({ password_hash: s.passwordHash });
  await tx("memberships").insert({ shop_id: Number(shopId), user_id: Number(user.id), role: "owner" });
  await tx("shop_signups").where({ id: s.id }).update({ used_at: tx.fn.now(3) as unknown as Date, shop_id: Number(shopId) });
  return { shopId: Number(shopId), userId: Number(user.id) };
}

/** Forgets sign-ups that expired long ago (used ones keep only their shop link until then). */
export async function pruneShopSignups({ olderThanHours }: { olderThanHours: number }) {
  await db()("shop_signups").where("expires_at", "<", db().raw("NOW() - INTERVAL ? HOUR", [olderThanHours])).delete();
}

export type FirstRun = { labourRate: boolean; staff: boolean; firstJob: boolean };

/** The board's first-run checklist: three small indexed lookups. */
export async function readFirstRun({ shopId }: { shopId: number }): Promise<FirstRun> {
  const [rate, member, invite, job] = await Promise.all([
    db()("shop_money_settings").where({ shop_id: shopId }).whereNotNull("labour_rate_minor").first("shop_id"),
    db()("memberships").where({ shop_id: shopId }).count({ n: "*" }).first(),
    db()("staff_invites").where({ shop_id: shopId }).first("id"),
    db()("jobs").where({ shop_id: shopId }).first("id"),
  ]);
  return { labourRate: !!rate, staff: Number(member?.n ?? 0) > 1 || !!invite, firstJob: !!job };
}
