// Calling handlers and server actions as plain HTTP, the way a browser would, and reading what
// came back: the JSON error of a handler, or the ActionState inside an action's RSC answer.
import fs from "node:fs";
import path from "node:path";
import type { APIRequestContext } from "@playwright/test";
import type { Outcome } from "./expected";

export const APP_URL = process.env.APP_URL ?? "http://localhost:3110";
export const APP_ORIGIN = new URL(APP_URL).origin;

/**
 * Anonymous requests carry an empty session cookie: it gets them past proxy.ts's "no cookie →
 * sign-in" redirect of /shop and /my, so the wrappers' own refusal is what is tested, and it
 * is no session to Auth.js (an empty cookie is skipped, nothing is decoded or logged).
 */
export const ANONYMOUS_COOKIE = "authjs.session-token=";

export type Seen = { status: number; code?: string; message?: string; fields?: Record<string, string[]>; redirect?: string; text: string };

export type Body =
  | { kind: "none" }
  | { kind: "json"; value: unknown }
  | { kind: "multipart"; fields: Record<string, string | { name: string; mimeType: string; buffer: Buffer }> }
  | { kind: "raw"; text: string; contentType: string };

export type HandlerCall = { method: string; path: string; query?: Record<string, string>; body: Body };

async function read(res: Awaited<ReturnType<APIRequestContext["fetch"]>>): Promise<Seen> {
  const text = (await res.body()).toString("utf8");
  const seen: Seen = { status: res.status(), text };
  const location = res.headers()["location"];
  if (location) seen.redirect = location;
  if ((res.headers()["content-type"] ?? "").includes("application/json")) {
    try {
      const error = (JSON.parse(text) as { error?: Pick<Seen, "code" | "message" | "fields"> }).error;
      if (error) Object.assign(seen, { code: error.code, message: error.message, fields: error.fields });
    } catch {
      // Not JSON after all: the status says enough.
    }
  }
  return seen;
}

/**
 * ctx.fetch, sent once more when the connection was reset before any answer: the server closed
 * it as idle just as the client reused it (keep-alive), so the request never reached the app.
 * The fuzz test's sender does the same (fuzz/send.ts).
 */
async function fetchOnReset(ctx: APIRequestContext, url: string, options: Parameters<APIRequestContext["fetch"]>[1]) {
  try {
    return await ctx.fetch(url, options);
  } catch (error) {
    if (!(error instanceof Error) || !/ECONNRESET|socket hang up/.test(error.message)) throw error;
    return ctx.fetch(url, options);
  }
}

export async function callHandler(ctx: APIRequestContext, call: HandlerCall, headers: Record<string, string> = {}): Promise<Seen> {
  const url = call.query ? `${call.path}?${new URLSearchParams(call.query)}` : call.path;
  const b = call.body;
  const res = await fetchOnReset(ctx, url, {
    method: call.method,
    headers,
    maxRedirects: 0,
    failOnStatusCode: false,
    ...(b.kind === "json" ? { data: b.value as object } : b.kind === "multipart" ? { multipart: b.fields } : b.kind === "raw" ? { data: b.text, headers: { "content-type": b.contentType, ...headers } } : {}),
  });
  return read(res);
}

/** A server action as React's client sends it for `useActionState`: `(previousState, formData)`. */
export async function callAction(ctx: APIRequestContext, a: { id: string; page: string; fields: Record<string, string> }, headers: Record<string, string> = {}): Promise<Seen> {
  // encodeReply([null, formData]): the form's entries prefixed "_1_", then the arguments as field
  // "0" — last, as React sends it: the server resolves "$K1" from the entries read before it.
  const multipart = new FormData();
  for (const [key, value] of Object.entries(a.fields)) multipart.append(`_1_${key}`, value);
  multipart.append("0", '[null,"$K1"]');
  const res = await fetchOnReset(ctx, a.page, {
    method: "POST",
    headers: { "next-action": a.id, accept: "text/x-component", origin: APP_ORIGIN, ...headers },
    multipart,
    maxRedirects: 0,
    failOnStatusCode: false,
  });
  const seen = await read(res);
  const redirect = res.headers()["x-action-redirect"];
  if (redirect) seen.redirect = redirect.split(";")[0];
  const state = actionState((await res.body()).toString("utf8"));
  if (state && state.ok === false) Object.assign(seen, { code: state.error?.code, message: state.error?.message, fields: state.error?.fields });
  if (state?.ok === true) seen.code = "ok";
  return seen;
}

type ActionState = { ok: boolean; error?: Pick<Seen, "code" | "message" | "fields"> };

