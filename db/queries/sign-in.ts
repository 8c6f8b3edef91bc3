import "server-only";
import { db } from "@/lib/server/db";

export type AttemptKind = "password" | "link_request" | "link_use";

export async function recordAttempt({ kind, subject, succeeded }: { kind: AttemptKind; subject: string; succeeded: boolean }) {
  await db()("auth_attempts").insert({ kind, subject: subject.slice(0, 254), succeeded });
}

/** How many attempts of this kind for this subject (an e-mail or an IP) in the last `minutes`. */
export async function countAttempts({ kind, subject, minutes, failedOnly }: { kind: AttemptKind; subject: string; minutes: number; failedOnly: boolean }) {
  const q = db()("auth_attempts")
    .where({ kind, subject: subject.slice(0, 254) })
    .where("created_at", ">", db().raw("NOW(3) - INTERVAL ? MINUTE", [minutes]));
  if (failedOnly) q.where({ succeeded: false });
  const row = await q.count({ n: "*" }).first();
  return Number(row?.n ?? 0);
}

export async function insertSignInLink({ email, tokenHash, ttlMinutes }: { email: string; tokenHash: string; ttlMinutes: number }) {
  const [id] = await db()("sign_in_links").insert({
    email,
    token_hash: tokenHash,
    expires_at: db().raw("NOW() + INTERVAL ? MINUTE", [ttlMinutes]),
  });
  return Number(id);
}

export async function deleteSignInLink({ id }: { id: number }) {
  await db()("sign_in_links").where({ id }).delete();
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
