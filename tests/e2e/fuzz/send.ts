// Sending the fuzz test's requests and judging what came back. Most go through Playwright's
// request API with the persona's signed-in state; those whose framing it can't express (no
// Content-Length, a length that lies, no Content-Type at all) go byte for byte through node:http
// with the same cookies.
import fs from "node:fs";
import http from "node:http";
import type { APIRequestContext } from "@playwright/test";
import { APP_URL, actionState } from "../access/client";
import { storageStatePath } from "../personas";
import type { Case, Persona } from "./cases";

export type Outcome = { status: number; contentType: string; location: string; actionRedirect: string; text: string; error?: string };

const TIMEOUT_MS = 30_000;
/**
 * A body shorter than its Content-Length: the server may rightly wait for the rest (the proxy
 * reads a body whole before it runs), so not answering within this is no fault; answering
 * wrongly is.
 */
export const PROMISED_BODY_WAIT_MS = 1_500;

/** The persona's cookies as a Cookie header, from the state auth.setup.ts saved; none when anonymous. */
export function cookieHeader(persona: Persona): string {
  if (persona === "anonymous") return "";
  const state = JSON.parse(fs.readFileSync(storageStatePath(persona), "utf8")) as { cookies: { name: string; value: string }[] };
  return state.cookies.map((c) => `${c.name}=${c.value}`).join("; ");
}

const needsRaw = (c: Case) => c.framing !== undefined || c.headers["content-type"] === "" || c.path.length > 6000;

/**
 * A connection the server closed as idle just as the client reused it ("socket hang up") is the
 * client's race, not an answer: such a request is sent once more. A server that resets the
 * connection on purpose does so again, and that counts.
 */
export async function send(c: Case, ctx: APIRequestContext, cookie: string): Promise<Outcome & { retried?: true }> {
  const first = await sendOnce(c, ctx, cookie);
  if (!first.error || !/ECONNRESET|socket hang up/.test(first.error)) return first;
  return { ...(await sendOnce(c, ctx, cookie)), retried: true };
}

async function sendOnce(c: Case, ctx: APIRequestContext, cookie: string): Promise<Outcome> {
  if (needsRaw(c)) return sendRaw(c, cookie);
  try {
    const res = await ctx.fetch(c.path, { method: c.method, headers: c.headers, data: c.body, maxRedirects: 0, failOnStatusCode: false, timeout: TIMEOUT_MS });
    const h = res.headers();
    const text = (await res.body()).toString("utf8");
    // Playwright keeps every response's body until it is disposed: 200,000 of them would fill the test's memory.
    await res.dispose();
    return { status: res.status(), contentType: h["content-type"] ?? "", location: h["location"] ?? "", actionRedirect: h["x-action-redirect"] ?? "", text };
  } catch (error) {
    return { status: 0, contentType: "", location: "", actionRedirect: "", text: "", error: String(error).split("\n")[0]!.replace(/^Error: apiRequestContext\.fetch: /, "").slice(0, 200) };
  }
}

function sendRaw(c: Case, cookie: string): Promise<Outcome> {
  const url = new URL(APP_URL);
  const headers: Record<string, string | number> = Object.fromEntries(Object.entries(c.headers).filter(([, v]) => v !== ""));
  if (cookie) headers.cookie = cookie;
  if (c.body && typeof c.framing === "object") headers["content-length"] = c.framing.declaredLength;
  else if (c.body && c.framing !== "chunked") headers["content-length"] = c.body.length;
  return new Promise((resolve) => {
    const done = (o: Outcome) => {
      clearTimeout(timer);
      req.destroy();
      resolve(o);
    };
    // Long odd paths come back in a Location header: more header than node's 16 KiB default.
    const req = http.request({ host: url.hostname, port: url.port, method: c.method, path: c.path, headers, agent: false, maxHeaderSize: 1024 * 1024 }, (res) => {
      const chunks: Buffer[] = [];
      res.on("data", (chunk: Buffer) => chunks.push(chunk));
      res.on("end", () =>
        done({
          status: res.statusCode ?? 0,
          contentType: String(res.headers["content-type"] ?? ""),
          location: String(res.headers.location ?? ""),
          actionRedirect: String(res.headers["x-action-redirect"] ?? ""),
          text: Buffer.concat(chunks).toString("utf8"),
        }),
      );
      res.on("error", (e) => done({ status: res.statusCode ?? 0, contentType: "", location: "", actionRedirect: "", text: "", error: `response: ${e.message}` }));
    });
    const waiting = typeof c.framing === "object";
    const timer = setTimeout(
      () => done({ status: 0, contentType: "", location: "", actionRedirect: "", text: "", error: waiting ? "waiting for the promised body" : `no answer in ${TIMEOUT_MS / 1000} s` }),
      waiting ? PROMISED_BODY_WAIT_MS : TIMEOUT_MS,
    );
    // A refusal may come, and the socket close, before the whole body is written.
    req.on("error", (e) => done({ status: 0, contentType: "", location: "", actionRedirect: "", text: "", error: e.message }));
    if (c.body) req.write(c.body);
    // A declared length longer than the body: leave the request open; the answer must come anyway.
    if (typeof c.framing !== "object") req.end();
  });
}

/** What is wrong with the answer, or null. */
export function judge(c: Case, o: Outcome): string | null {
  if (o.error === "waiting for the promised body") return null;
  if (o.error) return `no answer (${o.error})`;
  if (o.status >= 500) return `${o.status}`;
  if (o.status >= 400 && o.contentType.includes("application/json")) {
    try {
      const error = (JSON.parse(o.text) as { error?: { code?: unknown; message?: unknown } }).error;
      if (typeof error?.code !== "string" || typeof error.message !== "string") return `${o.status} JSON without {error:{code,message}}`;
    } catch {
      return `${o.status} "JSON" that doesn't parse`;
    }
  }
  const toSignIn = (where: string) => /\/sign-in(\?|$)/.test(where);
  // Next sends a path with a trailing slash, an empty or a dot segment to its normal form.
  const normalised = o.status === 308 && /\/\/|\/(\.|%2e)|\/(\?|$)/i.test(c.path.split("?")[0]!);
  if (o.status >= 300 && o.status < 400 && c.expect !== "read" && !toSignIn(o.location) && !normalised) return `${o.status} redirect to ${o.location || "?"}`;
  if (o.status >= 400 || o.status >= 300) return null;
  switch (c.expect) {
    case "read":
    case "page":
      return null;
    case "refusal":
      return `${o.status}: accepted`;
    case "webhook": {
      const answer = JSON.parse(o.text || "{}") as { applied?: unknown };
      return answer.applied === false ? null : `webhook acknowledged with ${o.text.slice(0, 100)}`;
    }
    case "action": {
      if (o.actionRedirect) return `action redirected to ${o.actionRedirect} (accepted)`;
      const state = actionState(o.text);
      if (!state) return `${o.status} ${o.contentType}: no action state in the answer`;
      return state.ok === false ? null : "action answered ok (accepted)";
    }
  }
}

/** The request, short enough for a report line. */
export function describeCase(c: Case, index: number): string {
  const body = c.body ? ` body(${c.body.length} B)=${JSON.stringify(c.body.subarray(0, 160).toString("latin1"))}` : "";
  const framing = c.framing ? ` framing=${JSON.stringify(c.framing)}` : "";
  return `#${index} ${c.persona} ${c.method} ${c.path.slice(0, 200)}${c.path.length > 200 ? "…" : ""} [${c.mutation}; safe: ${c.safe}] headers=${JSON.stringify(c.headers)}${framing}${body}`;
}
