// /_fake/* routes: switches and inspection for tests. No auth, because the server only answers loopback clients.
import type { JsonResponse } from "./api";
import { invalidRequest, PaymentsApiError } from "./errors";
import { type FakeContext, publicSession } from "./ledger";

const MAX_FAILURES = 1000;

function parseJson(body: Buffer, example: string): Record<string, unknown> {
  if (body.length === 0) return {};
  let parsed: unknown = null;
  try {
    parsed = JSON.parse(body.toString("utf8"));
  } catch {
    // reported below
  }
  if (typeof parsed !== "object" || parsed === null || Array.isArray(parsed)) throw invalidRequest(`Expected a JSON object body like ${example}.`);
  return parsed as Record<string, unknown>;
}

function status(ctx: FakeContext) {
  return {
    sessions: ctx.store.sessions.size,
    payment_intents: ctx.store.intents.size,
    refunds: ctx.store.refunds.size,
    pending_api_failures: ctx.failures.pending,
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
      const count = input.count ?? 1;
      const code = input.status ?? 500;
      if (typeof count !== "number" || !Number.isInteger(count) || count < 1 || count > MAX_FAILURES) throw invalidRequest(`count must be a whole number from 1 to ${MAX_FAILURES}.`);
      if (typeof code !== "number" || !Number.isInteger(code) || code < 400 || code > 599) throw invalidRequest("status must be an HTTP error status such as 429, 500 or 503.");
      if (input.message !== undefined && typeof input.message !== "string") throw invalidRequest("message must be a string.");
      ctx.failures.arm(count, { status: code, message: (input.message as string | undefined) ?? null });
      return { status: 200, body: status(ctx) };
    }
    case "DELETE /_fake/fail":
      ctx.failures.clear();
      return { status: 200, body: status(ctx) };
    case "POST /_fake/webhooks/drop": {
      const drop = parseJson(body, '{"drop": true}').drop;
      if (typeof drop !== "boolean") throw invalidRequest("drop must be true or false.");
      ctx.webhooks.drop = drop;
      return { status: 200, body: status(ctx) };
    }
    case "GET /_fake/webhooks": {
      const type = query.get("type");
      const objectId = query.get("object_id");
      const data = ctx.store.deliveries.filter((d) => (type === null || d.event.type === type) && (objectId === null || d.object_id === objectId));
      return { status: 200, body: { data } };
    }
    case "POST /_fake/webhooks/redeliver": {
      const eventId = parseJson(body, '{"event_id": "evt_…"}').event_id;
      const delivery = ctx.store.deliveries.find((d) => d.event.id === eventId);
      if (!delivery) throw new PaymentsApiError(404, "invalid_request_error", `No delivery of event ${String(eventId)}.`);
      ctx.webhooks.redeliver(delivery);
      return { status: 200, body: { event_id: delivery.event.id, state: delivery.state } };
    }
    case "GET /_fake/sessions":
      return { status: 200, body: { data: [...ctx.store.sessions.values()].map((s) => ({ ...publicSession(s), line_items: s.line_items })) } };
    case "POST /_fake/reset": {
      const everything = parseJson(body, '{"state": true}').state === true;
      ctx.failures.clear();
      ctx.webhooks.drop = false;
      ctx.webhooks.cancelPending();
      ctx.store.deliveries = [];
      if (everything) await ctx.store.wipe();
      else await ctx.store.save();
      return { status: 200, body: status(ctx) };
    }
    default:
      throw new PaymentsApiError(404, "invalid_request_error", `No fake control route ${key}.`);
  }
}

export async function handleControl(method: string, pathname: string, query: URLSearchParams, body: Buffer, ctx: FakeContext): Promise<JsonResponse> {
  try {
    return await route(method, pathname, query, body, ctx);
  } catch (error) {
    if (error instanceof PaymentsApiError) return { status: error.status, body: error.toBody() };
    throw error;
  }
}
