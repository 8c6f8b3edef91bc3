// The Resend-compatible part: /emails, /emails/batch, /emails/{id}, with auth, idempotency and injected failures.
import { createHash, randomUUID, timingSafeEqual } from "node:crypto";
import type { IncomingHttpHeaders } from "node:http";
import type { ApiFailure, FailureSwitch } from "../shared/control";
import type { JsonResponse } from "../shared/http";
import { ApiError, invalidField, type ResendErrorName } from "./errors";
import { parseEmail, toMessage, type EmailInput } from "./message";
import type { InboundStore } from "./inbound";
import type { Mailbox } from "./store";
import type { MailMessage } from "./types";

const MAX_BATCH = 100;
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export type ApiRequest = {
  method: string;
  pathname: string;
  query: URLSearchParams;
  headers: IncomingHttpHeaders;
  body: Buffer;
};

export type Stats = { accepted: number; failed: number };

/** What a call failed by POST /_fake/fail answers. */
function injectedError({ status, message }: ApiFailure): ApiError {
  const [name, usual] = describeStatus(status);
  // Resend sends IETF-draft ratelimit headers; the app's back-off reads retry-after.
  const headers: Record<string, string> = status === 429 ? { "retry-after": "1", "ratelimit-limit": "2", "ratelimit-remaining": "0", "ratelimit-reset": "1" } : {};
  return new ApiError(status, name, message ?? usual, headers);
}

function describeStatus(status: number): [ResendErrorName, string] {
  if (status === 429) return ["rate_limit_exceeded", "Too many requests. You can only make 2 requests per second."];
  if (status === 500) return ["internal_server_error", "An unexpected error occurred."];
  if (status >= 500) return ["application_error", "The service is temporarily unavailable. Please try again later."];
  return ["validation_error", "Injected failure."];
}

export type ApiContext = { mailbox: Mailbox; apiKey: string | undefined; failures: FailureSwitch<ApiFailure>; stats: Stats; inbound?: InboundStore };

function digest(value: string): Buffer {
  return createHash("sha256").update(value).digest();
}

function authenticate(headers: IncomingHttpHeaders, apiKey: string | undefined): void {
  const match = /^Bearer\s+(\S+)\s*$/i.exec(headers.authorization ?? "");
  const key = match?.[1];
  if (!key) {
    throw new ApiError(401, "missing_api_key", "Missing API key in the authorization header. Include the following header in the request: Authorization: Bearer YOUR_API_KEY");
  }
  // Hashing first gives equal-length buffers, which timingSafeEqual requires.
  const valid = apiKey === undefined ? key.startsWith("re_") : timingSafeEqual(digest(key), digest(apiKey));
  if (!valid) throw new ApiError(403, "invalid_api_key", "API key is invalid");
}

function parseJson(body: Buffer): unknown {
  if (body.length === 0) throw new ApiError(400, "validation_error", "The request body is empty; expected JSON.");
  try {
    return JSON.parse(body.toString("utf8"));
  } catch (error) {
    const detail = error instanceof Error ? error.message : String(error);
    throw new ApiError(400, "validation_error", `The request body is not valid JSON: ${detail}`);
  }
}

