// The fake's state: uploads, assets and webhook deliveries in one JSON file (rewritten atomically), upload
// bytes in uploads/, renditions and posters in media/<asset id>/. Reloaded at start so `npm start` survives restarts.
import { randomBytes } from "node:crypto";
import { mkdir, readFile, rename, rm, stat, writeFile } from "node:fs/promises";
import path from "node:path";
import type { MuxAsset, StoredUpload, WebhookDelivery } from "./types";

const STATE_FILE = "state.json";
/** Keeps the delivery log (a test aid) from growing without bound in a long dev session. */
const MAX_DELIVERIES = 1000;
const ALPHANUMERIC = "ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789";

type StateFile = { version: 1; uploads: StoredUpload[]; assets: MuxAsset[]; deliveries: WebhookDelivery[] };

/** Alphanumeric like the hosted service's ids, so ids survive being put in URLs unescaped. */
export function newId(length = 32): string {
  let out = "";
  while (out.length < length) {
    for (const byte of randomBytes(length)) {
      // 248 = 4 × 62: rejecting the rest keeps every character equally likely.
      if (byte < 248 && out.length < length) out += ALPHANUMERIC[byte % 62];
    }
  }
  return out;
}

const isObject = (value: unknown): value is Record<string, unknown> => typeof value === "object" && value !== null && !Array.isArray(value);

export class VideoStore {
  readonly dir: string;
  readonly uploads = new Map<string, StoredUpload>();
  readonly assets = new Map<string, MuxAsset>();
  deliveries: WebhookDelivery[] = [];
  private chain: Promise<void> = Promise.resolve();
  private queued: Promise<void> | null = null;

  private constructor(dir: string) {
    this.dir = dir;
  }

  static async open(dir: string): Promise<VideoStore> {
    const store = new VideoStore(dir);
    await store.makeFolders();
    await store.load();
    return store;
  }

  private async makeFolders(): Promise<void> {
    await mkdir(path.join(this.dir, "uploads"), { recursive: true });
    await mkdir(path.join(this.dir, "media"), { recursive: true });
  }

  private async load(): Promise<void> {
    const file = path.join(this.dir, STATE_FILE);
    let parsed: unknown;
    try {
      parsed = JSON.parse(await readFile(file, "utf8"));
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code === "ENOENT") return;
      // Keep the bad file for a human to look at, and start empty rather than refuse to run.
      const aside = `${file}.unreadable-${Date.now()}`;
      await rename(file, aside).catch(() => undefined);
      console.warn(`video fake: ${STATE_FILE} was unreadable; moved it to ${aside} and started empty`);
      return;
    }
    if (!isObject(parsed) || parsed.version !== 1) {
      console.warn(`video fake: ${STATE_FILE} is not a video fake state file; starting empty`);
      return;
    }
    const list = (value: unknown) => (Array.isArray(value) ? value.filter(isObject) : []);
    for (const upload of list(parsed.uploads) as StoredUpload[]) {
      if (typeof upload.id !== "string") continue;
      if (upload.status === "waiting") {
        // Bytes that reached the disk before a crash count: chunks never leave gaps, so the file size is the offset.
        upload.received = await stat(this.sourcePath(upload.id)).then((s) => s.size, () => 0);
      }
      this.uploads.set(upload.id, upload);
    }
    for (const asset of list(parsed.assets) as MuxAsset[]) {
      if (typeof asset.id === "string" && Array.isArray(asset.playback_ids)) this.assets.set(asset.id, asset);
    }
    this.deliveries = (list(parsed.deliveries) as WebhookDelivery[]).filter((d) => typeof d.event_id === "string" && Array.isArray(d.attempts));
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

  addDelivery(delivery: WebhookDelivery): void {
    this.deliveries.push(delivery);
    let excess = this.deliveries.length - MAX_DELIVERIES;
    if (excess > 0) {
      // Settled deliveries go first; pending ones still have retries scheduled.
      this.deliveries = this.deliveries.filter((d) => excess <= 0 || d.state === "pending" || excess-- <= 0);
    }
  }

  /** Coalesces bursts: a save requested while another is queued shares that write. */
  save(): Promise<void> {
    if (this.queued) return this.queued;
    const next = this.chain.then(() => {
      this.queued = null;
      return this.writeNow();
    });
    this.queued = next;
    this.chain = next.catch(() => undefined);
    return next;
  }

  private async writeNow(): Promise<void> {
    const state: StateFile = {
      version: 1,
      uploads: [...this.uploads.values()],
      assets: [...this.assets.values()],
      deliveries: this.deliveries,
    };
    const file = path.join(this.dir, STATE_FILE);
    // Write-then-rename so a crash never leaves a truncated state file.
    await writeFile(`${file}.tmp`, `${JSON.stringify(state, null, 1)}\n`, "utf8");
    await rename(`${file}.tmp`, file);
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
