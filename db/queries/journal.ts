import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import type { CustomersTable, JournalEntriesTable, JournalEntryRevisionsTable, Nullable, PhotosTable } from "@/db/tables";
import { transaction } from "@/db/transaction";
import { AppError } from "@/lib/errors";
import type { JobStatus } from "@/lib/job-status";
import type { WorkflowCause } from "@/lib/job-workflow";
import type { EntryKind, EntryVisibility, TimelineAudience, TimelineEntry, TimelinePage, TimelinePhoto } from "@/lib/journal";
import { MONEY_ENTRY_KINDS, RECORD_ENTRY_KINDS, photoUrl } from "@/lib/journal";
import { clipsForEntries } from "./clips";
import { insertEntry, newPhotoPublicId } from "./entries";
import { recordSharedEntry } from "./following";
import { recordEvent } from "./shop-events";

const asDate = (v: unknown) => (v == null ? null : (v as Date).toISOString());
const parseJson = (v: unknown): unknown => (typeof v === "string" ? JSON.parse(v) : (v ?? null));

/**
 * One page of a job's timeline in at most three queries (entries with their authors, then the
 * photos of those entries, then their clips with the clips' moments), whatever the number of
 * entries. The owner's audience gets shared, undeleted entries only; the shop's gets everything
 * not deleted. With the session and the job's access (at most three more) a timeline request
 * stays within DESIGN.md §5's six queries.
 */
export async function listTimeline({
  shopId,
  jobId,
  audience,
  order,
  after,
  limit,
  viewerUserId,
}: {
  shopId: number;
  jobId: number;
  audience: TimelineAudience;
  order: "asc" | "desc";
  after?: number | null;
  limit: number;
  viewerUserId?: number;
}): Promise<TimelinePage> {
  const q = db()("journal_entries as e")
    .leftJoin("users as u", "u.id", "e.author_user_id")
    .where({ "e.shop_id": shopId, "e.job_id": jobId })
    .whereNull("e.deleted_at")
    .orderBy("e.id", order)
    .limit(limit + 1)
    .select("e.id", "e.kind", "e.visibility", "e.body", "e.caption", "e.version", "e.created_at", "e.edited_at", "e.author_user_id", "u.name as author_name");
  if (audience !== "shop") q.where("e.visibility", "shared");
  if (audience === "follower") q.whereNotIn("e.kind", MONEY_ENTRY_KINDS);
  if (after != null) q.where("e.id", order === "asc" ? ">" : "<", after);
  type Row = Pick<JournalEntriesTable, "id" | "kind" | "visibility" | "body" | "caption" | "version" | "created_at" | "edited_at" | "author_user_id"> & { author_name: string | null };
  const rows: Row[] = await q;
  const more = rows.length > limit;
  const page = more ? rows.slice(0, limit) : rows;

  // One more query each, only when the page holds clips / photos: still a fixed number per page.
  const clips = await clipsForEntries(db(), shopId, page.filter((r) => r.kind === "clip").map((r) => Number(r.id)));
  const photoEntryIds = page.filter((r) => r.kind === "photos").map((r) => Number(r.id));
  const photosByEntry = new Map<number, TimelinePhoto[]>();
  if (photoEntryIds.length) {
    const photos = await db()("photos").where("shop_id", shopId).whereIn("entry_id", photoEntryIds).orderBy(["entry_id", "position", "id"]).select("entry_id", "public_id", "width", "height");
    for (const p of photos) {
      const list = photosByEntry.get(Number(p.entry_id)) ?? [];
      list.push(toPhoto(p));
      photosByEntry.set(Number(p.entry_id), list);
    }
  }

  const entries = page.map((r): TimelineEntry => {
    const id = Number(r.id);
    const authorId = r.author_user_id == null ? null : Number(r.author_user_id);
    const entry: TimelineEntry = {
      id,
      kind: r.kind as EntryKind,
      visibility: r.visibility,
      createdAt: asDate(r.created_at)!,
      editedAt: asDate(r.edited_at),
      author: authorId == null ? null : { name: String(r.author_name) },
      body: parseJson(r.body),
      caption: r.caption ?? null,
      photos: photosByEntry.get(id) ?? [],
      ...(r.kind === "clip" ? { clip: clips.get(id) ?? null } : {}),
    };
    if (audience === "shop") {
      entry.version = Number(r.version);
      entry.mine = viewerUserId != null && authorId === viewerUserId;
    }
    return entry;
  });
  return { entries, next: more ? (entries.at(-1)?.id ?? null) : null };
}

function toPhoto(p: Pick<PhotosTable, "public_id" | "width" | "height">): TimelinePhoto {
  const id = String(p.public_id);
  return { id, width: Number(p.width), height: Number(p.height), thumbUrl: photoUrl(id, "thumb"), displayUrl: photoUrl(id, "display") };
}

