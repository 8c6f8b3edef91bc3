// One malformed request for a route handler, built from its declaration. Every request that
// could change something carries at least one reason it can't (`safe`): a read (GET), a path or
// resource id that no row has or that isn't an id at all, a persona with no part in the row
// (STRANGER) or no session, a refused origin or media type, a body that is no JSON object or is
// over the limit, a webhook that is unsigned or signed but unusable, a forged token. The spec
// checks the outcome too (nothing accepted, CHECKSUM TABLE unchanged).
import { createHmac } from "node:crypto";
import { APP_ORIGIN } from "../access/client";
import { type Rng, badEscapeSegment, brokenJsonText, brokenMultipart, multipart, oddSegment, wrongJsonValue } from "./values";
import { type HandlerTarget, STRANGER, type World, idKind, madeUpId, realValue } from "./world";

export type Persona = "anonymous" | "owner" | "writer" | "technician" | "jobCustomer" | "follower" | typeof STRANGER;
/** Everyone but the stranger may be allowed on the demo shop's rows. */
export const PERMITTED: Persona[] = ["owner", "writer", "technician", "jobCustomer", "follower"];

export type Case = {
  target: string;
  /** What was broken, for the tallies ("path:bad-escape", "body:wrong-types", …). */
  mutation: string;
  /** Why it can't write anything. */
  safe: string;
  persona: Persona;
  method: string;
  path: string;
  headers: Record<string, string>;
  body?: Buffer;
  /** Sent byte for byte with node:http: no Content-Length (chunked), or one that lies. */
  framing?: "chunked" | { declaredLength: number };
  /** What kind of answer is right: a refusal, a read, a webhook's acknowledgement, an action's state. */
  expect: "refusal" | "read" | "webhook" | "action" | "page";
};

const STATE_CHANGING = new Set(["POST", "PUT", "PATCH", "DELETE"]);
const JSON_LIMIT = 256 * 1024;

type Param = { value: string; kind: "real" | "made-up" | "bad-escape" | "odd" };

function paramValue(rng: Rng, name: string, world: World, wantReal: boolean): Param {
  const roll = rng.next();
  const kind = idKind(name, "path");
  if (roll < 0.1) return { value: badEscapeSegment(rng, realValue(rng, name, "path", world) ?? "x"), kind: "bad-escape" };
  if (roll < 0.22) return { value: oddSegment(rng), kind: "odd" };
  const real = wantReal ? realValue(rng, name, "path", world) : null;
  if (real !== null) return { value: encodeURIComponent(real), kind: "real" };
  return { value: encodeURIComponent(kind ? madeUpId(rng, kind, world) : rng.string(12)), kind: "made-up" };
}

function queryString(rng: Rng, fields: string[]): string {
  const keys = [...fields, "__proto__", "constructor", "toString", rng.string(5), ""];
  const parts: string[] = [];
  for (let i = 0, n = 1 + rng.int(6); i < n; i++) {
    const key = rng.pick(keys);
    const value = rng.pick<() => string>([
      () => rng.pick(["NaN", "Infinity", "-1", "0", "1e308", "1.5", "", "true", "[]", "null", "asc,desc", "owner", "99999999999"]),
      () => "x".repeat(rng.int(3000)),
      () => encodeURIComponent(rng.pick(["🔧", "\u0000", "\u202e", "%", "&", "=", "<>"])),
      () => rng.pick(["%ZZ", "%FF", "%C0%AE", "%"]),
    ])();
    // Duplicate keys: the same key again, or the key as an array.
    parts.push(`${encodeURIComponent(key)}=${value}`);
    if (rng.chance(0.3)) parts.push(`${encodeURIComponent(key)}=${value}2`, `${encodeURIComponent(key)}[]=1`);
  }
  return parts.join("&");
}

