import "server-only";
import type { Knex } from "knex";
import { db } from "@/lib/server/db";
import { AppError } from "@/lib/errors";
import { clipMediaUrls } from "@/lib/clips";
import type { ClipStatus, EntryVisibility, TimelineClip } from "@/lib/journal";
import { insertEntry, newPhotoPublicId } from "./journal";

type Raw = Record<string, unknown>;

export async function getClipLimits({ shopId }: { shopId: number }) {
  const row = (await db()("shops").where({ id: shopId }).first("clip_max_seconds", "clip_max_bytes")) as Raw;
  return { maxSeconds: Number(row.clip_max_seconds), maxBytes: Number(row.clip_max_bytes) };
}

export async function saveClipLimits({ shopId, maxSeconds, maxBytes }: { shopId: number; maxSeconds: number; maxBytes: number }) {
  await db()("shops").where({ id: shopId }).update({ clip_max_seconds: maxSeconds, clip_max_bytes: maxBytes });
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
  return db().transaction(async (tx) => {
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

/** The clips of these entries in one query, keyed by entry id. */
export async function clipsForEntries(k: Knex, shopId: number, entryIds: number[]): Promise<Map<number, TimelineClip>> {
  const out = new Map<number, TimelineClip>();
  if (!entryIds.length) return out;
  const rows = (await k("clips")
    .where("shop_id", shopId)
    .whereIn("entry_id", entryIds)
    .select("id", "entry_id", "public_id", "status", "duration_seconds", "aspect_ratio", "playback_id", "error")) as Raw[];
  // The moments of all these clips in one more query.
  const moments = new Map<number, { atMs: number; label: string }[]>();
  if (rows.length) {
    const marked = (await k("clip_moments")
      .where("shop_id", shopId)
      .whereIn("clip_id", rows.map((r) => Number(r.id)))
      .orderBy(["clip_id", "at_ms", "id"])
      .select("clip_id", "at_ms", "label")) as Raw[];
    for (const m of marked) {
      const list = moments.get(Number(m.clip_id)) ?? [];
      list.push({ atMs: Number(m.at_ms), label: String(m.label) });
      moments.set(Number(m.clip_id), list);
    }
  }
  for (const r of rows) {
    const status = r.status as ClipStatus;
    const urls = status === "ready" && r.playback_id ? clipMediaUrls(String(r.public_id)) : null;
    out.set(Number(r.entry_id), {
      id: String(r.public_id),
      status,
      durationSeconds: r.duration_seconds == null ? null : Number(r.duration_seconds),
      aspectRatio: (r.aspect_ratio as string | null) ?? null,
      src: urls?.src ?? null,
      poster: urls?.poster ?? null,
      error: (r.error as string | null) ?? null,
      moments: moments.get(Number(r.id)) ?? [],
    });
  }
  return out;
}

/** Marks a moment in a ready clip of this job; the label says what is seen there. */
export async function addClipMoment(p: { shopId: number; jobId: number; clipPublicId: string; atMs: number; label: string; userId: number }) {
  const clip = (await db()("clips").where({ shop_id: p.shopId, job_id: p.jobId, public_id: p.clipPublicId }).first("id", "status", "duration_seconds")) as Raw | undefined;
  if (!clip) throw new AppError("not_found", "No such clip on this job.");
  if (clip.status !== "ready") throw new AppError("invalid", "Moments can be marked once the clip is ready.");
  if (clip.duration_seconds != null && p.atMs > Number(clip.duration_seconds) * 1000 + 500) throw new AppError("invalid", "That moment is past the end of the clip.", { atSeconds: ["Past the end of the clip."] });
  const [id] = await db()("clip_moments").insert({ shop_id: p.shopId, clip_id: clip.id, at_ms: p.atMs, label: p.label, created_by_user_id: p.userId });
  return { id: Number(id) };
}

/** Stops a clip playing (its entry was deleted); returns what the video service must forget. */
export async function markClipDeleted({ shopId, entryId }: { shopId: number; entryId: number }) {
  const row = (await db()("clips").where({ shop_id: shopId, entry_id: entryId }).first("id", "public_id", "asset_id", "upload_id")) as Raw | undefined;
  if (!row) return null;
  await db()("clips").where({ id: row.id }).update({ status: "deleted", playback_id: null, updated_at: db().fn.now(3) });
  return { publicId: String(row.public_id), assetId: (row.asset_id as string | null) ?? null, uploadId: String(row.upload_id) };
}

/** What the media route needs to decide who may watch a clip. */
export async function getClipAccess({ publicId }: { publicId: string }) {
  const row = (await db()("clips as v")
    .join("jobs as j", "j.id", "v.job_id")
    .join("customers as c", "c.id", "j.customer_id")
    .join("journal_entries as e", "e.id", "v.entry_id")
    .where("v.public_id", publicId)
    .first("v.shop_id", "v.job_id", "v.status", "v.playback_id", "c.user_id as customer_user_id", "e.visibility", "e.deleted_at")) as Raw | undefined;
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
  };
}

export type VideoEvent = {
  id: string;
  type: string;
  data: {
    id?: string;
    upload_id?: string;
    asset_id?: string;
    status?: string;
    duration?: number;
    aspect_ratio?: string;
    playback_ids?: { id: string; policy?: string }[];
    errors?: { type?: string; messages?: string[] };
  };
};

/**
 * Applies one webhook event exactly once: its id is recorded in the same transaction as its
 * effect, so a redelivery (same id) finds the row and changes nothing. Returns whether it
 * had an effect.
 */
export async function applyVideoEvent(event: VideoEvent): Promise<boolean> {
  return db().transaction(async (tx) => {
    const inserted = await tx.raw("INSERT IGNORE INTO video_webhook_events (event_id, type) VALUES (?, ?)", [event.id, event.type]);
    if (Number((inserted as [{ affectedRows: number }])[0].affectedRows) === 0) return false;
    const d = event.data;
    const now = tx.fn.now(3);
    switch (event.type) {
      case "video.upload.asset_created":
        if (d.id && d.asset_id) await tx("clips").where({ upload_id: d.id, status: "uploading" }).update({ asset_id: d.asset_id, status: "processing", updated_at: now });
        return true;
      case "video.asset.ready": {
        const playback = d.playback_ids?.find((p) => p.policy !== "signed") ?? d.playback_ids?.[0];
        await clipOfAsset(tx, d).update({
          asset_id: d.id,
          status: "ready",
          playback_id: playback?.id ?? null,
          duration_seconds: d.duration ?? null,
          aspect_ratio: d.aspect_ratio ?? null,
          error: null,
          updated_at: now,
        });
        return true;
      }
      case "video.asset.errored":
        await clipOfAsset(tx, d).update({
          asset_id: d.id,
          status: "errored",
          error: (d.errors?.messages?.join(" ") || "The video couldn't be processed.").slice(0, 500),
          updated_at: now,
        });
        return true;
      case "video.asset.deleted":
        await clipOfAsset(tx, d).update({ status: "deleted", playback_id: null, updated_at: now });
        return true;
      default:
        // Recorded, so a redelivery stays a no-op too; nothing else to do.
        return true;
    }
  });
}

/** Events about an asset name it by id, and the upload it came from. */
function clipOfAsset(tx: Knex.Transaction, d: VideoEvent["data"]) {
  return tx("clips").where((w) => {
    if (d.id) w.orWhere("asset_id", d.id);
    if (d.upload_id) w.orWhere("upload_id", d.upload_id);
    if (!d.id && !d.upload_id) w.whereRaw("1 = 0");
  });
}
