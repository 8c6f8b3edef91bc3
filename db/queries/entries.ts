import "server-only";
import crypto from "node:crypto";
import type { Knex } from "knex";
import type { EntryKind, EntryVisibility } from "@/lib/journal";
import { recordSharedEntry } from "./following";
import { recordEvent } from "./shop-events";

// The one writer of journal entries, on its own so that the modules of entry kinds (clips,
// photos, bench records…) and the timeline reader can all use it without importing each other.

/** A public id for a photo or a clip: 22 URL-safe characters, unguessable. */
export function newPhotoPublicId(): string {
  return crypto.randomBytes(16).toString("base64url").slice(0, 22);
}

/**
 * Adds an entry to a job's timeline, inside the caller's transaction `k`.
 *
 * Lock order: the job row is written (its `updated_at`) BEFORE the entry is inserted. The insert's
 * foreign key takes a shared lock on the job row; taken first, two writers on one job would both
 * hold it shared and then both wait to upgrade it to exclusive: a deadlock. Exclusive first, the
 * second writer simply waits for the first to commit. Callers that lock the job row themselves
 * (FOR UPDATE, or a status move) already hold it exclusively, which keeps the same order.
 */
export async function insertEntry(
  k: Knex,
  e: {
    shopId: number;
    jobId: number;
    kind: EntryKind;
    authorId: number | null;
    visibility?: EntryVisibility;
    body?: unknown;
    caption?: string | null;
    /** Mail subscribers about it at once instead of in the next digest. */
    alert?: "parts_in";
  },
): Promise<number> {
  const visibility = e.visibility ?? "shop";
  await k("jobs").where({ id: e.jobId, shop_id: e.shopId }).update({ updated_at: k.fn.now() });
  const [id] = await k("journal_entries").insert({
    shop_id: e.shopId,
    job_id: e.jobId,
    kind: e.kind,
    visibility,
    author_user_id: e.authorId,
    body: e.body === undefined ? null : JSON.stringify(e.body),
    caption: e.caption ?? null,
    shared_at: visibility === "shared" ? k.fn.now(3) : null,
  });
  // Followers hear of it (batched) in the same transaction as the entry.
  if (visibility === "shared") await recordSharedEntry(k, { shopId: e.shopId, jobId: e.jobId, entryId: Number(id), kind: e.kind, body: e.body, alert: e.alert });
  // Open pages (the board, the job page, the owner's page when shared) refresh on it.
  await recordEvent(k, { shopId: e.shopId, jobId: e.jobId, kind: "entry_added", actorUserId: e.authorId, ownerVisible: visibility === "shared", payload: { entry: Number(id), entryKind: e.kind } });
  return Number(id);
}
