// Shapes shared by the video fake, its control client and tests. Public shapes follow the Mux Video API
// types in @mux/mux-node (resources/video/uploads.ts, assets.ts, webhooks.ts), trimmed to what the fake fills in.
import type { DeliveryAttempt as BaseAttempt, DeliveryState } from "../shared/webhooks";

export type PlaybackId = { id: string; policy: "public" };

export type UploadStatus = "waiting" | "asset_created" | "errored" | "cancelled" | "timed_out";

export type NewAssetSettings = {
  playback_policies?: "public"[];
  passthrough?: string;
  meta?: Record<string, string>;
  video_quality?: string;
  test?: boolean;
};

/** One direct upload as kept on disk; `token` and the byte counters never leave the fake. */
export type StoredUpload = {
  id: string;
  status: UploadStatus;
  cors_origin: string;
  timeout: number;
  new_asset_settings: NewAssetSettings;
  test?: boolean;
  asset_id?: string;
  error?: { type: string; message: string };
  token: string;
  created_ms: number;
  /** Declared file size, known from the first Content-Range with a numeric total. */
  total: number | null;
  /** Contiguous bytes on disk from offset 0. */
  received: number;
};

/** The upload as the API returns it. */
export type MuxUpload = Omit<StoredUpload, "token" | "created_ms" | "total" | "received"> & { url: string };

export type AssetStatus = "preparing" | "ready" | "errored";

export type AssetTrack =
  | { id: string; type: "video"; duration: number; max_width: number; max_height: number; max_frame_rate: number }
  | { id: string; type: "audio"; duration: number; max_channels: number };

export type MuxAsset = {
  id: string;
  status: AssetStatus;
  created_at: string;
  playback_ids: PlaybackId[];
  upload_id: string;
  ingest_type: "on_demand_direct_upload";
  encoding_tier: "baseline";
  video_quality: "basic";
  master_access: "none";
  max_resolution_tier: "1080p";
  mp4_support: "none";
  progress: { state: "ingesting" | "transcoding" | "completed" | "errored"; progress: number };
  passthrough?: string;
  meta?: Record<string, string>;
  test?: boolean;
  duration?: number;
  aspect_ratio?: string;
  resolution_tier?: "720p";
  max_stored_resolution?: "SD" | "HD" | "FHD" | "UHD";
  max_stored_frame_rate?: number;
  tracks?: AssetTrack[];
  errors?: { type: string; messages: string[] };
};

export type WebhookType =
  | "video.upload.asset_created"
  | "video.upload.cancelled"
  | "video.asset.created"
  | "video.asset.ready"
  | "video.asset.errored"
  | "video.asset.deleted";

export type DeliveryAttempt = BaseAttempt & { id: string };

/** One webhook event and what happened to it, as `/_fake/webhooks` lists it. */
export type WebhookDelivery = {
  event_id: string;
  type: WebhookType;
  object: { type: "asset" | "upload"; id: string };
  created_at: string;
  data: MuxAsset | MuxUpload;
  state: DeliveryState;
  attempts: DeliveryAttempt[];
};
