// Bench clips: limits, media addresses and durations. Pure: no I/O. What the browser declares
// before an upload is checked by the schemas in lib/schemas/clips.ts (kept apart so the player
// and the composer don't carry zod to the browser).

export const DEFAULT_CLIP_LIMITS = { maxSeconds: 600, maxBytes: 2 * 1024 ** 3 };
/** Upload chunk size for @mux/upchunk, in KiB (a multiple of 256): small enough to resume cheaply on garage Wi-Fi. */
export const CLIP_CHUNK_KIB = 1024;

/**
 * Where the browser plays a clip from: always our own route, which checks who is asking before
 * it streams from the video service, so a clip that is (or became) shop-only can't be reached
 * by the owner through an address they saw once.
 */
export function clipMediaUrls(clipPublicId: string): { src: string; poster: string } {
  const base = `/api/clips/${encodeURIComponent(clipPublicId)}`;
  return { src: `${base}/video.mp4`, poster: `${base}/poster.jpg` };
}

export const CLIP_MEDIA_FILES = ["video.mp4", "poster.jpg"] as const;

/** A clip the video service rejected: off the timeline, listed for the shop's staff until cleared. */
export type FailedClip = { id: string; name: string | null; error: string; failedAt: string };

export function formatDuration(seconds: number): string {
  const total = Math.round(seconds);
  const h = Math.floor(total / 3600);
  const m = Math.floor((total % 3600) / 60);
  const s = total % 60;
  return h ? `${h}:${String(m).padStart(2, "0")}:${String(s).padStart(2, "0")}` : `${m}:${String(s).padStart(2, "0")}`;
}

function sizeText(bytes: number): string {
  return bytes >= 1024 ** 3 ? `${+(bytes / 1024 ** 3).toFixed(1)} GB` : `${Math.round(bytes / 1024 ** 2)} MB`;
}

/** Why a clip can't be taken, in words for the bench, or null when it fits the shop's limits. */
export function clipLimitProblem(clip: { size: number; durationSeconds?: number | null; name?: string | null }, limits: { maxSeconds: number; maxBytes: number }): string | null {
  const what = clip.name ? `"${clip.name}"` : "This clip";
  if (clip.size > limits.maxBytes) return `${what} is ${sizeText(clip.size)}; the shop takes clips up to ${sizeText(limits.maxBytes)}. Trim it on the phone first.`;
  if (clip.durationSeconds != null && clip.durationSeconds > limits.maxSeconds) {
    return `${what} runs ${formatDuration(clip.durationSeconds)}; the shop takes clips up to ${formatDuration(limits.maxSeconds)}. Trim it on the phone first.`;
  }
  return null;
}

/** A moment a technician marked in a clip: where, and what is seen there. */
export type ClipMoment = { atMs: number; label: string };

/**
 * The marked moment a finding's evidence points at: the exact one, else one in the same whole
 * second (a time typed as "0:42" for a moment marked at 42.3 s). Null when none is there.
 */
export function momentAt(moments: readonly ClipMoment[], ms: number | null): ClipMoment | null {
  if (ms == null) return null;
  return moments.find((m) => m.atMs === ms) ?? moments.find((m) => Math.floor(m.atMs / 1000) === Math.floor(ms / 1000)) ?? null;
}

/** What the owner reads beside a clip in a finding: the clip's caption and the moment's, as the technician wrote them. */
export function clipEvidenceLabel(caption: string | null, moment: ClipMoment | null): string | null {
  return [caption, moment?.label].filter(Boolean).join(" — ") || null;
}
