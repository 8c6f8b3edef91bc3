import "server-only";
import { markClipDeleted } from "@/db/queries/clips";
import { getJobByPublicId } from "@/db/queries/jobs";
import { changeEntry, createPhotoEntry, insertEntry, insertPendingPhoto, listTimeline, moveJobStatus } from "@/db/queries/journal";
import { AppError } from "@/lib/errors";
import { JOB_STATUS_LABEL, type JobStatus, statusMoveError } from "@/lib/job-status";
import { JOB_PUBLIC_ID_PATTERN, type NewEntry, type TimelineAudience } from "@/lib/journal";
import { type Action, type Actor, can } from "@/lib/permissions";
import { parseNote } from "@/lib/rich-text/note";
import { authorize } from "@/lib/server/authorize";
import { audienceFor, jobResource } from "@/lib/server/following";
import { db } from "@/lib/server/db";
import { deletePhotoRenditions, processPhoto, storePhotoRenditions } from "@/lib/server/photos";
import { cancelDirectUpload, mux } from "@/lib/server/video";

export function entryIdParam(raw: string): number {
  if (!/^[1-9]\d{0,15}$/.test(raw)) throw new AppError("not_found", "No such entry.");
  return Number(raw);
}

/**
 * The job behind a timeline request and what this person may do with it. An unknown id and
 * someone else's job both answer 404, so job ids can't be probed.
 */
export async function journalAccess(actor: Actor, publicId: string, action: Action = "job:view") {
  const job = JOB_PUBLIC_ID_PATTERN.test(publicId) ? await getJobByPublicId({ publicId }) : null;
  const resource = job && (await jobResource(actor, job));
  if (!job || !resource || !can(actor, "job:view", resource)) throw new AppError("not_found", "No such job, or it isn't yours to see.");
  authorize(actor, action, resource);
  const audience: TimelineAudience = audienceFor(actor, resource);
  return { job, resource, audience, mayModerate: can(actor, "journal:moderate", resource) };
}

export async function readTimeline(actor: Actor, publicId: string, query: { order: "asc" | "desc"; after?: number; limit: number; as?: "owner" }) {
  const access = await journalAccess(actor, publicId);
  // Only staff may choose to read as the owner; a follower never reads more than a follower's view.
  const audience = access.audience === "shop" ? (query.as ?? "shop") : access.audience;
  const { job } = access;
  const page = await listTimeline({ shopId: job.shopId, jobId: job.id, audience, viewerUserId: actor.userId, order: query.order, after: query.after, limit: query.limit });
  return { ...page, audience };
}

export async function postEntry(actor: Actor, publicId: string, input: NewEntry): Promise<{ id: number }> {
  const { job } = await journalAccess(actor, publicId, "journal:post");
  if (input.kind === "note") {
    const doc = parseNote(input.note);
    // A transaction, so a shared note and its notice to followers are written together.
    const id = await db().transaction((tx) => insertEntry(tx, { shopId: job.shopId, jobId: job.id, kind: "note", authorId: actor.userId, visibility: input.visibility, body: doc }));
    return { id };
  }
  const id = await createPhotoEntry({
    shopId: job.shopId,
    jobId: job.id,
    authorId: actor.userId,
    photoIds: input.photoIds,
    caption: input.caption ?? null,
    visibility: input.visibility,
  });
  return { id };
}

export async function editEntry(
  actor: Actor,
  publicId: string,
  entryId: number,
  input: { version: number; note?: unknown; caption?: string | null; visibility?: "shop" | "shared"; delete?: true },
) {
  const { job, mayModerate } = await journalAccess(actor, publicId, "journal:post");
  const body = input.note === undefined ? undefined : parseNote(input.note);
  const result = await changeEntry({
    shopId: job.shopId,
    jobId: job.id,
    entryId,
    userId: actor.userId,
    mayModerate,
    expectedVersion: input.version,
    change: { body, caption: input.caption, visibility: input.visibility, delete: input.delete },
  });
  if (input.delete) await removeClipMedia({ shopId: job.shopId, entryId });
  return result;
}

/**
 * A deleted clip entry takes its video with it: the asset is deleted at the video service (or
 * the unfinished upload cancelled) and the clip stops playing at once. The entry's record stays.
 */
async function removeClipMedia({ shopId, entryId }: { shopId: number; entryId: number }) {
  const clip = await markClipDeleted({ shopId, entryId });
  if (!clip) return;
  try {
    if (clip.assetId) await mux().video.assets.delete(clip.assetId);
    else await cancelDirectUpload(clip.uploadId);
  } catch (error) {
    // The clip no longer plays here either way; the service's copy is logged for follow-up.
    console.error(`clip ${clip.publicId}: deleting its video at the service failed`, error);
  }
}

/** One uploaded file: checked, stripped and resized, stored, then recorded as a pending photo. */
export async function uploadPhoto(actor: Actor, publicId: string, file: File) {
  const { job } = await journalAccess(actor, publicId, "journal:post");
  const processed = await processPhoto(Buffer.from(await file.arrayBuffer()), { name: file.name });
  const stored = await storePhotoRenditions(processed, { shopId: job.shopId });
  try {
    return await insertPendingPhoto({
      shopId: job.shopId,
      jobId: job.id,
      userId: actor.userId,
      originalName: file.name || null,
      displayKey: stored.displayKey,
      thumbKey: stored.thumbKey,
      width: stored.width,
      height: stored.height,
      bytes: stored.bytes,
    });
  } catch (error) {
    // Nothing half-written: files without a row would never be served or cleaned up.
    await deletePhotoRenditions(stored).catch(() => undefined);
    throw error;
  }
}

/**
 * Moves a job to another status if the rules allow it and nobody moved it since the form was
 * shown (`from`); the move is recorded in the history and as a shared timeline entry.
 */
export async function changeJobStatus(actor: Actor, publicId: string, input: { from: JobStatus; to: JobStatus; note: string | null }) {
  const { job } = await journalAccess(actor, publicId, "job:change-status");
  if (job.status !== input.from) {
    throw new AppError("conflict", `Someone else has just moved this job to "${JOB_STATUS_LABEL[job.status]}". Check the timeline, then try again.`);
  }
  const refusal = statusMoveError(job.status, input.to);
  if (refusal) throw new AppError("invalid", refusal, { to: [refusal] });
  const moved = await moveJobStatus({ shopId: job.shopId, jobId: job.id, from: input.from, to: input.to, userId: actor.userId, note: input.note });
  if (!moved) throw new AppError("conflict", "Someone else moved this job at the same moment. Check the timeline, then try again.");
  return job;
}
