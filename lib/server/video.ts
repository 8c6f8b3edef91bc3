import "server-only";
import Mux from "@mux/mux-node";
import { AppError } from "@/lib/errors";

// The only place that picks where video goes: MUX_BASE_URL points the official SDK at the
// local fake (fakes/video) or, unset, at the hosted API; real credentials work unchanged.
let client: Mux | undefined;

export function mux(): Mux {
  const tokenId = process.env.MUX_TOKEN_ID;
  const tokenSecret = process.env.MUX_TOKEN_SECRET;
  if (!tokenId || !tokenSecret) throw new AppError("unavailable", "Video is not configured (MUX_TOKEN_ID, MUX_TOKEN_SECRET).");
  client ??= new Mux({
    tokenId,
    tokenSecret,
    webhookSecret: process.env.MUX_WEBHOOK_SECRET ?? null,
    ...(process.env.MUX_BASE_URL ? { baseURL: process.env.MUX_BASE_URL } : {}),
    maxRetries: Number(process.env.MUX_MAX_RETRIES ?? 2),
  });
  return client;
}

/**
 * Where the app fetches a ready clip and its poster from, to stream them on to people allowed
 * to watch (app/api/clips). The hosted service serves an MP4 rendition (asked for at upload)
 * and thumbnails on its own domains; the local fake serves an MP4 and a JPEG on loopback.
 * `{id}` is the playback id.
 */
export function playbackUrls(playbackId: string): { src: string; poster: string } {
  const fill = (template: string) => template.replaceAll("{id}", encodeURIComponent(playbackId));
  return {
    src: fill(process.env.VIDEO_PLAYBACK_URL ?? "https://stream.mux.com/{id}/highest.mp4"),
    poster: fill(process.env.VIDEO_POSTER_URL ?? "https://image.mux.com/{id}/thumbnail.jpg"),
  };
}

/** Opens a direct upload the browser sends the file to, in chunks; `passthrough` comes back on the asset. */
export async function createDirectUpload({ corsOrigin, passthrough }: { corsOrigin: string; passthrough: string }) {
  try {
    const upload = await mux().video.uploads.create({
      cors_origin: corsOrigin,
      // An MP4 rendition, so the app can stream a clip on to whoever may watch it (app/api/clips).
      new_asset_settings: { playback_policies: ["public"], passthrough, static_renditions: [{ resolution: "highest" }] },
    });
    if (!upload.url) throw new Error("upload without url");
    return { id: upload.id, url: upload.url };
  } catch (error) {
    if (error instanceof AppError) throw error;
    console.error(error);
    throw new AppError("unavailable", "The video service didn't answer; try the clip again in a moment.");
  }
}

export async function cancelDirectUpload(uploadId: string): Promise<void> {
  await mux()
    .video.uploads.cancel(uploadId)
    .catch(() => undefined);
}

// Headers passed on from the video service, so seeking (range requests) works.
const PASSED_HEADERS = ["content-type", "content-length", "content-range", "accept-ranges", "last-modified", "etag"];

/**
 * Streams a ready clip's video or poster from the video service to a reader the caller has
 * already allowed, passing the Range header through. `cacheControl` is the caller's choice.
 */
export async function streamClipMedia(playbackId: string, file: "video.mp4" | "poster.jpg", req: Request, cacheControl: string): Promise<Response> {
  const urls = playbackUrls(playbackId);
  const range = req.headers.get("range");
  const upstream = await fetch(file === "poster.jpg" ? urls.poster : urls.src, { headers: range ? { range } : {}, signal: req.signal }).catch(() => null);
  if (!upstream || (!upstream.ok && upstream.status !== 416)) throw new AppError("unavailable", "The video service didn't answer; try again in a moment.");
  const headers = new Headers({ "cache-control": cacheControl, "x-content-type-options": "nosniff" });
  for (const name of PASSED_HEADERS) {
    const value = upstream.headers.get(name);
    if (value) headers.set(name, value);
  }
  return new Response(upstream.body, { status: upstream.status, headers });
}
