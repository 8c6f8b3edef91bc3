// The hosted API's Messages endpoints (2010-04-01): create (form-encoded POST), fetch one, list. HTTP
// Basic auth with the account sid and auth token; the account in the path must be the caller's.
// Created messages move queued → sent → delivered (or failed / undelivered by the outcome switch),
// each change reported to the message's StatusCallback.
import { timingSafeEqual, createHash } from "node:crypto";
import type { IncomingHttpHeaders } from "node:http";
import type { ApiFailure, FailureSwitch } from "../shared/control";
import type { JsonResponse } from "../shared/http";
import { injectedError, invalidParam, notFound, SmsApiError } from "./errors";
import { newSid, rfc2822, type SmsStore } from "./store";
import type { Outcome, StoredMessage } from "./types";
import type { SmsWebhooks } from "./webhooks";

export type SmsContext = {
  store: SmsStore;
  webhooks: SmsWebhooks;
  accountSid: string;
  authToken: string;
  apiFailures: FailureSwitch<ApiFailure>;
  /** The next messages' ends, first first (POST /_fake/outcome); empty: delivered. */
  outcomes: Outcome[];
  /** Accept the next N messages but answer 500, as if the answer were lost on the way back. */
  loseAnswers: number;
  /** Time between status changes. */
  stepMs: number;
  timers: Set<NodeJS.Timeout>;
};

export type ApiRequest = { method: string; pathname: string; query: URLSearchParams; headers: IncomingHttpHeaders; body: Buffer };

