// The /_fake/* switches the fakes share: injected API failures, and for the fakes that send webhooks
// the health, status, fail, drop, delivery-log and reset routes. No auth, because the servers only
// answer loopback clients. Each fake supplies its error envelope and its own extra switches.
import { FakeApiError, type JsonResponse } from "./http";
import type { BaseDelivery, WebhookSender } from "./webhooks";

export const MAX_FAILURES = 1000;

/** Makes the next N calls fail, to exercise the app's retry and error paths. */
export class FailureSwitch<T> {
  private remaining = 0;

  constructor(private value: T) {}

  arm(count: number, value: T): void {
    this.remaining = count;
    this.value = value;
  }

  clear(): void {
    this.remaining = 0;
  }

  get pending(): number {
    return this.remaining;
  }

  take(): T | null {
    if (this.remaining <= 0) return null;
    this.remaining -= 1;
    return this.value;
  }
}

/** What POST /_fake/fail arms: the status, and the message to answer instead of the usual one. */
export type ApiFailure = { status: number; message: string | null };

/** The fake's 400 for a bad switch request, in its own error envelope. */
export type Invalid = (message: string) => FakeApiError;

/** An empty body counts as `{}`; `example` shows the caller what was expected. */
export function parseJsonObject(body: Buffer, example: string, invalid: Invalid): Record<string, unknown> {
  if (body.length === 0) return {};
  let parsed: unknown = null;
  try {
    parsed = JSON.parse(body.toString("utf8"));
  } catch {
    // reported below
  }
  if (typeof parsed !== "object" || parsed === null || Array.isArray(parsed)) throw invalid(`Expected a JSON object body like ${example}.`);
  return parsed as Record<string, unknown>;
}

export function failureCount(value: unknown, invalid: Invalid): number {
  const n = value ?? 1;
  if (typeof n !== "number" || !Number.isInteger(n) || n < 1 || n > MAX_FAILURES) throw invalid(`count must be a whole number from 1 to ${MAX_FAILURES}.`);
  return n;
}

export function errorStatus(value: unknown, fallback: number, invalid: Invalid): number {
  const status = value ?? fallback;
  if (typeof status !== "number" || !Number.isInteger(status) || status < 400 || status > 599) throw invalid("status must be an HTTP error status such as 429, 500 or 503.");
  return status;
}

export type ControlRequest = { method: string; pathname: string; query: URLSearchParams; body: Buffer };
/** Routes keyed "METHOD /_fake/path". */
export type ControlRoutes = Record<string, (req: ControlRequest) => JsonResponse | Promise<JsonResponse>>;

/** The parts of a webhook-sending fake's context the shared switches work on. */
export type SwitchedFake = {
  apiFailures: FailureSwitch<ApiFailure>;
  webhooks: WebhookSender<BaseDelivery>;
  /** `wipe` forgets all state (POST /_fake/reset with `{"state": true}`). */
  store: { save(): Promise<void>; wipe(): Promise<void> };
};

/** What is the fake's own: its error envelope, what it counts, its extra switches and routes. */
export type Switchboard<C> = {
  invalid: Invalid;
  notFound: (message: string) => FakeApiError;
  /** What GET /_fake/status counts, first in its body. */
  counts(ctx: C): Record<string, number>;
  /** The fake's own switches, in the status body after the API failures. */
  switches?(ctx: C): Record<string, unknown>;
  /** The fake's own routes; `status` answers as the shared switches do. */
  routes?(ctx: C, status: () => JsonResponse): ControlRoutes;
  /** Turns the fake's own switches off, and with `everything` stops its work in progress (POST /_fake/reset). */
  reset?(ctx: C, everything: boolean): void;
};

function sharedRoutes<C extends SwitchedFake>(ctx: C, board: Switchboard<C>, status: () => JsonResponse): ControlRoutes {
  const { invalid } = board;
  const { apiFailures, webhooks, store } = ctx;
  return {
    "GET /_fake/health": () => ({ status: 200, body: { ok: true } }),
    "GET /_fake/status": status,
    "POST /_fake/fail": ({ body }) => {
      const input = parseJsonObject(body, '{"count": 2, "status": 500}', invalid);
      const count = failureCount(input.count, invalid);
      const code = errorStatus(input.status, 500, invalid);
      if (input.message !== undefined && typeof input.message !== "string") throw invalid("message must be a string.");
      apiFailures.arm(count, { status: code, message: input.message ?? null });
      return status();
    },
    "DELETE /_fake/fail": () => {
      apiFailures.clear();
      return status();
    },
    "POST /_fake/webhooks/drop": ({ body }) => {
      const drop = parseJsonObject(body, '{"drop": true}', invalid).drop;
      if (typeof drop !== "boolean") throw invalid("drop must be true or false.");
      webhooks.drop = drop;
      return status();
    },
    "GET /_fake/webhooks": ({ query }) => ({ status: 200, body: { data: webhooks.list(query.get("type"), query.get("object_id")) } }),
    "POST /_fake/reset": async ({ body }) => {
      const everything = parseJsonObject(body, '{"state": true}', invalid).state === true;
      apiFailures.clear();
      board.reset?.(ctx, everything);
      webhooks.reset();
      if (everything) await store.wipe();
      else await store.save();
      return status();
    },
  };
}

/** Answers a /_fake/* request; the fake's API errors become its error envelope, anything else is thrown. */
export async function handleSwitchboard<C extends SwitchedFake>(ctx: C, board: Switchboard<C>, req: ControlRequest): Promise<JsonResponse> {
  const key = `${req.method} ${req.pathname}`;
  // The body of GET /_fake/status, which every switch also answers with (after its change).
  const status = (): JsonResponse => ({
    status: 200,
    body: { ...board.counts(ctx), pending_api_failures: ctx.apiFailures.pending, ...board.switches?.(ctx), drop_webhooks: ctx.webhooks.drop },
  });
  const route = board.routes?.(ctx, status)[key] ?? sharedRoutes(ctx, board, status)[key];
  try {
    if (!route) throw board.notFound(`No fake control route ${key}.`);
    return await route(req);
  } catch (error) {
    if (error instanceof FakeApiError) return error.toResponse();
    throw error;
  }
}
