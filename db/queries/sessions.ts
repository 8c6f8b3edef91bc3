import "server-only";
import crypto from "node:crypto";
import type { Knex } from "knex";
import { db } from "@/db/client";
import { transaction } from "@/db/transaction";

// Server-side sessions behind the JWT cookie (migration 20261203_11). A session is live while
// its row has no ended_at and has not passed expires_at; getActorBySession (users.ts) checks
// that on every request in the same query that reads the person's shop roles.

export type SessionMethod = "password" | "link";
export type SessionEndReason = "sign-out" | "everywhere" | "password" | "membership" | "deactivated";

/** A new live session for a person who just signed in; returns its id, which goes into the JWT. */
export async function startSession({ userId, method, maxAgeSeconds }: { userId: number; method: SessionMethod; maxAgeSeconds: number }): Promise<string> {
  const id = crypto.randomBytes(16).toString("hex");
  await db()("user_sessions").insert({
    id,
    user_id: userId,
    method,
    expires_at: db().raw("NOW(3) + INTERVAL ? SECOND", [maxAgeSeconds]),
  });
  return id;
}

/** Ends one session (signing out). Ending an ended or unknown session is harmless. */
export async function endSession({ sessionId, reason }: { sessionId: string; reason: SessionEndReason }): Promise<void> {
  await db()("user_sessions").where({ id: sessionId }).whereNull("ended_at").update({ ended_at: db().fn.now(3), ended_reason: reason });
}

/**
 * Ends every live session of a person, but `keep` (the session making a change such as a new
 * password may stay signed in). Takes the caller's transaction, so sessions end exactly when
 * the change that ends them commits: a password change, losing a role, a deactivation.
 * Returns how many sessions ended.
 */
export async function endUserSessions(k: Knex, { userId, reason, keep }: { userId: number; reason: SessionEndReason; keep?: string | null }): Promise<number> {
  const q = k("user_sessions").where({ user_id: userId }).whereNull("ended_at");
  if (keep) q.whereNot({ id: keep });
  return q.update({ ended_at: k.fn.now(3), ended_reason: reason });
}

/** "Sign out everywhere": ends every session of the person, this one included. */
export async function endEverySession({ userId }: { userId: number }): Promise<number> {
  return endUserSessions(db(), { userId, reason: "everywhere" });
}

/** How many live sessions a person has (for tests and, later, an account page). */
export async function countLiveSessions({ userId }: { userId: number }): Promise<number> {
  const row = await db()("user_sessions")
    .where({ user_id: userId })
    .whereNull("ended_at")
    .where("expires_at", ">", db().fn.now(3))
    .count({ n: "*" })
    .first();
  return Number(row?.n ?? 0);
}

/** Forgets sessions that ended or expired more than `olderThanHours` ago. */
export async function pruneSessions({ olderThanHours }: { olderThanHours: number }): Promise<void> {
  const cutoff = db().raw("NOW(3) - INTERVAL ? HOUR", [olderThanHours]);
  await db()("user_sessions").where("expires_at", "<", cutoff).delete();
  await db()("user_sessions").where("ended_at", "<", cutoff).delete();
}

/**
 * A new password: stored, and every other session of the person ended in the same transaction
 * (the one that changed it, `keep`, stays). The shop set-up screens call this.
 */
export async function changePassword({ userId, passwordHash, keep }: { userId: number; passwordHash: string; keep: string | null }): Promise<number> {
  return transaction(async (tx) => {
    await tx("users").where({ id: userId }).update({ password_hash: passwordHash });
    return endUserSessions(tx, { userId, reason: "password", keep });
  });
}
