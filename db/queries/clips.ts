import "server-only";
import type { Knex } from "knex";
import { db } from "@/lib/server/db";
import type { ClipStatus, EntryVisibility, TimelineClip } from "@/lib/journal";
import { playbackUrls } from "@/lib/server/video";
import { insertEntry, newPhotoPublicId } from "./journal";

type Raw = Record<string, unknown>;

export async function getClipLimits({ shopId }: { shopId: number }) {
  const row = (await db()("shops").where({ id: shopId }).first("clip_max_seconds", "clip_max_bytes")) as Raw;
  return { maxSeconds: Number(row.clip_max_seconds), maxBytes: Number(row.clip_max_bytes) };
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
    .select("entry_id", "public_id", "status", "duration_seconds", "aspect_ratio", "playback_id", "error")) as Raw[];
  for (const r of rows) {
    const status = r.status as ClipStatus;
    const urls = status === "ready" && r.playback_id ? playbackUrls(String(r.playback_id)) : null;
    out.set(Number(r.entry_id), {
      id: String(r.public_id),
      status,
      durationSeconds: r.duration_seconds == null ? null : Number(r.duration_seconds),
      aspectRatio: (r.aspect_ratio as string | null) ?? null,
      src: urls?.src ?? null,
      poster: urls?.poster ?? null,
      error: (r.error as string | null) ?? null,
    });
  }
  return out;
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
