// /_fake/* routes: inspection and failure injection for tests. No auth, because the server only listens on loopback.
import { type ApiFailure, type FailureSwitch, MAX_FAILURES } from "../shared/control";
import type { JsonResponse } from "../shared/http";
import type { Stats } from "./api";
import { bareAddress, isRecord } from "./message";
import type { Mailbox } from "./store";

export type ControlContext = { mailbox: Mailbox; failures: FailureSwitch<ApiFailure>; stats: Stats };

function problem(status: number, message: string): JsonResponse {
  // Same envelope as the API so one error reader works for both.
  return { status, body: { statusCode: status, name: status === 404 ? "not_found" : "validation_error", message } };
}

function armFailures(body: Buffer, ctx: ControlContext): JsonResponse {
  let parsed: unknown;
  try {
    parsed = JSON.parse(body.toString("utf8"));
  } catch {
    return problem(400, 'Expected a JSON body like {"count": 3, "status": 429}.');
  }
  if (!isRecord(parsed)) return problem(400, 'Expected a JSON object like {"count": 3, "status": 429}.');
  const count = parsed.count ?? 1;
  const status = parsed.status ?? 500;
  const message = parsed.message;
  if (typeof count !== "number" || !Number.isInteger(count) || count < 1 || count > MAX_FAILURES) {
    return problem(400, `\`count\` must be an integer from 1 to ${MAX_FAILURES}.`);
  }
  if (typeof status !== "number" || !Number.isInteger(status) || status < 400 || status > 599) {
    return problem(400, "`status` must be an HTTP error status such as 429, 500 or 503.");
  }
  if (message !== undefined && typeof message !== "string") return problem(400, "`message` must be a string.");
  ctx.failures.arm(count, { status, message: message ?? null });
  return { status: 200, body: { count, status } };
}

function listMessages(query: URLSearchParams, ctx: ControlContext): JsonResponse {
  const to = query.get("to")?.trim().toLowerCase() || null;
  const sinceRaw = query.get("since");
  const since = sinceRaw ? Date.parse(sinceRaw) : null;
  if (since !== null && Number.isNaN(since)) return problem(400, "`since` must be an ISO 8601 date-time.");
  const data = ctx.mailbox.list().filter((message) => {
    if (since !== null && Date.parse(message.created_at) < since) return false;
    if (to === null) return true;
    const recipients = [...message.to, ...message.cc, ...message.bcc];
    return recipients.some((address) => bareAddress(address).toLowerCase() === to || address.toLowerCase() === to);
  });
  return { status: 200, body: { data } };
}

export async function handleControl(method: string, pathname: string, query: URLSearchParams, body: Buffer, ctx: ControlContext): Promise<JsonResponse> {
  if (pathname === "/_fake/health" && method === "GET") return { status: 200, body: { ok: true } };
  if (pathname === "/_fake/stats" && method === "GET") {
    return {
      status: 200,
      body: { accepted: ctx.stats.accepted, failed: ctx.stats.failed, stored: ctx.mailbox.size, pendingFailures: ctx.failures.pending },
    };
  }
  if (pathname === "/_fake/fail") {
    if (method === "POST") return armFailures(body, ctx);
    if (method === "DELETE") {
      ctx.failures.clear();
      return { status: 200, body: { count: 0 } };
    }
  }
  if (pathname === "/_fake/messages") {
    if (method === "GET") return listMessages(query, ctx);
    if (method === "DELETE") return { status: 200, body: { deleted: await ctx.mailbox.clear() } };
  }
  const one = /^\/_fake\/messages\/([^/]+)$/.exec(pathname);
  if (one?.[1] !== undefined && method === "GET") {
    // Ids are UUIDs, so a malformed escape simply finds nothing rather than erroring.
    const message = ctx.mailbox.get(one[1]);
    return message ? { status: 200, body: message } : problem(404, `No message with id ${one[1]}.`);
  }
  return problem(404, `No fake control route ${method} ${pathname}.`);
}
