// The Mux Video API paths @mux/mux-node calls (uploads, assets, playback ids), in the hosted `{data: …}` envelopes.
import { createHash, timingSafeEqual } from "node:crypto";
import { rm } from "node:fs/promises";
import type { IncomingHttpHeaders } from "node:http";
import { parseJsonObject } from "../shared/control";
import type { JsonResponse } from "../shared/http";
import { deleteAsset, expireIfStale, persist, toMuxUpload, type FakeContext } from "./context";
import { injectedError, invalidParameter, MuxApiError, notFound } from "./errors";
import { newId } from "./store";
import type { MuxAsset, NewAssetSettings, StoredUpload } from "./types";

export type ApiRequest = { method: string; pathname: string; query: URLSearchParams; headers: IncomingHttpHeaders; body: Buffer };

// Limits the hosted API documents for `timeout` (seconds); 3600 is its default.
const TIMEOUT_DEFAULT = 3600;
const TIMEOUT_MIN = 60;
const TIMEOUT_MAX = 604800;

const digest = (value: string) => createHash("sha256").update(value).digest();

function authenticate(headers: IncomingHttpHeaders, credentials: FakeContext["credentials"]): void {
  const match = /^Basic\s+([A-Za-z0-9+/=]+)\s*$/i.exec(headers.authorization ?? "");
  const decoded = match?.[1] ? Buffer.from(match[1], "base64").toString("utf8") : "";
  const colon = decoded.indexOf(":");
  const [id, secret] = colon > 0 ? [decoded.slice(0, colon), decoded.slice(colon + 1)] : ["", ""];
  // Without configured credentials any non-empty pair passes, so `npm start` needs no set-up.
  const valid = credentials
    ? timingSafeEqual(digest(`${id}:${secret}`), digest(`${credentials.tokenId}:${credentials.tokenSecret}`))
    : id !== "" && secret !== "";
  if (!valid) throw new MuxApiError(401, "unauthorized", "Unauthorized request");
}

/** An empty body counts as `{}`. */
const parseJson = (body: Buffer): Record<string, unknown> => parseJsonObject(body, "{}", invalidParameter);

function policies(value: unknown, field: string): "public"[] {
  if (value === undefined) return [];
  if (!Array.isArray(value) || value.some((p) => typeof p !== "string")) throw invalidParameter(`${field} must be an array of strings.`);
  // Signed and DRM playback need token checks the fake does not do; refusing beats serving them openly.
  const other = value.find((p) => p !== "public");
  if (other !== undefined) throw invalidParameter(`${field}: the video fake supports only "public" playback, not "${String(other)}".`);
  return value as "public"[];
}

function parseSettings(raw: unknown): NewAssetSettings {
  if (raw === undefined) return {};
  if (typeof raw !== "object" || raw === null || Array.isArray(raw)) throw invalidParameter("new_asset_settings must be an object.");
  const s = raw as Record<string, unknown>;
  const settings: NewAssetSettings = {};
  // `playback_policy` is the deprecated spelling the SDK still types.
  const list = [...policies(s.playback_policies, "new_asset_settings.playback_policies"), ...policies(s.playback_policy, "new_asset_settings.playback_policy")];
  if (list.length > 0) settings.playback_policies = [...new Set(list)];
  if (s.passthrough !== undefined) {
    if (typeof s.passthrough !== "string" || s.passthrough.length > 255) throw invalidParameter("new_asset_settings.passthrough must be a string of at most 255 characters.");
    settings.passthrough = s.passthrough;
  }
  if (s.meta !== undefined) {
    const meta = s.meta as Record<string, unknown>;
    if (typeof meta !== "object" || meta === null || Object.values(meta).some((v) => typeof v !== "string")) throw invalidParameter("new_asset_settings.meta must map names to strings.");
    settings.meta = meta as Record<string, string>;
  }
  if (typeof s.video_quality === "string") settings.video_quality = s.video_quality;
  return settings;
}