const E164 = /^\+[1-9]\d{6,14}$/;
const MAX_BODY_CHARS = 1600;
// 3GPP TS 23.038 §6.2.1: the GSM 7-bit default alphabet (and its extension table, two septets each).
const GSM7 = /^[@£$¥èéùìòÇ\nØø\rÅåΔ_ΦΓΛΩΠΨΣΘΞÆæßÉ !"#¤%&'()*+,\-./0-9:;<=>?¡A-ZÄÖÑÜ§¿a-zäöñüà^{}\\[~\]|€]*$/;

/** Segments as carriers count them: 160/153 GSM-7 septets, 70/67 UCS-2 characters (3GPP TS 23.040 §9.2.3.24.1, the concatenation header's 6 bytes). */
export function segmentCount(body: string): number {
  if (GSM7.test(body)) {
    const septets = [...body].reduce((n, ch) => n + ("^{}\\[~]|€".includes(ch) ? 2 : 1), 0);
    return septets <= 160 ? 1 : Math.ceil(septets / 153);
  }
  const units = body.length;
  return units <= 70 ? 1 : Math.ceil(units / 67);
}

const digest = (value: string) => createHash("sha256").update(value).digest();

function authenticate(headers: IncomingHttpHeaders, ctx: SmsContext, pathAccount: string): void {
  const match = /^Basic\s+([A-Za-z0-9+/=]+)\s*$/i.exec(headers.authorization ?? "");
  const [user, pass] = match ? Buffer.from(match[1]!, "base64").toString("utf8").split(/:(.*)/s) : [];
  const ok = user !== undefined && pass !== undefined && timingSafeEqual(digest(`${user}:${pass}`), digest(`${ctx.accountSid}:${ctx.authToken}`));
  if (!ok) throw new SmsApiError(401, 20003, "Authenticate: the account sid and auth token don't match.");
  if (pathAccount !== ctx.accountSid) throw new SmsApiError(403, 20003, "The account in the path is not the one signed in.");
}

function resourceOf(m: StoredMessage) {
  const { status_callback: _callback, created_ms: _created, ...resource } = m;
  return resource;
}

function advance(ctx: SmsContext, m: StoredMessage, outcome: Outcome): void {
  const steps: Array<() => void> = [
    () => {
      m.status = "sent";
      m.date_sent = rfc2822();
    },
    () => {
      m.status = outcome;
      if (outcome === "undelivered") [m.error_code, m.error_message] = [30003, "The handset could not be reached."];
      if (outcome === "failed") [m.error_code, m.error_message] = [30008, "The message could not be sent."];
    },
  ];
  // A failed message never leaves the service; an undelivered one was sent, then not delivered.
  const plan = outcome === "failed" ? [steps[1]!] : steps;
  plan.forEach((step, i) => {
    const timer = setTimeout(() => {
      ctx.timers.delete(timer);
      step();
      m.date_updated = rfc2822();
      ctx.webhooks.status(m);
      void ctx.store.save();
    }, ctx.stepMs * (i + 1));
    timer.unref();
    ctx.timers.add(timer);
  });
}

function create(ctx: SmsContext, account: string, form: URLSearchParams): JsonResponse {
  const to = form.get("To")?.trim() ?? "";
  const from = form.get("From")?.trim() ?? "";
  const service = form.get("MessagingServiceSid")?.trim() || null;
  const body = form.get("Body") ?? "";
  const callback = form.get("StatusCallback")?.trim() || null;
  if (!to) throw invalidParam(21604, "A 'To' phone number is required.");
  if (!E164.test(to)) throw invalidParam(21211, `The 'To' number ${to} is not a valid phone number.`);
  if (!from && !service) throw invalidParam(21603, "A 'From' phone number or a MessagingServiceSid is required.");
  if (from && !E164.test(from)) throw invalidParam(21212, `The 'From' number ${from} is not a valid phone number.`);
  if (!body.trim()) throw invalidParam(21602, "A message body is required.");
  if (body.length > MAX_BODY_CHARS) throw invalidParam(21617, `The body exceeds the ${MAX_BODY_CHARS}-character limit.`);
  if (callback && !(URL.canParse(callback) && /^https?:/.test(callback))) throw invalidParam(21609, "The StatusCallback is not a valid URL.");
  const now = Date.now();
  const sid = newSid("SM");
  const message: StoredMessage = {
    sid,
    account_sid: account,
    api_version: "2010-04-01",
    body,
    date_created: rfc2822(now),
    date_sent: null,
    date_updated: rfc2822(now),
    direction: "outbound-api",
    error_code: null,
    error_message: null,
    from: from || "+15005550006",
    messaging_service_sid: service,
    num_media: "0",
    num_segments: String(segmentCount(body)),
    price: null,
    price_unit: "USD",
    status: "queued",
    subresource_uris: { media: `/2010-04-01/Accounts/${account}/Messages/${sid}/Media.json` },
    to,
    uri: `/2010-04-01/Accounts/${account}/Messages/${sid}.json`,
    status_callback: callback,
    created_ms: now,
  };
  ctx.store.messages.set(sid, message);
  advance(ctx, message, ctx.outcomes.shift() ?? "delivered");
  void ctx.store.save();
  if (ctx.loseAnswers > 0) {
    ctx.loseAnswers -= 1;
    return injectedError(500, "Accepted, but the answer was lost (injected).").toResponse();
  }
  return { status: 201, body: resourceOf(message) };
}

function list(ctx: SmsContext, account: string, query: URLSearchParams): JsonResponse {
  const to = query.get("To");
  const from = query.get("From");
  const pageSize = Math.min(1000, Math.max(1, Number(query.get("PageSize")) || 50));
  const rows = ctx.store.list().filter((m) => m.account_sid === account && (!to || m.to === to) && (!from || m.from === from));
  const uri = `/2010-04-01/Accounts/${account}/Messages.json?PageSize=${pageSize}&Page=0`;
  const page = rows.slice(0, pageSize).map(resourceOf);
  return {
    status: 200,
    body: { messages: page, end: Math.max(0, page.length - 1), first_page_uri: uri, next_page_uri: null, page: 0, page_size: pageSize, previous_page_uri: null, start: 0, uri },
  };
}

export function handleApi(req: ApiRequest, ctx: SmsContext): JsonResponse {
  try {
    const match = /^\/2010-04-01\/Accounts\/([^/]+)\/Messages(?:\/([^/]+))?\.json$/.exec(req.pathname);
    if (!match) throw notFound(`The SMS fake serves /2010-04-01/Accounts/{AccountSid}/Messages.json, not ${req.pathname}.`);
    const [, account, sid] = match as unknown as [string, string, string | undefined];
    authenticate(req.headers, ctx, account);
    const failure = ctx.apiFailures.take();
    if (failure) throw injectedError(failure.status, failure.message);
    if (sid === undefined && req.method === "POST") {
      if (!/^application\/x-www-form-urlencoded\b/i.test(req.headers["content-type"] ?? "")) throw invalidParam(21100, "Expected a form-encoded body.");
      return create(ctx, account, new URLSearchParams(req.body.toString("utf8")));
    }
    if (sid === undefined && req.method === "GET") return list(ctx, account, req.query);
    if (sid !== undefined && req.method === "GET") {
      const m = ctx.store.messages.get(sid);
      if (!m || m.account_sid !== account) throw notFound(`No message ${sid}.`);
      return { status: 200, body: resourceOf(m) };
    }
    throw new SmsApiError(405, 20004, `${req.method} is not allowed here.`);
  } catch (error) {
    if (error instanceof SmsApiError) return error.toResponse();
    throw error;
  }
}
