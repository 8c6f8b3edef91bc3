import "server-only";
import { type RejectedClip, applyVideoEvent, clearFailedClip, createClipEntry, getClipLimits, listFailedClips, newClipPublicId } from "@/db/queries/clips";
import { AppError } from "@/lib/errors";
import { clipLimitProblem } from "@/lib/clips";
import type { NewClip } from "@/lib/schemas/clips";
import type { Actor } from "@/lib/permissions";
import { firstIssue, videoEventSchema } from "@/lib/schemas/webhooks";
import { appUrl } from "@/lib/server/config";
import type { JobAccess } from "@/lib/server/access";
import { refuseIfCollected } from "@/lib/server/open-job";
import { cancelDirectUpload, createDirectUpload, mux } from "@/lib/server/video";

/**
 * Starts a clip: checks it against the shop's limits, opens a direct upload at the video
 * service and puts a "processing" entry on the timeline at once. The browser then sends the
 * file straight to the upload URL, in resumable chunks.
 */
export async function startClipUpload(actor: Actor, { job }: JobAccess, clip: NewClip) {
  refuseIfCollected(job);
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

/**
 * Verifies a webhook delivery on its raw body and applies it once. A signed delivery we can't use
 * (not JSON, the wrong shape, a type we don't act on) is logged and acknowledged: the service
 * retries anything but a 2xx, so refusing it would bring it back forever.
 */
export async function receiveVideoWebhook(rawBody: string, headers: Headers): Promise<{ applied: boolean; ignored?: string }> {
  const secret = process.env.MUX_WEBHOOK_SECRET;
  if (!secret) throw new AppError("unavailable", "Video webhooks are not configured (MUX_WEBHOOK_SECRET).");
  try {
    await mux().webhooks.verifySignature(rawBody, headers, secret);
  } catch (error) {
    if (error instanceof AppError) throw error;
    throw new AppError("unauthenticated", "The webhook signature is missing, wrong or too old.");
  }
  let body: unknown;
  try {
    body = JSON.parse(rawBody);
  } catch {
    return ignored("the body is not JSON");
  }
  const parsed = videoEventSchema.safeParse(body);
  if (!parsed.success) return ignored(`unusable video event (${firstIssue(parsed.error)})`);
  const event = parsed.data;
  if (!HANDLED_VIDEO_EVENTS.has(event.type)) {
    console.info(`video webhook: ${event.type} ${event.id} is not one we act on; acknowledged`);
    return { applied: false, ignored: `type ${event.type}` };
  }
  const { applied, rejected } = await applyVideoEvent(event);
  // Off the timeline, so off the service too: nothing is kept of a clip that can't be played.
  for (const clip of rejected) await forgetAsset(clip);
  return { applied };
}

const HANDLED_VIDEO_EVENTS = new Set(["video.upload.asset_created", "video.upload.errored", "video.upload.cancelled", "video.asset.ready", "video.asset.errored", "video.asset.deleted"]);

function ignored(reason: string) {
  console.warn(`video webhook ignored: ${reason}`);
  return { applied: false, ignored: reason };
}

async function forgetAsset(clip: RejectedClip) {
  if (!clip.assetId) return;
  try {
    await mux().video.assets.delete(clip.assetId);
  } catch (error) {
    if ((error as { status?: number }).status === 404) return; // already gone
    // The clip is already off the timeline; the service's copy is logged for follow-up.
    console.error(`clip ${clip.publicId}: deleting its rejected asset at the video service failed`, error);
  }
}

/** The job's clips the video service rejected: not on the timeline, listed for staff until cleared. */
export function failedClips({ job }: JobAccess) {
  return listFailedClips({ shopId: job.shopId, jobId: job.id });
}

/** Clears one failed upload from the job's list (404 when there is no such failed clip). */
export async function clearFailedClipOfJob({ job }: JobAccess, clipPublicId: string) {
  if (!(await clearFailedClip({ shopId: job.shopId, jobId: job.id, publicId: clipPublicId }))) throw new AppError("not_found", "No such failed clip on this job.");
  return { cleared: clipPublicId };
}
