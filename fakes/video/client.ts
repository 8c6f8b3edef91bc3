// Typed calls to the video fake's /_fake switches, for integration and end-to-end tests.
import type { WebhookDelivery, WebhookType } from "./types";

export type VideoFakeStatus = {
  uploads: number;
  assets: number;
  pending_api_failures: number;
  pending_chunk_failures: number;
  processing_delay_ms: number;
  drop_webhooks: boolean;
};

async function call<T>(baseUrl: string, method: string, path: string, body?: unknown): Promise<T> {
  const res = await fetch(`${baseUrl}${path}`, {
    method,
    headers: body === undefined ? {} : { "content-type": "application/json" },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  const text = await res.text();
  if (!res.ok) throw new Error(`video fake ${method} ${path} answered ${res.status}: ${text}`);
  return JSON.parse(text) as T;
}

/** The next `count` Video API calls fail with `status` (429 adds retry-after: 1). */
export const failNextApiCalls = (baseUrl: string, count: number, status = 500) =>
  call<VideoFakeStatus>(baseUrl, "POST", "/_fake/fail", { count, status });

/** The next `count` upload chunks get `status`, or with `drop` lose their connection half-way through. */
export const failNextChunks = (baseUrl: string, count: number, how: { status: number } | { drop: true } = { status: 503 }) =>
  call<VideoFakeStatus>(baseUrl, "POST", "/_fake/fail-chunks", { count, ...how });

/** Keeps new assets in `preparing` for `ms` before processing starts (0 turns it off). */
export const delayProcessing = (baseUrl: string, ms: number) => call<VideoFakeStatus>(baseUrl, "POST", "/_fake/delay", { ms });

/** While on, webhook events are recorded as `dropped` and not sent. */
export const dropWebhooks = (baseUrl: string, drop: boolean) => call<VideoFakeStatus>(baseUrl, "POST", "/_fake/webhooks/drop", { drop });

/** Clears the switches and the delivery log; with `state: true` also every upload, asset and media file. */
export const resetVideoFake = (baseUrl: string, opts: { state?: boolean } = {}) =>
  call<VideoFakeStatus>(baseUrl, "POST", "/_fake/reset", { state: opts.state === true });

export async function listWebhookDeliveries(baseUrl: string, filter: { type?: WebhookType; objectId?: string } = {}): Promise<WebhookDelivery[]> {
  const query = new URLSearchParams();
  if (filter.type) query.set("type", filter.type);
  if (filter.objectId) query.set("object_id", filter.objectId);
  const { data } = await call<{ data: WebhookDelivery[] }>(baseUrl, "GET", `/_fake/webhooks?${query}`);
  return data;
}

/** Polls the delivery log until an event of `type` for `objectId` is recorded. */
export async function waitForWebhook(
  baseUrl: string,
  filter: { type: WebhookType; objectId?: string; state?: WebhookDelivery["state"] },
  timeoutMs = 30_000,
): Promise<WebhookDelivery> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const found = (await listWebhookDeliveries(baseUrl, filter)).find((d) => filter.state === undefined || d.state === filter.state);
    if (found) return found;
    if (Date.now() > deadline) {
      throw new Error(`video fake: no ${filter.type} webhook${filter.objectId ? ` for ${filter.objectId}` : ""}${filter.state ? ` in state ${filter.state}` : ""} within ${timeoutMs} ms`);
    }
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

/** Where the fake serves a ready asset's rendition and poster. */
export function mediaUrls(baseUrl: string, playbackId: string): { src: string; poster: string } {
  return { src: `${baseUrl}/media/${playbackId}/video.mp4`, poster: `${baseUrl}/media/${playbackId}/poster.jpg` };
}

/** One PUT of bytes start..end (inclusive) the way @mux/upchunk sends it; `range` is the fake's Range answer. */
export async function putUploadChunk(uploadUrl: string, bytes: Uint8Array, start: number, end: number, total: number | "*") {
  const res = await fetch(uploadUrl, {
    method: "PUT",
    headers: { "content-type": "video/mp4", "content-range": `bytes ${start}-${end}/${total}` },
    body: bytes.slice(start, end + 1),
  });
  await res.arrayBuffer();
  return { status: res.status, range: res.headers.get("range") };
}

/** "Where did I get to?": 308 with `Range: bytes=0-N` once bytes have arrived, 200 when complete. */
export async function askUploadOffset(uploadUrl: string, total: number) {
  const res = await fetch(uploadUrl, { method: "PUT", headers: { "content-range": `bytes */${total}` } });
  await res.arrayBuffer();
  return { status: res.status, range: res.headers.get("range") };
}