/**
 * The action's result in an RSC (text/x-component) answer: one JSON model per row "<id>:<json>";
 * row 0 is `{"a": <result or "$@<row>">, …}`, the result an `{ok, …}` ActionState.
 */
export function actionState(flight: string): ActionState | null {
  const rows = new Map<string, unknown>();
  for (const line of flight.split("\n")) {
    const row = /^([0-9a-f]+):([[{].*)$/.exec(line);
    if (!row) continue;
    try {
      rows.set(row[1]!, JSON.parse(row[2]!));
    } catch {
      // A row that isn't a JSON model (text, hints): not the result.
    }
  }
  let result = (rows.get("0") as { a?: unknown } | undefined)?.a;
  if (typeof result === "string" && result.startsWith("$@")) result = rows.get(result.slice(2));
  return result && typeof result === "object" && typeof (result as ActionState).ok === "boolean" ? (result as ActionState) : null;
}

/** The refusals lib/server/access.ts and the wrappers write, by their words (lib/route.ts, lib/action.ts). */
const REFUSED_403 = new Set(["You don't have access to this.", "Invoices and payments are for the service desk and the shop owner."]);
const HIDDEN_404 = /, or it isn't yours to see\.$/;

/**
 * What the wrapper decided: its 401, or a resolver's 403/404, or "allowed" (the request reached
 * the handler, whatever the handler then answered). A path the params schema refused, or a
 * server error, means the call itself is wrong: "broken".
 */
export function classify(seen: Seen): Outcome | "broken" {
  if (seen.code === "unauthenticated" && seen.message === "Sign in first.") return "401";
  if (seen.code === "forbidden" && REFUSED_403.has(seen.message ?? "")) return "403";
  if (seen.code === "not_found" && HIDDEN_404.test(seen.message ?? "")) return "404";
  if (seen.code === "not_found" && seen.message === "There's nothing at this address.") return "broken";
  if (seen.status >= 500) return "broken";
  return "allowed";
}

export function describeSeen(seen: Seen): string {
  const fields = seen.fields && Object.entries(seen.fields).map(([k, v]) => `${k}: ${v.join(" ")}`).join("; ");
  const what = [seen.status, seen.code, seen.message && `"${seen.message}"`, fields && `{${fields}}`, seen.redirect && `→ ${seen.redirect}`].filter(Boolean).join(" ");
  return seen.code || seen.redirect ? what : `${what} ${seen.text.slice(0, 120).replace(/\s+/g, " ")}`;
}

export type ActionRef = { id: string; workers: string[] };

/**
 * Each action's id and the pages that bundle it, from the build's server-reference manifest
 * (`node.<id>` → `{ workers: {"app/…/page": …}, filename, exportedName }`), keyed "file#export".
 */
export function readActionManifest(distDir = process.env.NEXT_DIST_DIR ?? ".next"): Map<string, ActionRef> {
  const file = path.join(process.cwd(), distDir, "server", "server-reference-manifest.json");
  const manifest = JSON.parse(fs.readFileSync(file, "utf8")) as { node: Record<string, { workers: Record<string, unknown>; filename?: string; exportedName?: string }> };
  const refs = new Map<string, ActionRef>();
  for (const [id, entry] of Object.entries(manifest.node)) {
    if (!entry.filename || !entry.exportedName) continue;
    refs.set(`${entry.filename}#${entry.exportedName}`, { id, workers: Object.keys(entry.workers) });
  }
  return refs;
}

/** "app/(staff)/shop/[shop]/jobs/[number]/page" → "/shop/copper-gulch/jobs/7", or null when a param is unknown. */
export function pagePath(worker: string, values: Record<string, string>): string | null {
  if (!/\/page$/.test(worker)) return null;
  const segments = worker.split("/").slice(1, -1).filter((s) => !/^\(.*\)$/.test(s));
  const filled = segments.map((s) => {
    const m = /^\[([^\].]+)\]$/.exec(s);
    return m ? values[m[1]!] : s;
  });
  return filled.every((s) => s !== undefined) ? `/${filled.map((s) => encodeURIComponent(s!)).join("/")}` : null;
}

/** Runs `work` over `items`, at most `limit` at a time, keeping the order of results. */
export async function pool<T, R>(items: T[], limit: number, work: (item: T) => Promise<R>): Promise<R[]> {
  const results: R[] = new Array(items.length);
  let next = 0;
  const run = async () => {
    while (next < items.length) {
      const i = next++;
      results[i] = await work(items[i]!);
    }
  };
  await Promise.all(Array.from({ length: Math.min(limit, items.length) }, run));
  return results;
}
