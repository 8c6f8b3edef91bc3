// The /v1 paths the `stripe` SDK calls for hosted checkout and refunds, in the hosted API's shapes.
import { timingSafeEqual } from "node:crypto";
import type { IncomingHttpHeaders } from "node:http";
import cc from "currency-codes";
import type { JsonResponse } from "../shared/http";
import { injectedError, invalidRequest, missingResource, PaymentsApiError } from "./errors";
import { type FormObject, int, list, metadata, obj, parseForm, str } from "./form";
import { chargeWithRefunds, createRefund, expireIfDue, expireSession, type FakeContext, persist, publicSession } from "./ledger";
import { digest, newId, nowSeconds } from "./store";
import type { LineItem, StoredSession } from "./types";

export type ApiRequest = { method: string; pathname: string; headers: IncomingHttpHeaders; body: Buffer };

const MIN_EXPIRY_S = 30 * 60;
const MAX_EXPIRY_S = 24 * 3600;

function apiKey(headers: IncomingHttpHeaders): string {
  const auth = headers.authorization ?? "";
  const bearer = /^Bearer\s+(\S+)\s*$/i.exec(auth)?.[1];
  if (bearer) return bearer;
  // Basic auth with the key as the user name and an empty password also works against the hosted API.
  const basic = /^Basic\s+([A-Za-z0-9+/=]+)\s*$/i.exec(auth)?.[1];
  return basic ? Buffer.from(basic, "base64").toString("utf8").replace(/:.*$/, "") : "";
}

function authenticate(headers: IncomingHttpHeaders, expected: string | null): void {
  const key = apiKey(headers);
  const a = Buffer.from(digest(key));
  const ok = expected ? timingSafeEqual(a, Buffer.from(digest(expected))) : /^sk_test_\w+$/.test(key);
  if (!ok) {
    const shown = key ? `${key.slice(0, 8)}****${key.slice(-4)}` : "(none)";
    throw new PaymentsApiError(401, "invalid_request_error", `Invalid API key provided: ${shown}`);
  }
}

