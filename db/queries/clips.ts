import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import type { ClipsTable, CustomersTable, JournalEntriesTable } from "@/db/tables";
import { transaction } from "@/db/transaction";
import { AppError } from "@/lib/errors";
import { type FailedClip, clipLimitProblem, clipMediaUrls } from "@/lib/clips";
import { type EntryVisibility, MONEY_ENTRY_KINDS, type TimelineClip } from "@/lib/journal";
import type { VideoEventBody } from "@/lib/schemas/webhooks";
import { insertEntry, newPhotoPublicId } from "./entries";

export async function getClipLimits({ shopId }: { shopId: number }, k: Knex = db()) {
  // Callers come through a job of the shop, so the row is there.
  const row = (await k("shops").where({ id: shopId }).first("clip_max_seconds", "clip_max_bytes"))!;
  return { maxSeconds: Number(row.clip_max_seconds), maxBytes: Number(row.clip_max_bytes) };
}

export async function saveClipLimits({ shopId, maxSeconds, maxBytes }: { shopId: number; maxSeconds: number; maxBytes: number }, k: Knex = db()) {
  await k("shops").where({ id: shopId }).update({ clip_max_seconds: maxSeconds, clip_max_bytes: maxBytes });
}

/**
 * A clip's entry appears at once, shop-only and "uploading", so the bench sees it while the
 * file is still on its way; the upload id ties later webhook events to it.
 */
export async function createClipEntry(p: {
  shopId: number;
  jobId: number;
  userId: number;
  uploadId: string;
  publicId: string;
  name: string | null;
  bytes: number;
  caption: string | null;
  visibility: EntryVisibility;
}): Promise<{ entryId: number }> {
  return transaction(async (tx) => {
    const entryId = await insertEntry(tx, { shopId: p.shopId, jobId: p.jobId, kind: "clip", authorId: p.userId, caption: p.caption, visibility: p.visibility });
    await tx("clips").insert({
      public_id: p.publicId,
      shop_id: p.shopId,
      job_id: p.jobId,
      entry_id: entryId,
      uploaded_by_user_id: p.userId,
      original_name: p.name?.slice(0, 255) ?? null,
      bytes: p.bytes,
      upload_id: p.uploadId,
    });
    return { entryId };
  });
}

export function newClipPublicId(): string {
  return newPhotoPublicId();
}

/**
 * The clips of these entries with their moments, in one query (a clip's row repeats once per
 * moment), keyed by entry id: a timeline page stays a fixed number of queries (DESIGN.md §5).
 */
export async function clipsForEntries(k: Knex, shopId: number, entryIds: number[]): Promise<Map<number, TimelineClip>> {
  const out = new Map<number, TimelineClip>();
  if (!entryIds.length) return out;
  type Row = Pick<ClipsTable, "id" | "entry_id" | "public_id" | "status" | "duration_seconds" | "aspect_ratio" | "playback_id" | "error"> & { at_ms: number | null; label: string | null };
  const rows: Row[] = await k("clips as c")
    .leftJoin("clip_moments as m", (j) => j.on("m.clip_id", "c.id").andOn("m.shop_id", "c.shop_id"))
    .where("c.shop_id", shopId)
    .whereIn("c.entry_id", entryIds)
    .orderBy([{ column: "c.id" }, { column: "m.at_ms" }, { column: "m.id" }])
    .select("c.id", "c.entry_id", "c.public_id", "c.status", "c.duration_seconds", "c.aspect_ratio", "c.playback_id", "c.error", "m.at_ms", "m.label");
  for (const r of rows) {
    const entryId = Number(r.entry_id);
    let clip = out.get(entryId);
    let moments = clip?.moments;
    if (!clip || !moments) {
      moments = [];
      const urls = r.status === "ready" && r.playback_id ? clipMediaUrls(String(r.public_id)) : null;
      clip = {
        id: String(r.public_id),
        status: r.status,
        durationSeconds: r.duration_seconds == null ? null : Number(r.duration_seconds),
        aspectRatio: r.aspect_ratio ?? null,
        src: urls?.src ?? null,
        poster: urls?.poster ?? null,
        error: r.error ?? null,
        moments,
      };
      out.set(entryId, clip);
    }
    if (r.at_ms != null) moments.push({ atMs: Number(r.at_ms), label: String(r.label) });
  }
  return out;
}