function jsonBody(rng: Rng, fields: string[]): { text: string; mutation: string; breaks: boolean } {
  const objectOf = (keys: string[]) => Object.fromEntries(keys.map((k) => [k, wrongJsonValue(rng)]));
  const sample = JSON.stringify(objectOf(fields));
  const roll = rng.next();
  if (roll < 0.3) return { text: sample, mutation: "body:wrong-types-every-field", breaks: false };
  if (roll < 0.45) {
    const some = fields.filter(() => rng.chance(0.5));
    const extra = { ...objectOf(some), __proto__x: 1, [rng.string(6)]: wrongJsonValue(rng) };
    const text = JSON.stringify(extra).replace('"__proto__x"', '"__proto__"');
    return { text, mutation: "body:some-fields-junk-keys", breaks: false };
  }
  if (roll < 0.55) {
    // Duplicate keys: JSON.parse keeps the last.
    const key = fields.length ? rng.pick(fields) : "a";
    return { text: `{${JSON.stringify(key)}:1,${JSON.stringify(key)}:${JSON.stringify(wrongJsonValue(rng))}}`, mutation: "body:duplicate-keys", breaks: false };
  }
  if (roll < 0.65) return { text: JSON.stringify({ ...objectOf(fields), pad: "x".repeat(JSON_LIMIT + rng.int(JSON_LIMIT)) }), mutation: "body:over-256KiB", breaks: true };
  const broken = brokenJsonText(rng, sample);
  let breaks = true;
  try {
    const v: unknown = JSON.parse(broken.replace(/^\ufeff/, ""));
    // Valid JSON but no object, or an object anyway (the BOM case): not broken by itself.
    breaks = v === null || typeof v !== "object" || Array.isArray(v) ? !broken.startsWith("\ufeff") : false;
  } catch {
    breaks = true;
  }
  return { text: broken, mutation: "body:broken-json", breaks };
}

const CONTENT_TYPES = ["text/plain", "text/plain;charset=application/json", "application/x-www-form-urlencoded", "application/json-patch+json", "application/jsonx", "application/ld+json", "multipart/form-data; boundary=x", "", "json", "application/*"];
const JSON_TYPES = ["application/json", "APPLICATION/JSON", "application/json; charset=utf-8", "application/json;charset=UTF-16", " application/json ;", "application/json; boundary=--"];

function sign(secret: string, text: string): string {
  const t = Math.floor(Date.now() / 1000);
  return `t=${t},v1=${createHmac("sha256", secret).update(`${t}.${text}`, "utf8").digest("hex")}`;
}

/** Webhook bodies: unsigned, wrongly signed, or signed but unusable (never an event the app would act on). */
function webhookCase(rng: Rng, t: HandlerTarget): Pick<Case, "headers" | "body" | "mutation" | "safe" | "expect"> {
  const payments = t.decl.route.endsWith("/payments");
  const secret = (payments ? process.env.STRIPE_WEBHOOK_SECRET : process.env.MUX_WEBHOOK_SECRET) ?? "";
  const header = payments ? "stripe-signature" : "mux-signature";
  const handled = payments ? ["checkout.session.completed", "checkout.session.expired", "charge.refunded"] : ["video.asset.ready", "video.upload.asset_created", "video.asset.errored"];
  const text = rng.pick<() => string>([
    () => "{}",
    () => "[]",
    () => "null",
    () => "not json",
    () => brokenJsonText(rng, '{"id":"evt_1","type":"x","data":{"object":{}}}'),
    () => JSON.stringify({ id: wrongJsonValue(rng), type: wrongJsonValue(rng), data: wrongJsonValue(rng) }),
    // An event type nobody handles, well formed otherwise: acknowledged, nothing recorded.
    () => JSON.stringify({ id: `evt_fuzz_${rng.string(12)}`, type: `fuzz.${rng.string(8)}`, data: { object: {} } }),
    // A handled type whose object has the wrong types: ignored before anything is recorded.
    () => JSON.stringify({ id: `evt_fuzz_${rng.string(12)}`, type: rng.pick(handled), data: payments ? { object: { id: wrongJsonValue(rng), amount_total: "x", amount_refunded: -1 } } : { id: 42, duration: -1, playback_ids: "x", status: 7 } }),
    () => "x".repeat(1024 * 1024 + rng.int(4096)),
  ])();
  const how = rng.pick(["signed", "signed", "unsigned", "bad-signature", "old-signature"] as const);
  const headers: Record<string, string> = { "content-type": rng.pick(["application/json", "text/plain", ""]) };
  if (how === "signed") headers[header] = sign(secret, text);
  if (how === "bad-signature") headers[header] = rng.pick(["t=1,v1=00", "garbage", `t=${Date.now()},v1=${"0".repeat(64)}`, ",,,", "t=,v1="]);
  if (how === "old-signature") headers[header] = sign(secret, text).replace(/^t=\d+/, "t=1000000000");
  return { headers, body: Buffer.from(text), mutation: `webhook:${how}`, safe: how === "signed" ? "signed but no event the app acts on" : "signature refused", expect: how === "signed" ? "webhook" : "refusal" };
}

