import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";

export type AttemptKind = "password" | "link_request" | "link_use" | "reset_request" | "token_use" | "password_change" | "signup_request" | "signup_use" | "booking_request";

/**
 * Records an attempt first and counts after, so of any number of simultaneous attempts at
 * most `limit.max` go ahead: each one counts every attempt recorded before it.
 * `counting` says what uses up the limit: failures (passwords, link clicks) or every
 * request that went ahead (sign-in e-mails). A refused e-mail request doesn't use up the
 * limit; a refused password try still counts as a failure, so guessing on keeps the lock.
 */
export async function reserveAttempt({
  kind,
  subject,
  limit,
  counting,
}: {
  kind: AttemptKind;
  subject: string;
  limit: { max: number; minutes: number };
  counting: "failures" | "accepted";
}): Promise<{ id: number; allowed: boolean }> {
  // Until settled, a password try or link click is a failure and an e-mail request is accepted.
  const counted = counting === "accepted";
  const key = { kind, subject: subject.slice(0, 254) };
  const [inserted] = await db()("auth_attempts").insert({ ...key, succeeded: counted });
  const id = Number(inserted);
  const row = await db()("auth_attempts")
    .where({ ...key, succeeded: counted })
    .where("id", "<=", id)
    .where("created_at", ">", db().raw("NOW(3) - INTERVAL ? MINUTE", [limit.minutes]))
    .count({ n: "*" })
    .first();
  const allowed = Number(row?.n ?? 0) <= limit.max;
  if (!allowed && counted) await settleAttempt({ id, succeeded: false });
  return { id, allowed };
}

/** Marks a reserved attempt as having succeeded (or, for e-mail requests, as not sent). */
export async function settleAttempt({ id, succeeded }: { id: number; succeeded: boolean }) {
  await db()("auth_attempts").where({ id }).update({ succeeded });
}

/** Stores a link's hash inside the caller's transaction `k` (with the e-mail that carries it). */
export async function insertSignInLink(k: Knex, { email, tokenHash, ttlMinutes, nextPath = null }: { email: string; tokenHash: string; ttlMinutes: number; nextPath?: string | null }) {
  const [id] = await k("sign_in_links").insert({
    email,
    token_hash: tokenHash,
    next_path: nextPath,
    expires_at: k.raw("NOW() + INTERVAL ? MINUTE", [ttlMinutes]),
  });
  return Number(id);
}

/**
 * Marks the link used if, and only if, it is unused and unexpired — one UPDATE, so two
 * clicks at once cannot both succeed. Otherwise says why it was refused.
 */
export async function redeemSignInLink({ tokenHash }: { tokenHash: string }): Promise<
  { ok: true; email: string } | { ok: false; reason: "unknown" | "used" | "expired" }
> {
  const changed = await db()("sign_in_links")
    .where({ token_hash: tokenHash })
    .whereNull("used_at")
    .where("expires_at", ">", db().fn.now())
    .update({ used_at: db().fn.now() });
  const row = await db()("sign_in_links").where({ token_hash: tokenHash }).first("email", "used_at");
  if (changed === 1 && row) return { ok: true, email: String(row.email) };
  if (!row) return { ok: false, reason: "unknown" };
  return { ok: false, reason: row.used_at ? "used" : "expired" };
}

/** Deletes attempts and used or expired links older than the longest limit window needs. */
export async function pruneSignInRecords({ olderThanHours }: { olderThanHours: number }) {
  const cutoff = db().raw("NOW() - INTERVAL ? HOUR", [olderThanHours]);
  await db()("auth_attempts").where("created_at", "<", cutoff).delete();
  await db()("sign_in_links").where("expires_at", "<", cutoff).delete();
}

/** Where a link leads and whether it can still be used, without using it (the /t/<token> page's GET). */
export async function peekSignInLink({ tokenHash }: { tokenHash: string }): Promise<{ nextPath: string | null; usable: boolean } | null> {
  const row = await db()("sign_in_links").where({ token_hash: tokenHash }).first("next_path", "used_at", db().raw("expires_at > NOW() AS live"));
  if (!row) return null;
  return { nextPath: row.next_path ?? null, usable: !row.used_at && Number((row as unknown as { live: number }).live) === 1 };
}