/** Marks a moment in a ready clip of this job; the label says what is seen there. */
export async function addClipMoment(p: { shopId: number; jobId: number; clipPublicId: string; atMs: number; label: string; userId: number }) {
  const clip = await db()("clips").where({ shop_id: p.shopId, job_id: p.jobId, public_id: p.clipPublicId }).first("id", "status", "duration_seconds");
  if (!clip) throw new AppError("not_found", "No such clip on this job.");
  if (clip.status !== "ready") throw new AppError("invalid", "Moments can be marked once the clip is ready.");
  if (clip.duration_seconds != null && p.atMs > Number(clip.duration_seconds) * 1000 + 500) throw new AppError("invalid", "That moment is past the end of the clip.", { atSeconds: ["Past the end of the clip."] });
  const [id] = await db()("clip_moments").insert({ shop_id: p.shopId, clip_id: clip.id, at_ms: p.atMs, label: p.label, created_by_user_id: p.userId });
  return { id: Number(id) };
}

/** Stops a clip playing (its entry was deleted); returns what the video service must forget. */
export async function markClipDeleted({ shopId, entryId }: { shopId: number; entryId: number }) {
  const row = await db()("clips").where({ shop_id: shopId, entry_id: entryId }).first("id", "public_id", "asset_id", "upload_id");
  if (!row) return null;
  await db()("clips").where({ id: row.id }).update({ status: "deleted", playback_id: null, updated_at: db().fn.now(3) });
  return { publicId: String(row.public_id), assetId: row.asset_id ?? null, uploadId: String(row.upload_id) };
}

/** What the media route needs to decide who may watch a clip. */
export async function getClipAccess({ publicId }: { publicId: string }) {
  type Row = Pick<ClipsTable, "shop_id" | "job_id" | "status" | "playback_id"> & { customer_user_id: CustomersTable["user_id"] } & Pick<JournalEntriesTable, "kind" | "visibility" | "deleted_at">;
  const row: Row | undefined = await db()("clips as v")
    .join("jobs as j", "j.id", "v.job_id")
    .join("customers as c", "c.id", "j.customer_id")
    .join("journal_entries as e", "e.id", "v.entry_id")
    .where("v.public_id", publicId)
    .first("v.shop_id", "v.job_id", "v.status", "v.playback_id", "c.user_id as customer_user_id", "e.kind", "e.visibility", "e.deleted_at");
  if (!row) return null;
  // A clip quoted as evidence in a request sent to the owner is theirs to watch, shared or not.
  const quoted = await db()("finding_evidence as fe")
    .join("approval_requests as r", "r.finding_id", "fe.finding_id")
    .where({ "fe.shop_id": row.shop_id, "fe.kind": "clip", "fe.ref": publicId })
    .first("r.id");
  return {
    shopId: Number(row.shop_id),
    jobId: Number(row.job_id),
    customerUserId: row.customer_user_id == null ? null : Number(row.customer_user_id),
    playbackId: row.status === "ready" && row.playback_id ? String(row.playback_id) : null,
    sharedWithOwner: row.visibility === "shared" && row.deleted_at == null,
    quotedInRequest: !!quoted,
    moneyEntry: MONEY_ENTRY_KINDS.includes(String(row.kind)),
    shared: row.visibility === "shared" && row.deleted_at == null,
  };
}

export type VideoEvent = VideoEventBody;

/** A clip taken off the timeline because the video service rejected it: what the service must forget. */
export type RejectedClip = { publicId: string; assetId: string | null };

/** Where a clip can still be when the service rejects it (a clip staff deleted keeps its deleted entry). */
const REJECTABLE = ["uploading", "processing", "ready"];

/**
 * Takes the clips the video service rejected off the timeline, in the caller's transaction: each
 * row stays as a failed upload (errored, with the reason, no entry) that staff see and can
 * clear, and its entry goes with everything hanging off it (history, a queued notice).
 */
async function rejectClips(tx: Knex.Transaction, match: (q: Knex.QueryBuilder) => void, reason: string, assetId?: string): Promise<RejectedClip[]> {
  const rows = await tx("clips").where(match).whereIn("status", REJECTABLE).whereNotNull("entry_id").forUpdate().select("id", "shop_id", "entry_id", "public_id", "asset_id");
  for (const r of rows) {
    await tx("clips")
      .where({ id: r.id })
      .update({ entry_id: null, status: "errored", error: reason.slice(0, 500), playback_id: null, ...(assetId ? { asset_id: assetId } : {}), updated_at: tx.fn.now(3) });
    if (r.entry_id !== null) await tx("journal_entries").where({ shop_id: r.shop_id, id: r.entry_id }).delete();
  }
  return rows.map((r) => ({ publicId: r.public_id, assetId: assetId ?? (r.asset_id || null) }));
}