export function handlerCase(rng: Rng, t: HandlerTarget, world: World): Case {
  const d = t.decl;
  const persona: Persona = d.crossSite ? "anonymous" : rng.pick<Persona>(["anonymous", STRANGER, STRANGER, ...PERMITTED]);
  const writes = STATE_CHANGING.has(d.method);
  const resourceParam = d.resource ? ({ shop: "shop", job: "job", jobMoney: "job", request: "request", invoice: "invoice", deposit: "deposit", photo: "photo", clip: "clip" } as Record<string, string>)[d.resource] : undefined;
  // Real rows only for the stranger or no session, or for a read whose query can't pass its
  // schema: a valid read may write too (the owner opening a request marks it opened).
  const badQuery = !writes && t.queryFields.length > 0 && rng.chance(0.5);
  const wantReal = badQuery || persona === STRANGER || persona === "anonymous";
  const params = Object.fromEntries(d.params.map((p) => [p, paramValue(rng, p, world, wantReal)]));
  const reasons: string[] = [];
  if (!writes) reasons.push(badQuery || !wantReal ? "a read" : "a read by a stranger");
  for (const [name, p] of Object.entries(params)) {
    if (p.kind === "bad-escape") reasons.push("malformed path escape");
    if (name === resourceParam && p.kind !== "real") reasons.push(`${p.kind} ${name} id`);
  }
  if (persona === STRANGER && resourceParam) reasons.push("stranger to the row");
  if (persona === "anonymous" && d.permission !== "public") reasons.push("no session");
  const at = () => d.route.replace(/\[([^\]]+)\]/g, (_, name: string) => params[name]!.value);
  const pathKinds = Object.values(params).map((p) => p.kind).filter((k) => k !== "real" && k !== "made-up");
  let mutation = pathKinds.length ? `path:${pathKinds[0]}` : "";
  let rest = "";
  if (rng.chance(0.05)) {
    rest += rng.pick(["/", "//", "/extra", "/..", "/%2e%2e", "?", "#x"]);
    mutation ||= "path:suffix";
  }
  if (d.query || rng.chance(0.15)) {
    rest += `${rest.includes("?") ? "&" : "?"}${queryString(rng, t.queryFields)}`;
    mutation ||= "query:junk";
  }
  if (badQuery) {
    // Longer than any of these query fields allows (enums, numbers, searches of at most 100).
    rest += `${rest.includes("?") ? "&" : "?"}${encodeURIComponent(rng.pick(t.queryFields))}=${"x".repeat(5000)}`;
    mutation ||= "query:overlong-field";
  }
  const c: Case = { target: t.id, mutation, safe: "", persona, method: d.method, path: at() + rest, headers: {}, expect: writes ? "refusal" : "read" };
  if (d.body === "raw" && d.route.startsWith("/api/webhooks/")) {
    const w = webhookCase(rng, t);
    Object.assign(c, w);
    reasons.push(w.safe);
    mutation = w.mutation;
  } else if (d.body === "raw" || (d.crossSite && writes)) {
    // RFC 8058 one-click: the token decides, and no token here is one the app signed.
    c.headers["content-type"] = rng.pick(["application/x-www-form-urlencoded", "multipart/form-data; boundary=x", "text/plain", ""]);
    c.body = Buffer.from(rng.pick(["List-Unsubscribe=One-Click", "", "List-Unsubscribe=%ZZ", "x".repeat(rng.int(100_000))]));
    reasons.push("forged token");
    mutation ||= "body:one-click";
  } else if (d.body === "json") {
    const body = jsonBody(rng, t.fields);
    c.body = Buffer.from(body.text);
    const masked = rng.chance(0.2);
    c.headers["content-type"] = masked ? rng.pick(CONTENT_TYPES) : rng.pick(JSON_TYPES);
    if (masked && c.headers["content-type"] !== "application/json") reasons.push("not JSON (415)");
    if (body.breaks) reasons.push("no JSON object / over the limit");
    mutation = masked ? "header:content-type" : body.mutation;
  } else if (d.body === "multipart") {
    const boundary = `----fuzz${rng.string(12)}`;
    const form = multipart([["photo", { file: rng.pick(["x.jpg", "../../x.png", "🔧.heic", ""]), type: rng.pick(["image/jpeg", "text/html", ""]), data: Buffer.alloc(rng.int(4096), rng.int(256)) }], ["caption", "x"]], boundary);
    c.body = rng.chance(0.5) ? brokenMultipart(rng, form, boundary) : form;
    c.headers["content-type"] = rng.chance(0.8) ? `multipart/form-data; boundary=${boundary}` : rng.pick(CONTENT_TYPES);
    mutation ||= "body:multipart";
  } else if (writes && rng.chance(0.5)) {
    c.body = Buffer.from(rng.pick(["{}", "x", "[]"]));
    c.headers["content-type"] = rng.pick(["application/json", "text/plain"]);
  }
  // Another origin or site: refused before anything else (not for handlers open to other sites).
  if (!d.crossSite && rng.chance(0.08)) {
    Object.assign(c.headers, rng.pick([{ origin: "http://127.0.0.1:3999" }, { origin: "null" }, { "sec-fetch-site": "cross-site" }, { "sec-fetch-site": "same-site", origin: APP_ORIGIN }, { origin: "garbage" }]));
    if (writes) reasons.push("foreign origin");
    mutation = "header:foreign-origin";
  } else if (writes) c.headers.origin = APP_ORIGIN;
  if (c.body && rng.chance(0.06)) {
    c.framing = rng.chance(0.5) ? "chunked" : { declaredLength: Math.max(c.body.length + 1, rng.pick([JSON_LIMIT + 1, 2 ** 31, 30 * 1024 * 1024, 99_999_999_999])) };
    mutation = typeof c.framing === "string" ? "framing:chunked" : "framing:declared-too-long";
    if (typeof c.framing !== "string") reasons.push("declared over the limit");
  }
  c.mutation = mutation || "path:ids";
  // Nothing above rules a write out: aim it at a row that doesn't exist instead.
  if (c.expect === "refusal" && reasons.length === 0) {
    if (!resourceParam) throw new Error(`fuzz: ${t.id} changes state without a resource; say how it is kept harmless`);
    params[resourceParam] = { value: encodeURIComponent(madeUpId(rng, idKind(resourceParam, "path")!, world)), kind: "made-up" };
    c.path = at() + rest;
    reasons.push(`made-up ${resourceParam} id`);
  }
  c.safe = reasons[0] ?? "a read";
  return c;
}