async function createUpload(req: ApiRequest, ctx: FakeContext): Promise<JsonResponse> {
  const body = parseJson(req.body);
  const cors = body.cors_origin ?? "*";
  if (typeof cors !== "string") throw invalidParameter("cors_origin must be a string.");
  const timeout = body.timeout ?? TIMEOUT_DEFAULT;
  if (typeof timeout !== "number" || !Number.isInteger(timeout) || timeout < TIMEOUT_MIN || timeout > TIMEOUT_MAX) {
    throw invalidParameter(`timeout must be a whole number of seconds from ${TIMEOUT_MIN} to ${TIMEOUT_MAX}.`);
  }
  if (body.test !== undefined && typeof body.test !== "boolean") throw invalidParameter("test must be a boolean.");
  const upload: StoredUpload = {
    id: newId(),
    status: "waiting",
    cors_origin: cors,
    timeout,
    new_asset_settings: parseSettings(body.new_asset_settings),
    ...(body.test ? { test: true } : {}),
    token: newId(24),
    created_ms: Date.now(),
    total: null,
    received: 0,
  };
  ctx.store.uploads.set(upload.id, upload);
  await persist(ctx);
  return { status: 201, body: { data: toMuxUpload(ctx, upload) } };
}

/** `limit` (default 25, at most 100) and `page` (from 1), as the hosted lists take them. */
function paging(query: URLSearchParams): { limit: number; page: number } {
  const limit = Number(query.get("limit") ?? 25);
  const page = Number(query.get("page") ?? 1);
  if (!Number.isInteger(limit) || limit < 1 || limit > 100) throw invalidParameter("limit must be a whole number from 1 to 100.");
  if (!Number.isInteger(page) || page < 1) throw invalidParameter("page must be a whole number from 1.");
  return { limit, page };
}

/** Newest first. The SDK pages assets by cursor: ours is the id of the last asset of the previous page. */
function listAssets(req: ApiRequest, ctx: FakeContext): JsonResponse {
  const uploadId = req.query.get("upload_id");
  const all = [...ctx.store.assets.values()].reverse().filter((a) => uploadId === null || a.upload_id === uploadId);
  const { limit, page } = paging(req.query);
  const cursor = req.query.get("cursor");
  const from = cursor ? all.findIndex((a) => a.id === cursor) + 1 : (page - 1) * limit;
  if (cursor && from === 0) throw invalidParameter("cursor does not match any asset.");
  const data = all.slice(from, from + limit);
  const more = from + data.length < all.length;
  return { status: 200, body: { data, next_cursor: more ? (data.at(-1)?.id ?? null) : null } };
}

function findAsset(ctx: FakeContext, id: string): MuxAsset {
  const asset = ctx.store.assets.get(id);
  if (!asset) throw notFound("asset");
  return asset;
}

async function assetRoutes(req: ApiRequest, ctx: FakeContext, parts: string[]): Promise<JsonResponse> {
  const [assetId, sub, playbackId] = parts;
  if (assetId === undefined) {
    if (req.method === "GET") return listAssets(req, ctx);
    throw new MuxApiError(405, "method_not_allowed", "The video fake creates assets only from direct uploads.");
  }
  const asset = findAsset(ctx, assetId);
  if (sub === undefined) {
    if (req.method === "GET") return { status: 200, body: { data: asset } };
    if (req.method === "DELETE") {
      await deleteAsset(ctx, asset);
      return { status: 204, body: null };
    }
  }
  if (sub === "playback-ids" && playbackId === undefined && req.method === "POST") {
    const body = parseJson(req.body);
    const [policy] = policies([body.policy ?? "public"], "policy");
    const created = { id: newId(), policy: policy ?? "public" };
    asset.playback_ids.push(created);
    await persist(ctx);
    return { status: 201, body: { data: created } };
  }
  if (sub === "playback-ids" && playbackId !== undefined) {
    const found = asset.playback_ids.find((p) => p.id === playbackId);
    if (!found) throw notFound("playback ID");
    if (req.method === "GET") return { status: 200, body: { data: found } };
    if (req.method === "DELETE") {
      asset.playback_ids = asset.playback_ids.filter((p) => p !== found);
      await persist(ctx);
      return { status: 204, body: null };
    }
  }
  throw new MuxApiError(405, "method_not_allowed", `${req.method} is not supported on ${req.pathname}.`);
}

