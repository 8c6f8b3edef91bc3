import "server-only";
import { db } from "@/db/client";
import type { IdempotencyKeysTable } from "@/db/tables";
import type { Tx } from "@/db/transaction";

// Client-made idempotency keys (migration 36, lib/server/idempotency.ts). A key is claimed by
// inserting its row first thing in the change's transaction: a second send of the same key waits
// on that row until the first commits (then finds it) or rolls back (then claims it itself).

export type StoredAnswer = Pick<IdempotencyKeysTable, "request_hash" | "response_status" | "response_body" | "expires_at">;

export const isDuplicateKey = (error: unknown) => (error as { code?: string } | null)?.code === "ER_DUP_ENTRY";

/** The answer recorded under a key, or undefined; an expired row is removed and counts as none. */
export async function findAnswer(p: { userId: number; key: string; now?: Date }): Promise<StoredAnswer | undefined> {
  const row = await db()("idempotency_keys")
    .where({ user_id: p.userId, idem_key: p.key })
    .first("request_hash", "response_status", "response_body", "expires_at");
  if (!row) return undefined;
  if (row.expires_at.getTime() > (p.now ?? new Date()).getTime()) return row;
  await db()("idempotency_keys").where({ user_id: p.userId, idem_key: p.key }).where("expires_at", "<=", row.expires_at).delete();
  return undefined;
}

/** Claims a key inside the change's transaction; throws ER_DUP_ENTRY (after waiting) if another request holds it. */
export async function claimKey(tx: Tx, p: { userId: number; key: string; requestHash: string; expiresAt: Date }) {
  await tx("idempotency_keys").insert({
    user_id: p.userId,
    idem_key: p.key,
    request_hash: p.requestHash,
    // Filled in by storeAnswer before the transaction commits; nobody else ever reads it like this.
    response_status: 0,
    response_body: "",
    expires_at: p.expiresAt,
  });
}

export async function storeAnswer(tx: Tx, p: { userId: number; key: string; status: number; body: string }) {
  await tx("idempotency_keys").where({ user_id: p.userId, idem_key: p.key }).update({ response_status: p.status, response_body: p.body });
}

/** Deletes up to `limit` expired keys (oldest first); answers how many went. */
export async function purgeExpiredKeys(p: { now?: Date; limit?: number } = {}): Promise<number> {
  return db()("idempotency_keys")
    .where("expires_at", "<=", p.now ?? new Date())
    .orderBy("expires_at")
    .limit(p.limit ?? 1000)
    .delete();
}
