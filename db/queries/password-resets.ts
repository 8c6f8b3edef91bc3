import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import { endUserSessions } from "./sessions";

// Forgotten-password links (migration 17): a hash of the token, an expiry, used once.

/** Who may be mailed a reset link: someone with a password (staff sign in with one). */
export async function passwordAccountByEmail({ email }: { email: string }): Promise<{ id: number; name: string } | null> {
  const row = await db()("users").where({ email }).whereNotNull("password_hash").first("id", "name");
  return row ? { id: Number(row.id), name: row.name } : null;
}

/** Stores a link's hash in the transaction that queues its e-mail. */
export async function insertPasswordReset(tx: Knex.Transaction, { userId, tokenHash, ttlMinutes }: { userId: number; tokenHash: string; ttlMinutes: number }) {
  await tx("password_resets").insert({ user_id: userId, token_hash: tokenHash, expires_at: tx.raw("NOW(3) + INTERVAL ? MINUTE", [ttlMinutes]) });
}

/** The account a still-usable link belongs to (for the page's context words), or why not. Reads only. */
export async function resetByToken({ tokenHash }: { tokenHash: string }) {
  const row = await db()("password_resets as r")
    .join("users as u", "u.id", "r.user_id")
    .where("r.token_hash", tokenHash)
    .first("u.email", "u.name", "r.used_at", db().raw("r.expires_at > NOW(3) AS live"));
  if (!row) return { ok: false as const, reason: "unknown" as const };
  if (row.used_at) return { ok: false as const, reason: "used" as const };
  if (!Number(row.live)) return { ok: false as const, reason: "expired" as const };
  return { ok: true as const, email: String(row.email), name: String(row.name) };
}

/**
 * Uses a link once: locks it, checks it, stores the new password, marks this and every other
 * open link of the person used, and ends all of their sessions, in one transaction.
 */
export async function redeemPasswordReset(
  tx: Knex.Transaction,
  { tokenHash, passwordHash }: { tokenHash: string; passwordHash: string },
): Promise<{ ok: true; userId: number; email: string; sessionsEnded: number } | { ok: false; reason: "unknown" | "used" | "expired" }> {
  const row = await tx("password_resets").where({ token_hash: tokenHash }).forUpdate().first("id", "user_id", "used_at");
  if (!row) return { ok: false, reason: "unknown" };
  if (row.used_at) return { ok: false, reason: "used" };
  const live = await tx("password_resets").where({ id: row.id }).where("expires_at", ">", tx.fn.now(3)).first("id");
  if (!live) return { ok: false, reason: "expired" };
  await tx("users").where({ id: row.user_id }).update({ password_hash: passwordHash });
  await tx("password_resets").where({ user_id: row.user_id }).whereNull("used_at").update({ used_at: tx.fn.now(3) });
  const sessionsEnded = await endUserSessions(tx, { userId: row.user_id, reason: "password" });
  const user = (await tx("users").where({ id: row.user_id }).first("email"))!;
  return { ok: true, userId: Number(row.user_id), email: user.email, sessionsEnded };
}

/** The stored hash of a signed-in person's password (changing it needs the current one). */
export async function passwordHashOf({ userId }: { userId: number }): Promise<{ email: string; name: string; hash: string | null } | null> {
  const row = await db()("users").where({ id: userId }).first("email", "name", "password_hash");
  return row ? { email: row.email, name: row.name, hash: row.password_hash } : null;
}

export async function prunePasswordResets({ olderThanHours }: { olderThanHours: number }) {
  await db()("password_resets").where("expires_at", "<", db().raw("NOW(3) - INTERVAL ? HOUR", [olderThanHours])).delete();
}
