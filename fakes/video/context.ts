// What every part of the fake shares, and the state changes more than one route makes
// (an upload finishing, an asset going away).
import { rm } from "node:fs/promises";
import type { ApiFailure, FailureSwitch } from "../shared/control";
import type { Processor } from "./processor";
import { newId, type VideoStore } from "./store";
import type { MuxAsset, MuxUpload, StoredUpload } from "./types";
import type { VideoWebhooks } from "./webhooks";

/** A chunk either gets an error status, or its connection is cut half-way through the body. */
export type ChunkFailure = { status: number } | { drop: true };

export type FakeContext = {
  store: VideoStore;
  webhooks: VideoWebhooks;
  processor: Processor;
  /** Base of the upload and media URLs handed to clients. */
  publicUrl: string;
  credentials: { tokenId: string; tokenSecret: string } | null;
  maxUploadBytes: number;
  apiFailures: FailureSwitch<ApiFailure>;
  chunkFailures: FailureSwitch<ChunkFailure>;
};

export function persist(ctx: FakeContext): Promise<void> {
  return ctx.store.save().catch((error: unknown) => console.error("video fake: could not save state", error));
}

export function uploadUrl(ctx: FakeContext, upload: StoredUpload): string {
  return `${ctx.publicUrl}/upload/${upload.id}?token=${upload.token}`;
}

export function toMuxUpload(ctx: FakeContext, upload: StoredUpload): MuxUpload {
  const { token: _token, created_ms: _created, total: _total, received: _received, ...rest } = upload;
  return { ...rest, url: uploadUrl(ctx, upload) };
}

/** Uploads time out lazily, when next looked at: the same outcome as a sweeper for a single-user fake. */
export function expireIfStale(ctx: FakeContext, upload: StoredUpload): void {
  if (upload.status !== "waiting" || Date.now() - upload.created_ms < upload.timeout * 1000) return;
  upload.status = "timed_out";
  void rm(ctx.store.sourcePath(upload.id), { force: true });
  void persist(ctx);
}

/** The last byte arrived: an asset in `preparing`, the webhooks the hosted service sends, then processing. */
export function completeUpload(ctx: FakeContext, upload: StoredUpload): MuxAsset {
  const settings = upload.new_asset_settings;
  const asset: MuxAsset = {
    id: newId(),
    status: "preparing",
    created_at: String(Math.floor(Date.now() / 1000)),
    playback_ids: (settings.playback_policies ?? []).map((policy) => ({ id: newId(), policy })),
    upload_id: upload.id,
    ingest_type: "on_demand_direct_upload",
    encoding_tier: "baseline",
    video_quality: "basic",
    master_access: "none",
    max_resolution_tier: "1080p",
    mp4_support: "none",
    progress: { state: "ingesting", progress: 0 },
    ...(settings.passthrough !== undefined ? { passthrough: settings.passthrough } : {}),
    ...(settings.meta !== undefined ? { meta: settings.meta } : {}),
    ...(upload.test ? { test: true } : {}),
  };
  ctx.store.assets.set(asset.id, asset);
  upload.status = "asset_created";
  upload.asset_id = asset.id;
  void persist(ctx);
  ctx.webhooks.emit("video.upload.asset_created", { type: "upload", id: upload.id }, toMuxUpload(ctx, upload));
  ctx.webhooks.emit("video.asset.created", { type: "asset", id: asset.id }, asset);
  ctx.processor.enqueue(asset.id);
  return asset;
}

export async function deleteAsset(ctx: FakeContext, asset: MuxAsset): Promise<void> {
  ctx.store.assets.delete(asset.id);
  ctx.processor.abort(asset.id);
  await rm(ctx.store.mediaDir(asset.id), { recursive: true, force: true });
  await rm(ctx.store.sourcePath(asset.upload_id), { force: true });
  await persist(ctx);
  ctx.webhooks.emit("video.asset.deleted", { type: "asset", id: asset.id }, asset);
}
