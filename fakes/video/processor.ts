// Turns finished uploads into playable assets, one at a time (ffmpeg already uses every core).
import { mkdir, rename, rm } from "node:fs/promises";
import path from "node:path";
import { setTimeout as sleep } from "node:timers/promises";
import { makePoster, makeRendition, NotAVideoError, probeVideo, ToolMissingError, type ProbeResult, type Tools } from "./media-tools";
import { newId, type VideoStore } from "./store";
import type { MuxAsset } from "./types";
import type { VideoWebhooks } from "./webhooks";

export const RENDITION_FILE = "video.mp4";
export const POSTER_FILE = "poster.jpg";

type Deps = { store: VideoStore; webhooks: VideoWebhooks; tools: Tools };

function shortSideClass(width: number, height: number): NonNullable<MuxAsset["max_stored_resolution"]> {
  const short = Math.min(width, height);
  if (short < 720) return "SD";
  if (short < 1080) return "HD";
  if (short < 2160) return "FHD";
  return "UHD";
}

function readyFields(source: ProbeResult, stored: ProbeResult): Partial<MuxAsset> {
  return {
    status: "ready",
    progress: { state: "completed", progress: 100 },
    duration: source.duration,
    aspect_ratio: source.aspectRatio,
    resolution_tier: "720p",
    max_stored_resolution: shortSideClass(stored.width, stored.height),
    max_stored_frame_rate: source.frameRate,
    tracks: [
      { id: newId(), type: "video", duration: stored.videoDuration, max_width: stored.width, max_height: stored.height, max_frame_rate: stored.frameRate },
      ...(stored.audio ? [{ id: newId(), type: "audio" as const, duration: stored.audio.duration, max_channels: stored.audio.channels }] : []),
    ],
  };
}

export class Processor {
  /** The delay switch: how long an asset waits in `preparing` before work starts. */
  delayMs = 0;
  private readonly queue: string[] = [];
  private current: { assetId: string; controller: AbortController } | null = null;
  private running = false;
  private closed = false;
  private readonly deps: Deps;

  constructor(deps: Deps) {
    this.deps = deps;
  }

  enqueue(assetId: string): void {
    if (this.closed || this.queue.includes(assetId)) return;
    this.queue.push(assetId);
    if (!this.running) void this.drain();
  }

  /** Stops work on an asset that is being deleted. */
  abort(assetId: string): void {
    const at = this.queue.indexOf(assetId);
    if (at >= 0) this.queue.splice(at, 1);
    if (this.current?.assetId === assetId) this.current.controller.abort();
  }

  abortAll(): void {
    this.queue.length = 0;
    this.current?.controller.abort();
  }

  /** Unfinished work stays `preparing` on disk and is picked up at the next start. */
  close(): void {
    this.closed = true;
    this.abortAll();
  }

  private async drain(): Promise<void> {
    this.running = true;
    try {
      for (let next = this.queue.shift(); next !== undefined && !this.closed; next = this.queue.shift()) {
        await this.process(next);
      }
    } finally {
      this.running = false;
    }
  }

  private async process(assetId: string): Promise<void> {
    const { store, webhooks, tools } = this.deps;
    const asset = store.assets.get(assetId);
    if (!asset || asset.status !== "preparing") return;
    const controller = new AbortController();
    this.current = { assetId, controller };
    const { signal } = controller;
    const source = store.sourcePath(asset.upload_id);
    const dir = store.mediaDir(assetId);
    try {
      if (this.delayMs > 0) await sleep(this.delayMs, undefined, { signal });
      const probe = await probeVideo(source, tools, signal);
      await mkdir(dir, { recursive: true });
      // Write under temporary names so a half-made file is never served.
      const poster = path.join(dir, `part-${POSTER_FILE}`);
      const rendition = path.join(dir, `part-${RENDITION_FILE}`);
      await makePoster(source, poster, probe, tools, signal);
      await makeRendition(source, rendition, probe, tools, signal);
      const stored = await probeVideo(rendition, tools, signal);
      await rename(poster, path.join(dir, POSTER_FILE));
      await rename(rendition, path.join(dir, RENDITION_FILE));
      if (signal.aborted || !store.assets.has(assetId)) throw new Error("deleted while processing");
      Object.assign(asset, readyFields(probe, stored));
      await rm(source, { force: true });
      await store.save();
      webhooks.emit("video.asset.ready", { type: "asset", id: assetId }, asset);
    } catch (error) {
      if (signal.aborted || !store.assets.has(assetId)) {
        // Deleted meanwhile (its files go with it), or the fake is closing (keep them to resume).
        if (!store.assets.has(assetId)) await rm(dir, { recursive: true, force: true });
        return;
      }
      const message =
        error instanceof NotAVideoError || error instanceof ToolMissingError
          ? error.message
          : `The uploaded file could not be converted to a playable video (${error instanceof Error ? error.message : String(error)}).`;
      asset.status = "errored";
      asset.progress = { state: "errored", progress: -1 };
      asset.errors = { type: error instanceof ToolMissingError ? "internal_error" : "invalid_input", messages: [message] };
      await rm(dir, { recursive: true, force: true });
      await rm(source, { force: true });
      await store.save().catch((saveError: unknown) => console.error("video fake: could not save state", saveError));
      webhooks.emit("video.asset.errored", { type: "asset", id: assetId }, asset);
    } finally {
      this.current = null;
    }
  }
}
