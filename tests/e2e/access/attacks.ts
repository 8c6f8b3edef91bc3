// The attacker cases of issue 22, made with the victim's own session (a persona the table
// allows, so only the request's shape can stop it): a page on another origin or another port of
// the same host posting to a handler or an action, and JSON masked as a "simple" text/plain
// body that needs no preflight. Each must be refused, and (checked by the spec) write nothing.
import { type Seen, callHandler } from "./client";
import { type Call, isStateChanging } from "./calls";

/** A page of another port on the same host: same site, not same origin. */
export const FOREIGN_ORIGIN = "http://127.0.0.1:3999";
const CROSS_SITE = "Requests from other sites are refused.";

export type Attack = { call: Call; headers?: Record<string, string>; send?: (call: Call) => Promise<Seen>; check: (seen: Seen) => boolean; wants: string };

export type AttackCase = { name: string; attacks: Attack[] };

const refusedCrossSite = (seen: Seen) => seen.status !== 200 ? seen.status === 403 && seen.message === CROSS_SITE : seen.code === "forbidden" && seen.message === CROSS_SITE;

/** One call per declaration: by a persona the table lets through. */
function allowedCallPer(calls: Call[], keep: (c: Call) => boolean): Call[] {
  const byDecl = new Map<string, Call>();
  for (const c of calls) if (keep(c) && c.expected === "allowed" && !byDecl.has(c.label)) byDecl.set(c.label, c);
  return [...byDecl.values()];
}

export function attackCases(calls: Call[], contextOf: (c: Call) => Parameters<Call["run"]>[0]): AttackCase[] {
  const handlers = allowedCallPer(calls, (c) => c.decl.kind === "handler" && isStateChanging(c.decl) && !c.decl.crossSite);
  const open = allowedCallPer(calls, (c) => c.decl.kind === "handler" && c.decl.crossSite);
  const actions = allowedCallPer(calls, (c) => c.decl.kind === "action");
  const masked = (call: Call) => {
    const http = call.http!;
    const text = http.body.kind === "json" ? JSON.stringify(http.body.value) : "{}";
    return callHandler(contextOf(call), { ...http, body: { kind: "raw", text, contentType: "text/plain;charset=application/json" } }, { origin: new URL(process.env.APP_URL ?? "http://localhost:3110").origin });
  };
  return [
    {
      name: "a state-changing handler called from a foreign Origin → 403",
      attacks: handlers.map((call) => ({ call, headers: { origin: FOREIGN_ORIGIN }, check: refusedCrossSite, wants: `403 "${CROSS_SITE}"` })),
    },
    {
      name: "a state-changing handler called with Sec-Fetch-Site: same-site → 403",
      attacks: handlers.map((call) => ({ call, headers: { "sec-fetch-site": "same-site" }, check: refusedCrossSite, wants: `403 "${CROSS_SITE}"` })),
    },
    {
      name: "a handler taking JSON or a form, sent text/plain;charset=application/json → 415",
      attacks: handlers
        .filter((c) => c.decl.kind === "handler" && (c.decl.body === "json" || c.decl.body === "multipart"))
        .map((call) => ({ call, send: masked, check: (seen) => seen.status === 415 && seen.code === "unsupported_media_type", wants: "415 unsupported_media_type" })),
    },
    {
      name: "a server action posted from a foreign Origin → 403 (not Next's 500)",
      attacks: actions.map((call) => ({ call, headers: { origin: FOREIGN_ORIGIN }, check: (seen) => seen.status === 403 && seen.message === CROSS_SITE, wants: `HTTP 403 "${CROSS_SITE}"` })),
    },
    {
      name: "a server action posted with Sec-Fetch-Site: same-site → refused",
      attacks: actions.map((call) => ({ call, headers: { "sec-fetch-site": "same-site" }, check: refusedCrossSite, wants: `forbidden "${CROSS_SITE}"` })),
    },
    {
      // Webhooks and the one-click unsubscribe are signed or token-bound: open to other origins by design.
      name: "endpoints declared crossSite: \"allow\" still answer a foreign Origin themselves",
      attacks: open.map((call) => ({ call, headers: { origin: FOREIGN_ORIGIN }, check: (seen) => seen.message !== CROSS_SITE && seen.status < 500, wants: "the handler's own answer" })),
    },
  ];
}
