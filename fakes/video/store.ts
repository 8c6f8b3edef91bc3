// The fake's state: uploads, assets and webhook deliveries in one JSON file (rewritten atomically), upload
// bytes in uploads/, renditions and posters in media/<asset id>/. Reloaded at start so `npm start` survives restarts.
import { mkdir, rm, stat } from "node:fs/promises";
import path from "node:path";
import { isObject, JsonStateStore, randomAlphanumeric } from "../shared/json-store";
import type { MuxAsset, StoredUpload, WebhookDelivery } from "./types";

export const newId = (length = 32): string => randomAlphanumeric(length);

export class VideoStore extends JsonStateStore<WebhookDelivery> {
  readonly uploads = new Map<string, StoredUpload>();
  readonly assets = new Map<string, MuxAsset>();
  protected readonly label = "video fake";

  protected async makeFolders(): Promise<void> {
    await mkdir(path.join(this.dir, "uploads"), { recursive: true });
    await mkdir(path.join(this.dir, "media"), { recursive: true });
  }

  protected async restore(state: Record<string, unknown>): Promise<void> {
    const list = (value: unknown) => (Array.isArray(value) ? value.filter(isObject) : []);
    for (const upload of list(state.uploads) as StoredUpload[]) {
      if (typeof upload.id !== "string") continue;
      if (upload.status === "waiting") {
        // Bytes that reached the disk before a crash count: chunks never leave gaps, so the file size is the offset.
        upload.received = await stat(this.sourcePath(upload.id)).then((s) => s.size, () => 0);
      }
      this.uploads.set(upload.id, upload);
    }
    for (const asset of list(state.assets) as MuxAsset[]) {
      if (typeof asset.id === "string" && Array.isArray(asset.playback_ids)) this.assets.set(asset.id, asset);
    }
    this.deliveries = (list(state.deliveries) as WebhookDelivery[]).filter((d) => typeof d.event_id === "string" && Array.isArray(d.attempts));
  }

  protected snapshot() {
    return { uploads: [...this.uploads.values()], assets: [...this.assets.values()], deliveries: this.deliveries };
  }

  sourcePath(uploadId: string): string {
    return path.join(this.dir, "uploads", `${uploadId}.upload`);
  }

  mediaDir(assetId: string): string {
    return path.join(this.dir, "media", assetId);
  }

  assetByPlaybackId(playbackId: string): MuxAsset | undefined {
    for (const asset of this.assets.values()) {
      if (asset.playback_ids.some((p) => p.id === playbackId)) return asset;
    }
    return undefined;
  }

  /** Forgets everything and removes the fake's files (only the folders it made). */
  async wipe(): Promise<void> {
    this.uploads.clear();
    this.assets.clear();
    this.deliveries = [];
    await rm(path.join(this.dir, "uploads"), { recursive: true, force: true });
    await rm(path.join(this.dir, "media"), { recursive: true, force: true });
    await this.makeFolders();
    await this.save();
  }
}