/** Key order must not make a genuine retry look like a different request. */
function stableStringify(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(stableStringify).join(",")}]`;
  if (typeof value === "object" && value !== null) {
    const entries = Object.entries(value).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${stableStringify(v)}`).join(",")}}`;
  }
  return JSON.stringify(value) ?? "null";
}

function singleHeader(headers: IncomingHttpHeaders, name: string): string | undefined {
  const raw = headers[name];
  return Array.isArray(raw) ? raw[0] : raw;
}

async function send(req: ApiRequest, ctx: ApiContext, kind: "single" | "batch"): Promise<JsonResponse> {
  const body = parseJson(req.body);
  const key = singleHeader(req.headers, "idempotency-key");
  if (key !== undefined && (key.length < 1 || key.length > 256)) {
    throw new ApiError(400, "invalid_idempotency_key", "The key must be between 1-256 chars.");
  }
  const mode = kind === "batch" && singleHeader(req.headers, "x-batch-validation") === "permissive" ? "permissive" : "strict";
  const fingerprint = createHash("sha256").update(`${kind}\n${mode}\n${stableStringify(body)}`).digest("hex");
  if (key !== undefined) {
    const prior = ctx.mailbox.lookupIdempotent(key);
    if (prior && "pending" in prior) {
      throw new ApiError(409, "concurrent_idempotent_requests", "Same idempotency key used while original request is still in progress.");
    }
    if (prior && prior.fingerprint !== fingerprint) {
      throw new ApiError(409, "invalid_idempotent_request", "Same idempotency key used with a different request payload.");
    }
    if (prior) return { status: 200, body: prior.response };
  }

  const inputs: EmailInput[] = [];
  const errors: { index: number; message: string }[] = [];
  if (kind === "single") {
    inputs.push(parseEmail(body, { batch: false }));
  } else {
    if (!Array.isArray(body)) throw invalidField("The batch body must be a JSON array of emails.");
    if (body.length === 0 || body.length > MAX_BATCH) throw invalidField(`A batch must contain between 1 and ${MAX_BATCH} emails, got ${body.length}.`);
    body.forEach((item, index) => {
      try {
        inputs.push(parseEmail(item, { batch: true }));
      } catch (error) {
        if (!(error instanceof ApiError)) throw error;
        // Strict mode rejects the whole batch, as the hosted API does by default.
        if (mode === "strict") throw new ApiError(error.status, error.errorName, `emails[${index}]: ${error.message}`);
        errors.push({ index, message: error.message });
      }
    });
  }

  const now = new Date();
  const messages: MailMessage[] = inputs.map((input) => toMessage(input, randomUUID(), now, key ?? null));
  const ids = messages.map((message) => ({ id: message.id }));
  const response = kind === "single" ? ids[0] : mode === "permissive" ? { data: ids, errors } : { data: ids };
  if (key !== undefined) ctx.mailbox.beginIdempotent(key);
  try {
    await ctx.mailbox.add(messages, {
      user_agent: singleHeader(req.headers, "user-agent") ?? null,
      idempotency: key === undefined ? null : { key, fingerprint, response, created_ms: now.getTime() },
    });
  } catch (error) {
    if (key !== undefined) ctx.mailbox.abandonIdempotent(key);
    throw error;
  }
  ctx.stats.accepted += messages.length;
  return { status: 200, body: response };
}

/** Shape of a GET /emails list item; empty lists become null like the hosted API. */
function toListItem(message: MailMessage) {
  const orNull = (list: string[]) => (list.length ? list : null);
  return {
    id: message.id,
    to: message.to,
    from: message.from,
    created_at: message.created_at,
    subject: message.subject,
    bcc: orNull(message.bcc),
    cc: orNull(message.cc),
    reply_to: orNull(message.reply_to),
    last_event: "delivered" as const,
    scheduled_at: message.scheduled_at,
    topic_id: null,
    message_id: `<${message.id}@mail-fake.benchside.test>`,
  };
}

/** Shape of GET /emails/{id}. */
function toEmailObject(message: MailMessage) {
  return { object: "email" as const, ...toListItem(message), html: message.html, text: message.text, tags: message.tags };
}

function list(req: ApiRequest, ctx: ApiContext): JsonResponse {
  const limitRaw = req.query.get("limit");
  const limit = limitRaw === null ? 20 : Number(limitRaw);
  if (!Number.isInteger(limit) || limit < 1 || limit > 100) throw invalidField("The `limit` parameter must be an integer between 1 and 100.");
  const after = req.query.get("after");
  const before = req.query.get("before");
  if (after !== null && before !== null) throw invalidField("Use either `after` or `before`, not both.");
  const all = ctx.mailbox.list();
  const cursor = after ?? before;
  const at = cursor === null ? -1 : all.findIndex((message) => message.id === cursor);
  if (cursor !== null && at < 0) throw new ApiError(422, "invalid_parameter", "The pagination cursor does not match any email.");
  let page: MailMessage[];
  let hasMore: boolean;
  if (before !== null) {
    page = all.slice(Math.max(0, at - limit), at);
    hasMore = at - limit > 0;
  } else {
    const start = at + 1;
    page = all.slice(start, start + limit);
    hasMore = start + limit < all.length;
  }
  return { status: 200, body: { object: "list", has_more: hasMore, data: page.map(toListItem) } };
}

function route(req: ApiRequest, ctx: ApiContext): Promise<JsonResponse> | JsonResponse {
  const { method, pathname } = req;
  const notAllowed = () => new ApiError(405, "method_not_allowed", `Method ${method} is not allowed on ${pathname}.`);
  if (pathname === "/emails") {
    if (method === "POST") return send(req, ctx, "single");
    if (method === "GET") return list(req, ctx);
    throw notAllowed();
  }
  if (pathname === "/emails/batch") {
    if (method === "POST") return send(req, ctx, "batch");
    throw notAllowed();
  }
  // Received mail (fakes/mail/inbound.ts): what the SDK's emails.receiving.get reads.
  const received = /^\/emails\/receiving\/([^/]+)$/.exec(pathname);
  if (received?.[1] !== undefined) {
    if (method !== "GET") throw notAllowed();
    const email = UUID.test(received[1]) ? ctx.inbound?.get(received[1]) : undefined;
    if (!email) throw new ApiError(404, "not_found", "Email not found");
    return { status: 200, body: email };
  }
  const match = /^\/emails\/([^/]+)$/.exec(pathname);
  if (match?.[1] !== undefined) {
    if (method !== "GET") throw notAllowed();
    let id: string;
    try {
      id = decodeURIComponent(match[1]);
    } catch {
      id = match[1];
    }
    if (!UUID.test(id)) throw new ApiError(422, "invalid_parameter", "The `id` must be a valid UUID.");
    const message = ctx.mailbox.get(id);
    if (!message) throw new ApiError(404, "not_found", "Email not found");
    return { status: 200, body: toEmailObject(message) };
  }
  throw new ApiError(404, "not_found", `The mail fake does not serve ${method} ${pathname}; it answers /emails, /emails/batch and /emails/{id}.`);
}

/** Never throws for API-level problems: they become Resend error envelopes. */
export async function handleApi(req: ApiRequest, ctx: ApiContext): Promise<JsonResponse> {
  try {
    const injected = ctx.failures.take();
    if (injected) throw injectedError(injected);
    authenticate(req.headers, ctx.apiKey);
    return await route(req, ctx);
  } catch (error) {
    ctx.stats.failed += 1;
    if (error instanceof ApiError) return error.toResponse();
    console.error("mail fake: unexpected error", error);
    return { status: 500, body: new ApiError(500, "internal_server_error", "An unexpected error occurred.").toBody() };
  }
}
