// /_fake/* routes: switches and inspection for tests. No auth, because the server only answers loopback clients.
import { parseJson, type JsonResponse } from "./api";
import type { FakeContext } from "./context";
import { invalidParameter, MuxApiError } from "./errors";

const MAX_FAILURES = 1000;
const MAX_DELAY_MS = 10 * 60 * 1000;

function count(value: unknown): number {
  const n = value ?? 1;
  if (typeof n !== "number" || !Number.isInteger(n) || n < 1 || n > MAX_FAILURES) throw invalidParameter(`count must be a whole number from 1 to ${MAX_FAILURES}.`);
  return n;
}

function errorStatus(value: unknown, fallback: number): number {
  const status = value ?? fallback;
  if (typeof status !== "number" || !Number.isInteger(status) || status < 400 || status > 599) throw invalidParameter("status must be an HTTP error status such as 429, 500 or 503.");
  return status;
}

function status(ctx: FakeContext) {
  return {
    uploads: ctx.store.uploads.size,
    assets: ctx.store.assets.size,
    pending_api_failures: ctx.apiFailures.pending,
    pending_chunk_failures: ctx.chunkFailures.pending,
    processing_delay_ms: ctx.processor.delayMs,
    drop_webhooks: ctx.webhooks.drop,
  };
}

async function route(method: string, pathname: string, query: URLSearchParams, body: Buffer, ctx: FakeContext): Promise<JsonResponse> {
  const key = `${method} ${pathname}`;
  switch (key) {
    case "GET /_fake/health":
      return { status: 200, body: { ok: true } };
    case "GET /_fake/status":
      return { status: 200, body: status(ctx) };
    case "POST /_fake/fail": {
      const input = parseJson(body, '{"count": 2, "status": 500}');
      if (input.message !== undefined && typeof input.message !== "string") throw invalidParameter("message must be a string.");
      ctx.apiFailures.arm(count(input.count), { status: errorStatus(input.status, 500), message: input.message ?? null });
      return { status: 200, body: status(ctx) };
    }
    case "DELETE /_fake/fail":
      ctx.apiFailures.clear();
      return { status: 200, body: status(ctx) };
    case "POST /_fake/fail-chunks": {
      const input = parseJson(body, '{"count": 1, "status": 503} or {"count": 1, "drop": true}');
      ctx.chunkFailures.arm(count(input.count), input.drop === true ? { drop: true } : { status: errorStatus(input.status, 503) });
      return { status: 200, body: status(ctx) };
    }
    case "DELETE /_fake/fail-chunks":
      ctx.chunkFailures.clear();
      return { status: 200, body: status(ctx) };
    case "POST /_fake/delay": {
      const ms = parseJson(body, '{"ms": 2000}').ms;
      if (typeof ms !== "number" || !Number.isInteger(ms) || ms < 0 || ms > MAX_DELAY_MS) throw invalidParameter(`ms must be a whole number from 0 to ${MAX_DELAY_MS}.`);
      ctx.processor.delayMs = ms;
      return { status: 200, body: status(ctx) };
    }
    case "POST /_fake/webhooks/drop": {
      const drop = parseJson(body, '{"drop": true}').drop;
      if (typeof drop !== "boolean") throw invalidParameter("drop must be true or false.");
      ctx.webhooks.drop = drop;
      return { status: 200, body: status(ctx) };
    }
    case "GET /_fake/webhooks": {
      const type = query.get("type");
      const objectId = query.get("object_id");
      const data = ctx.store.deliveries.filter((d) => (type === null || d.type === type) && (objectId === null || d.object.id === objectId));
      return { status: 200, body: { data } };
    }
    case "POST /_fake/reset": {
      const everything = parseJson(body, '{"state": true}').state === true;
      ctx.apiFailures.clear();
      ctx.chunkFailures.clear();
      ctx.processor.delayMs = 0;
      ctx.webhooks.drop = false;
      ctx.webhooks.cancelPending();
      ctx.store.deliveries = [];
      if (everything) {
        ctx.processor.abortAll();
        await ctx.store.wipe();
      } else {
        await ctx.store.save();
      }
      return { status: 200, body: status(ctx) };
    }
    default:
      throw new MuxApiError(404, "not_found", `No fake control route ${key}.`);
  }
}

export async function handleControl(method: string, pathname: string, query: URLSearchParams, body: Buffer, ctx: FakeContext): Promise<JsonResponse> {
  try {
    return await route(method, pathname, query, body, ctx);
  } catch (error) {
    if (error instanceof MuxApiError) return { status: error.status, body: error.toBody() };
    throw error;
  }
}