async function uploadRoutes(req: ApiRequest, ctx: FakeContext, parts: string[]): Promise<JsonResponse> {
  const [uploadId, action] = parts;
  if (uploadId === undefined) {
    if (req.method === "POST") return createUpload(req, ctx);
    if (req.method === "GET") {
      const uploads = [...ctx.store.uploads.values()].reverse();
      uploads.forEach((u) => expireIfStale(ctx, u));
      const { limit, page } = paging(req.query);
      return { status: 200, body: { data: uploads.slice((page - 1) * limit, page * limit).map((u) => toMuxUpload(ctx, u)) } };
    }
  } else {
    const upload = ctx.store.uploads.get(uploadId);
    if (!upload) throw notFound("upload");
    expireIfStale(ctx, upload);
    if (action === undefined && req.method === "GET") return { status: 200, body: { data: toMuxUpload(ctx, upload) } };
    if (action === "cancel" && req.method === "PUT") {
      if (upload.status !== "waiting") throw invalidParameter(`Only a waiting upload can be cancelled; this one is ${upload.status}.`);
      upload.status = "cancelled";
      await rm(ctx.store.sourcePath(upload.id), { force: true });
      await persist(ctx);
      ctx.webhooks.emit("video.upload.cancelled", { type: "upload", id: upload.id }, toMuxUpload(ctx, upload));
      return { status: 200, body: { data: toMuxUpload(ctx, upload) } };
    }
  }
  throw new MuxApiError(405, "method_not_allowed", `${req.method} is not supported on ${req.pathname}.`);
}

function playbackIdRoute(req: ApiRequest, ctx: FakeContext, playbackId: string): JsonResponse {
  if (req.method !== "GET") throw new MuxApiError(405, "method_not_allowed", `${req.method} is not supported on ${req.pathname}.`);
  const asset = ctx.store.assetByPlaybackId(playbackId);
  const found = asset?.playback_ids.find((p) => p.id === playbackId);
  if (!asset || !found) throw notFound("playback ID");
  return { status: 200, body: { data: { ...found, object: { type: "asset", id: asset.id } } } };
}

/** Never throws for API-level problems: they become Mux error envelopes. */
export async function handleApi(req: ApiRequest, ctx: FakeContext): Promise<JsonResponse> {
  try {
    const injected = ctx.apiFailures.take();
    if (injected) throw injectedError(injected.status, injected.message);
    authenticate(req.headers, ctx.credentials);
    const parts = req.pathname.split("/").slice(1).map((p) => decodeURIComponent(p));
    if (parts.some((p) => p === "")) throw notFound();
    const [product, version, collection, ...rest] = parts;
    if (product !== "video" || version !== "v1") throw notFound();
    if (collection === "uploads" && rest.length <= 2) return await uploadRoutes(req, ctx, rest);
    if (collection === "assets" && rest.length <= 3) return await assetRoutes(req, ctx, rest);
    if (collection === "playback-ids" && rest.length === 1 && rest[0] !== undefined) return playbackIdRoute(req, ctx, rest[0]);
    throw new MuxApiError(404, "not_found", `The video fake does not serve ${req.method} ${req.pathname}.`);
  } catch (error) {
    if (error instanceof MuxApiError) return error.toResponse();
    if (error instanceof URIError) return { status: 400, body: invalidParameter("The path is not valid URL encoding.").toBody() };
    console.error("video fake: unexpected API error", error);
    return { status: 500, body: new MuxApiError(500, "internal_error", "An internal error occurred.").toBody() };
  }
}
