import "server-only";
import { markClipDeleted } from "@/db/queries/clips";
import { insertEntry } from "@/db/queries/entries";
import { changeEntry, createPhotoEntry, insertPendingPhoto, listTimeline } from "@/db/queries/journal";
import { applyJobEvent, lockJobRow } from "@/db/queries/workflow";
import { AppError } from "@/lib/errors";
import { JOB_STATUS_LABEL, type JobStatus, statusMoveError } from "@/lib/job-status";
import type { NewEntry } from "@/lib/schemas/journal";
import type { Actor } from "@/lib/permissions";
import type { JobAccess } from "@/lib/server/access";
import { parseNote } from "@/lib/rich-text/note";
import { transaction } from "@/db/transaction";
import { deletePhotoRenditions, processPhoto, storePhotoRenditions } from "@/lib/server/photos";
import { cancelDirectUpload, mux } from "@/lib/server/video";
import { refuseIfCollected } from "@/lib/server/open-job";

export async function readTimeline(actor: Actor, access: JobAccess, query: { order: "asc" | "desc"; after?: number; limit: number; as?: "owner" }) {
  // Only staff may choose to read as the owner; a follower never reads more than a follower's view.
  const audience = access.audience === "shop" ? (query.as ?? "shop") : access.audience;
  const { job } = access;
  const page = await listTimeline({ shopId: job.shopId, jobId: job.id, audience, viewerUserId: actor.userId, order: query.order, after: query.after, limit: query.limit });
  return { ...page, audience };
}

export async function postEntry(actor: Actor, { job }: JobAccess, input: NewEntry): Promise<{ id: number }> {
  refuseIfCollected(job);
  if (input.kind === "note") {
    const doc = parseNote(input.note);
    // A transaction, so a shared note and its notice to followers are written together.
    const id = await transaction((tx) => insertEntry(tx, { shopId: job.shopId, jobId: job.id, kind: "note", authorId: actor.userId, visibility: input.visibility, body: doc }));
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
  { job, mayModerate }: JobAccess,
  entryId: number,
  input: { version: number; note?: unknown; caption?: string | null; visibility?: "shop" | "shared"; delete?: true },
) {
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
export async function uploadPhoto(actor: Actor, { job }: JobAccess, file: File) {
  refuseIfCollected(job);
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
export async function changeJobStatus(actor: Actor, { job }: JobAccess, input: { from: JobStatus; to: JobStatus; note: string | null; override?: string | null }) {
  const refusal = statusMoveError(input.from, input.to);
  if (refusal) throw new AppError("invalid", refusal, { to: [refusal] });
  await transaction(async (tx) => {
    const status = await lockJobRow(tx, { shopId: job.shopId, jobId: job.id });
    if (status !== input.from) {
      throw new AppError("conflict", `Someone else has just moved this job to "${JOB_STATUS_LABEL[status]}". Check the timeline, then try again.`);
    }
    // Handing the machine back goes through the collection gate: paid, or a reason recorded.
    const event = input.to === "picked_up" ? ({ kind: "collected", override: input.override ?? null } as const) : ({ kind: "manual", to: input.to } as const);
    const moved = await applyJobEvent(tx, { shopId: job.shopId, jobId: job.id, userId: actor.userId, event, note: input.note });
    if (!moved) throw new AppError("conflict", "Someone else moved this job at the same moment. Check the timeline, then try again.");
  });
  return job;
}