/**
 * Applies one webhook event exactly once: its id is recorded in the same transaction as its
 * effect, so a redelivery (same id) finds the row and changes nothing. Says whether it had an
 * effect, and which clips it took off the timeline (their assets are deleted by the caller).
 */
export async function applyVideoEvent(event: VideoEvent): Promise<{ applied: boolean; rejected: RejectedClip[] }> {
  return transaction(async (tx) => {
    const inserted = await tx.raw("INSERT IGNORE INTO video_webhook_events (event_id, type) VALUES (?, ?)", [event.id, event.type]);
    if (Number((inserted as [{ affectedRows: number }])[0].affectedRows) === 0) return { applied: false, rejected: [] };
    const d = event.data;
    const now = tx.fn.now(3);
    const done = (rejected: RejectedClip[] = []) => ({ applied: true, rejected });
    switch (event.type) {
      case "video.upload.asset_created":
        if (d.id && d.asset_id) await tx("clips").where({ upload_id: d.id, status: "uploading" }).update({ asset_id: d.asset_id, status: "processing", updated_at: now });
        return done();
      case "video.upload.errored":
        if (!d.id) return done();
        return done(await rejectClips(tx, (q) => q.where("upload_id", d.id!), d.error?.message || "The upload failed at the video service; send the clip again."));
      case "video.upload.cancelled":
        if (!d.id) return done();
        return done(await rejectClips(tx, (q) => q.where({ upload_id: d.id!, status: "uploading" }), "The upload was cancelled before it finished; send the clip again."));
      case "video.asset.ready": {
        // The browser's declared length can be wrong: the processed asset is what counts.
        const shop = await tx("shops").whereIn("id", tx("clips").where(assetMatch(d)).select("shop_id")).first("clip_max_seconds");
        const maxSeconds = shop ? Number(shop.clip_max_seconds) : Infinity;
        if (d.duration != null && d.duration > maxSeconds) {
          const problem = clipLimitProblem({ size: 0, durationSeconds: d.duration }, { maxSeconds, maxBytes: Infinity }) ?? "The clip is longer than the shop allows.";
          return done(await rejectClips(tx, assetMatch(d), problem, d.id));
        }
        const playback = d.playback_ids?.find((p) => p.policy !== "signed") ?? d.playback_ids?.[0];
        await tx("clips")
          .where(assetMatch(d))
          .whereIn("status", REJECTABLE)
          .update({ asset_id: d.id, status: "ready", playback_id: playback?.id ?? null, duration_seconds: d.duration ?? null, aspect_ratio: d.aspect_ratio ?? null, error: null, updated_at: now });
        return done();
      }
      case "video.asset.errored":
        return done(await rejectClips(tx, assetMatch(d), d.errors?.messages?.join(" ") || "The video service couldn't process this file as a video.", d.id));
      case "video.asset.deleted":
        // A failed upload stays listed for staff after its asset is gone (we deleted it).
        await tx("clips").where(assetMatch(d)).whereNot("status", "errored").update({ status: "deleted", playback_id: null, updated_at: now });
        return done();
      default:
        // Recorded, so a redelivery stays a no-op too; nothing else to do.
        return done();
    }
  });
}

/** Events about an asset name it by id, and the upload it came from. */
function assetMatch(d: VideoEvent["data"]) {
  return (w: Knex.QueryBuilder) => {
    w.where((q) => {
      if (d.id) q.orWhere("asset_id", d.id);
      if (d.upload_id) q.orWhere("upload_id", d.upload_id);
      if (!d.id && !d.upload_id) q.whereRaw("1 = 0");
    });
  };
}

/** The job's clips the video service rejected, newest first: off the timeline, for staff to read and clear. */
export async function listFailedClips({ shopId, jobId }: { shopId: number; jobId: number }): Promise<FailedClip[]> {
  const rows = await db()("clips")
    .where({ shop_id: shopId, job_id: jobId, status: "errored" })
    .whereNull("entry_id")
    .orderBy("id", "desc")
    .limit(50)
    .select("public_id", "original_name", "error", "updated_at");
  return rows.map((r) => ({
    id: r.public_id,
    name: r.original_name,
    error: r.error ?? "The video service couldn't use this file.",
    failedAt: new Date(r.updated_at).toISOString(),
  }));
}

/** Clears one failed upload of the job; false when the job has no such failed clip. */
export async function clearFailedClip({ shopId, jobId, publicId }: { shopId: number; jobId: number; publicId: string }): Promise<boolean> {
  const removed = await db()("clips").where({ shop_id: shopId, job_id: jobId, public_id: publicId, status: "errored" }).whereNull("entry_id").delete();
  return Number(removed) > 0;
}