/** A photo that has arrived but belongs to no entry yet (seen by the shop only). */
export async function insertPendingPhoto(p: {
  shopId: number;
  jobId: number;
  userId: number;
  originalName: string | null;
  displayKey: string;
  thumbKey: string;
  width: number;
  height: number;
  bytes: number;
}): Promise<TimelinePhoto> {
  const publicId = newPhotoPublicId();
  await db()("photos").insert({
    public_id: publicId,
    shop_id: p.shopId,
    job_id: p.jobId,
    uploaded_by_user_id: p.userId,
    original_name: p.originalName?.slice(0, 255) ?? null,
    display_key: p.displayKey,
    thumb_key: p.thumbKey,
    width: p.width,
    height: p.height,
    bytes: p.bytes,
  });
  return toPhoto({ public_id: publicId, width: p.width, height: p.height });
}

/** Posts a photo set: the named pending photos of this job, in the order given, join one new entry. */
export async function createPhotoEntry(p: {
  shopId: number;
  jobId: number;
  authorId: number;
  photoIds: string[];
  caption: string | null;
  visibility: EntryVisibility;
}): Promise<number> {
  return transaction(async (tx) => {
    const found = await tx("photos").where({ shop_id: p.shopId, job_id: p.jobId }).whereIn("public_id", p.photoIds).forUpdate().select("id", "public_id", "entry_id");
    const byPublic = new Map(found.map((r) => [String(r.public_id), r]));
    const missing = p.photoIds.filter((id) => !byPublic.has(id));
    if (missing.length) throw new AppError("not_found", `${missing.length === 1 ? "A photo was" : `${missing.length} photos were`} not found on this job; upload again.`);
    if (found.some((r) => r.entry_id != null)) throw new AppError("conflict", "Some of these photos are already posted.");
    const entryId = await insertEntry(tx, { shopId: p.shopId, jobId: p.jobId, kind: "photos", authorId: p.authorId, caption: p.caption, visibility: p.visibility });
    for (const [position, publicId] of p.photoIds.entries()) {
      await tx("photos").where({ id: byPublic.get(publicId)!.id }).update({ entry_id: entryId, position });
    }
    return entryId;
  });
}

/** What the photo route needs to decide who may see a photo. */
export async function getPhotoAccess({ publicId }: { publicId: string }) {
  type Row = Pick<PhotosTable, "shop_id" | "job_id" | "display_key" | "thumb_key"> & { customer_user_id: CustomersTable["user_id"] } & Nullable<Pick<JournalEntriesTable, "kind" | "visibility" | "deleted_at">>;
  const row: Row | undefined = await db()("photos as p")
    .join("jobs as j", "j.id", "p.job_id")
    .join("customers as c", "c.id", "j.customer_id")
    .leftJoin("journal_entries as e", "e.id", "p.entry_id")
    .where("p.public_id", publicId)
    .first("p.shop_id", "p.job_id", "p.display_key", "p.thumb_key", "c.user_id as customer_user_id", "e.kind", "e.visibility", "e.deleted_at");
  if (!row) return null;
  // A photo quoted as evidence in a request sent to the owner is theirs to see, shared or not.
  const quoted = await db()("finding_evidence as fe")
    .join("approval_requests as r", "r.finding_id", "fe.finding_id")
    .where({ "fe.shop_id": row.shop_id, "fe.kind": "photo", "fe.ref": publicId })
    .first("r.id");
  return {
    shopId: Number(row.shop_id),
    jobId: Number(row.job_id),
    // Followers never see photos of money or decision entries.
    moneyEntry: MONEY_ENTRY_KINDS.includes(String(row.kind)),
    customerUserId: row.customer_user_id == null ? null : Number(row.customer_user_id),
    displayKey: String(row.display_key),
    thumbKey: String(row.thumb_key),
    // Shared with the owner only while its entry is shared and not deleted.
    sharedWithOwner: row.visibility === "shared" && row.deleted_at == null,
    shared: row.visibility === "shared" && row.deleted_at == null,
    quotedInRequest: !!quoted,
  };
}

export type EntryChange = { body?: unknown; caption?: string | null; visibility?: EntryVisibility; delete?: true };

/**
 * Edits, shares or deletes an entry. The previous state is copied into entry_revisions first,
 * and `version` must match what the editor saw, so two tabs can't silently overwrite each other.
 */