function httpUrl(value: string | undefined, param: string): string | undefined {
  if (value === undefined) return undefined;
  if (!/^https?:\/\//i.test(value) || !URL.canParse(value.replaceAll("{CHECKOUT_SESSION_ID}", "x"))) throw invalidRequest(`${param} must be an http(s) URL.`, param, "url_invalid");
  return value;
}

function lineItems(form: FormObject): LineItem[] {
  const items = list(form, "line_items");
  if (!items?.length) throw invalidRequest("line_items is required in payment mode.", "line_items", "parameter_missing");
  return items.map((item, i) => {
    const at = `line_items[${i}]`;
    if (item.price !== undefined) throw invalidRequest(`${at}[price]: the payments fake takes price_data only, not stored prices.`, `${at}[price]`);
    const priceData = obj(item, "price_data", `${at}[price_data]`);
    if (!priceData) throw invalidRequest(`${at} needs price_data.`, `${at}[price_data]`, "parameter_missing");
    const currency = str(priceData, "currency", { required: true, path: `${at}[price_data][currency]` })!.toLowerCase();
    if (!/^[a-z]{3}$/.test(currency) || !cc.code(currency.toUpperCase())) throw invalidRequest(`Invalid currency: ${currency}.`, `${at}[price_data][currency]`);
    const product = obj(priceData, "product_data", `${at}[price_data][product_data]`);
    const name = product && str(product, "name", { required: true, max: 250, path: `${at}[price_data][product_data][name]` });
    if (!name) throw invalidRequest(`${at}[price_data] needs product_data[name].`, `${at}[price_data][product_data]`, "parameter_missing");
    const unit_amount = int(priceData, "unit_amount", { required: true, min: 0, path: `${at}[price_data][unit_amount]` })!;
    const quantity = int(item, "quantity", { required: true, min: 1, path: `${at}[quantity]` })!;
    return { name, currency, unit_amount, quantity };
  });
}

function createSession(ctx: FakeContext, form: FormObject): StoredSession {
  const mode = str(form, "mode", { required: true });
  if (mode !== "payment") throw invalidRequest(`The payments fake supports mode=payment only (got ${mode}).`, "mode");
  const items = lineItems(form);
  const currency = items[0]!.currency;
  if (items.some((i) => i.currency !== currency)) throw invalidRequest("All line_items must use the same currency.", "line_items");
  const amount = items.reduce((sum, i) => sum + i.unit_amount * i.quantity, 0);
  if (!Number.isSafeInteger(amount) || amount < 1) throw invalidRequest("The session's total must be at least 1 in the currency's smallest unit.", "line_items", "amount_too_small");
  const now = nowSeconds();
  const expires_at = int(form, "expires_at") ?? now + MAX_EXPIRY_S;
  if (expires_at < now + MIN_EXPIRY_S || expires_at > now + MAX_EXPIRY_S) throw invalidRequest("expires_at must be between 30 minutes and 24 hours from now.", "expires_at");
  const intentData = obj(form, "payment_intent_data");
  const id = newId("cs_test_", 40);
  return {
    id,
    object: "checkout.session",
    url: `${ctx.publicUrl}/pay/${id}`,
    status: "open",
    payment_status: "unpaid",
    mode: "payment",
    amount_subtotal: amount,
    amount_total: amount,
    currency,
    success_url: httpUrl(str(form, "success_url", { required: true, max: 5000 }), "success_url")!,
    cancel_url: httpUrl(str(form, "cancel_url", { max: 5000 }), "cancel_url") ?? null,
    metadata: metadata(form),
    client_reference_id: str(form, "client_reference_id", { max: 200 }) ?? null,
    customer_email: str(form, "customer_email", { max: 512 }) ?? null,
    payment_intent: null,
    created: now,
    expires_at,
    livemode: false,
    line_items: items,
    intent_metadata: intentData ? metadata(intentData) : {},
  };
}

function session(ctx: FakeContext, id: string): StoredSession {
  const s = ctx.store.sessions.get(id);
  if (!s) throw missingResource("checkout.session", id);
  expireIfDue(ctx, s);
  return s;
}

function route(req: ApiRequest, form: FormObject, ctx: FakeContext, idempotencyKey: string | null): JsonResponse {
  const { method, pathname } = req;
  const ok = (body: unknown): JsonResponse => ({ status: 200, body });
  if (method === "POST" && pathname === "/v1/checkout/sessions") {
    const s = createSession(ctx, form);
    ctx.store.sessions.set(s.id, s);
    persist(ctx);
    return ok(publicSession(s));
  }
  let m = /^\/v1\/checkout\/sessions\/([\w]+)(\/expire)?$/.exec(pathname);
  if (m) {
    const s = session(ctx, m[1]!);
    if (method === "GET" && !m[2]) return ok(publicSession(s));
    if (method === "POST" && m[2]) {
      if (s.status !== "open") throw invalidRequest(`Only open sessions can be expired; this one is ${s.status}.`, undefined, "checkout_session_not_open");
      expireSession(ctx, s, idempotencyKey);
      return ok(publicSession(s));
    }
  }
  m = /^\/v1\/payment_intents\/([\w]+)$/.exec(pathname);
  if (m && method === "GET") {
    const intent = ctx.store.intents.get(m[1]!);
    if (!intent) throw missingResource("payment_intent", m[1]!);
    return ok(intent);
  }
  m = /^\/v1\/charges\/([\w]+)$/.exec(pathname);
  if (m && method === "GET") {
    const charge = ctx.store.charges.get(m[1]!);
    if (!charge) throw missingResource("charge", m[1]!);
    return ok(chargeWithRefunds(ctx, charge));
  }
  if (method === "POST" && pathname === "/v1/refunds") {
    const intentId = str(form, "payment_intent");
    const chargeId = str(form, "charge");
    if (!intentId && !chargeId) throw invalidRequest("Give the payment_intent (or the charge) to refund.", "payment_intent", "parameter_missing");
    const intent = intentId ? ctx.store.intents.get(intentId) : ctx.store.intents.get(ctx.store.charges.get(chargeId!)?.payment_intent ?? "");
    if (!intent) throw intentId ? missingResource("payment_intent", intentId) : missingResource("charge", chargeId!);
    return ok(createRefund(ctx, intent, { amount: int(form, "amount", { min: 1 }), reason: str(form, "reason"), metadata: metadata(form) }, idempotencyKey));
  }
  m = /^\/v1\/refunds\/([\w]+)$/.exec(pathname);
  if (m && method === "GET") {
    const refund = ctx.store.refunds.get(m[1]!);
    if (!refund) throw missingResource("refund", m[1]!);
    return ok(refund);
  }
  throw new PaymentsApiError(404, "invalid_request_error", `Unrecognized request URL (${method}: ${pathname}). The payments fake serves checkout sessions, payment intents, charges and refunds.`);
}

export function handleApi(req: ApiRequest, ctx: FakeContext): JsonResponse {
  try {
    authenticate(req.headers, ctx.secretKey);
    const injected = ctx.apiFailures.take();
    if (injected) throw injectedError(injected.status, injected.message);
    const text = req.body.toString("utf8");
    const keyHeader = req.headers["idempotency-key"];
    const key = req.method === "POST" && typeof keyHeader === "string" && keyHeader ? keyHeader.slice(0, 255) : null;
    const fingerprint = digest(`${req.method} ${req.pathname} ${text}`);
    const seen = key ? ctx.store.idempotency.get(key) : undefined;
    if (seen) {
      if (seen.request !== fingerprint) {
        throw new PaymentsApiError(400, "idempotency_error", `Keys for idempotent requests can be used only with the same parameters they were first used with (key ${key}).`);
      }
      return { status: seen.status, body: seen.body, headers: { "idempotent-replayed": "true" } };
    }
    const response = route(req, parseForm(text), ctx, key);
    if (key) {
      ctx.store.remember({ key, request: fingerprint, status: response.status, body: response.body, at: Date.now() });
      persist(ctx);
    }
    return response;
  } catch (error) {
    if (error instanceof PaymentsApiError) return error.toResponse();
    throw error;
  }
}
