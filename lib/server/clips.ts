import "server-only";
import { applyVideoEvent, createClipEntry, getClipLimits, newClipPublicId, type VideoEvent } from "@/db/queries/clips";
import { db } from "@/lib/server/db";
import { AppError } from "@/lib/errors";
import { type NewClip, clipLimitProblem } from "@/lib/clips";
import type { Actor } from "@/lib/permissions";
import { appUrl } from "@/lib/server/config";
import { journalAccess } from "@/lib/server/journal";
import { cancelDirectUpload, createDirectUpload, mux } from "@/lib/server/video";

/**
 * Starts a clip: checks it against the shop's limits, opens a direct upload at the video
 * service and puts a "processing" entry on the timeline at once. The browser then sends the
 * file straight to the upload URL, in resumable chunks.
 */
export async function startClipUpload(actor: Actor, jobPublicId: string, clip: NewClip) {
  const { job } = await journalAccess(actor, jobPublicId, "journal:post");
  const limits = await getClipLimits({ shopId: job.shopId });
  const problem = clipLimitProblem(clip, limits);
  if (problem) throw new AppError("too_large", problem, { size: [problem] });
  const publicId = newClipPublicId();
  const upload = await createDirectUpload({ corsOrigin: appUrl(), passthrough: publicId });
  try {
    const { entryId } = await createClipEntry({
      shopId: job.shopId,
      jobId: job.id,
      userId: actor.userId,
      uploadId: upload.id,
      publicId,
      name: clip.name ?? null,
      bytes: clip.size,
      caption: clip.caption,
      visibility: clip.visibility,
    });
    return { clipId: publicId, entryId, uploadUrl: upload.url, limits };
  } catch (error) {
    await cancelDirectUpload(upload.id);
    throw error;
  }
}

/** Verifies a webhook delivery on its raw body and applies it once. */
export async function receiveVideoWebhook(rawBody: string, headers: Headers): Promise<{ applied: boolean }> {
  const secret = process.env.MUX_WEBHOOK_SECRET;
  if (!secret) throw new AppError("unavailable", "Video webhooks are not configured (MUX_WEBHOOK_SECRET).");
  let event: VideoEvent;
  try {
    event = (await mux().webhooks.unwrap(rawBody, headers, secret)) as unknown as VideoEvent;
  } catch {
    throw new AppError("unauthenticated", "The webhook signature is missing, wrong or too old.");
  }
  const applied = await applyVideoEvent(event);
  if (applied && event.type === "video.asset.ready") await enforceDuration(event);
  return { applied };
}

/** The browser's declared length can be wrong: the processed asset is what counts. */
async function enforceDuration(event: VideoEvent) {
  const assetId = event.data.id;
  if (!assetId || event.data.duration == null) return;
  const row = await db()("clips as c").join("shops as s", "s.id", "c.shop_id").where("c.asset_id", assetId).first("c.id", "s.clip_max_seconds");
  if (!row || event.data.duration <= Number(row.clip_max_seconds)) return;
  const problem = clipLimitProblem({ size: 0, durationSeconds: event.data.duration }, { maxSeconds: Number(row.clip_max_seconds), maxBytes: Infinity });
  await db()("clips").where({ id: row.id }).update({ status: "errored", playback_id: null, error: problem });
  await mux()
    .video.assets.delete(assetId)
    .catch(() => undefined);
}