export async function changeEntry(p: {
  shopId: number;
  jobId: number;
  entryId: number;
  userId: number;
  mayModerate: boolean;
  expectedVersion: number;
  change: EntryChange;
}): Promise<{ version: number }> {
  return transaction(async (tx) => {
    const row = await tx("journal_entries")
      .where({ id: p.entryId, shop_id: p.shopId, job_id: p.jobId })
      .whereNull("deleted_at")
      .forUpdate()
      .first("kind", "visibility", "body", "caption", "version", "author_user_id");
    if (!row) throw new AppError("not_found", "That entry is gone: it may have been deleted.");
    const mine = row.author_user_id != null && Number(row.author_user_id) === p.userId;
    if (!mine && !p.mayModerate) throw new AppError("forbidden", "Only the person who posted this entry can change it.");
    if (Number(row.version) !== p.expectedVersion) throw new AppError("conflict", "Someone changed this entry since you opened it. Reload to see the latest version.");
    const kind = row.kind as EntryKind;
    if (RECORD_ENTRY_KINDS.includes(kind)) {
      throw new AppError(
        "invalid",
        kind === "status" ? "A status change can't be edited; change the status again instead." : "This entry stands for a record the shop keeps; it can't be changed here.",
      );
    }
    if (p.change.body !== undefined && kind !== "note") throw new AppError("invalid", "Only notes have text to edit; change the caption instead.");

    const change = p.change.delete ? "delete" : p.change.body !== undefined || p.change.caption !== undefined ? "edit" : p.change.visibility === "shared" ? "share" : "unshare";
    await tx("journal_entry_revisions").insert({
      shop_id: p.shopId,
      entry_id: p.entryId,
      version: row.version,
      change,
      visibility: row.visibility,
      body: row.body == null ? null : typeof row.body === "string" ? row.body : JSON.stringify(row.body),
      caption: row.caption ?? null,
      changed_by_user_id: p.userId,
    });
    const version = Number(row.version) + 1;
    const shareChange = p.change.visibility && p.change.visibility !== row.visibility ? p.change.visibility : null;
    const update: Knex.DbRecord<JournalEntriesTable> = {
      version,
      ...(p.change.delete ? { deleted_at: tx.fn.now(3) } : {}),
      ...(p.change.body !== undefined ? { body: JSON.stringify(p.change.body) } : {}),
      ...(p.change.caption !== undefined ? { caption: p.change.caption } : {}),
      ...(p.change.body !== undefined || p.change.caption !== undefined ? { edited_at: tx.fn.now(3) } : {}),
      ...(shareChange ? { visibility: shareChange, shared_at: shareChange === "shared" ? tx.fn.now(3) : null } : {}),
    };
    await tx("journal_entries").where({ id: p.entryId }).update(update);
    if (shareChange === "shared") await recordSharedEntry(tx, { shopId: p.shopId, jobId: p.jobId, entryId: p.entryId, kind, body: parseJson(row.body) });
    // The owner's page refreshes when what they see changed: a shared entry, or one just (un)shared.
    const ownerVisible = row.visibility === "shared" || shareChange !== null;
    await recordEvent(tx, { shopId: p.shopId, jobId: p.jobId, kind: "entry_changed", actorUserId: p.userId, ownerVisible, payload: { entry: p.entryId, change } });
    return { version };
  });
}

export async function listEntryRevisions({ shopId, entryId }: { shopId: number; entryId: number }) {
  const rows: (Pick<JournalEntryRevisionsTable, "version" | "change" | "visibility" | "body" | "caption" | "changed_at"> & { by_name: string | null })[] = await db()("journal_entry_revisions as r")
    .leftJoin("users as u", "u.id", "r.changed_by_user_id")
    .where({ "r.shop_id": shopId, "r.entry_id": entryId })
    .orderBy("r.id", "desc")
    .select("r.version", "r.change", "r.visibility", "r.body", "r.caption", "r.changed_at", "u.name as by_name");
  return rows.map((r) => ({
    version: Number(r.version),
    change: String(r.change),
    visibility: r.visibility,
    body: parseJson(r.body),
    caption: r.caption ?? null,
    at: asDate(r.changed_at)!,
    by: r.by_name ?? null,
  }));
}

/**
 * Moves a job to another status if it is still in `from` (so two people pressing at once give
 * one move), records it in the status history and as a shared timeline entry, in one transaction
 * (the caller's `tx` when given, so a move can commit together with what caused it).
 */
export async function moveJobStatus(p: {
  shopId: number;
  jobId: number;
  from: JobStatus;
  to: JobStatus;
  userId: number | null;
  note: string | null;
  /** The workflow event that moved it (lib/job-workflow.ts); a hand move when left out. */
  cause?: WorkflowCause;
  tx?: Knex.Transaction;
  alert?: "parts_in";
}): Promise<boolean> {
  const run = async (tx: Knex.Transaction) => {
    const moved = await tx("jobs").where({ id: p.jobId, shop_id: p.shopId, status: p.from }).update({ status: p.to, updated_at: tx.fn.now() });
    if (moved !== 1) return false;
    const cause = p.cause ?? "manual";
    await tx("job_status_changes").insert({ shop_id: p.shopId, job_id: p.jobId, from_status: p.from, to_status: p.to, changed_by_user_id: p.userId, note: p.note, cause });
    // The owner sees the status on their page anyway, so its entry is shared from the start.
    await insertEntry(tx, { shopId: p.shopId, jobId: p.jobId, kind: "status", authorId: p.userId, visibility: "shared", body: { from: p.from, to: p.to, note: p.note, cause }, alert: p.alert });
    return true;
  };
  return p.tx ? run(p.tx) : transaction(run);
}
