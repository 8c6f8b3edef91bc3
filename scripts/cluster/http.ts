// Talking to the cluster through HAProxy the way a browser does: which instance answered (the
// X-Benchside-Instance header HAProxy adds), sessions from the real sign-in form, server actions
// as React sends them, and a live-update stream read as it arrives.
import path from "node:path";
import { actionState, readActionManifest } from "../../tests/e2e/access/client";

export const APP_URL = process.env.APP_URL ?? "http://127.0.0.1:3400";

export type Answer = { status: number; instance: string; text: string; bytes: number; headers: Headers; ms: number };

export async function call(pathname: string, init: RequestInit & { cookie?: string } = {}): Promise<Answer> {
  const started = Date.now();
  const headers = new Headers(init.headers);
  if (init.cookie) headers.set("cookie", init.cookie);
  const res = await fetch(`${APP_URL}${pathname}`, { ...init, headers, redirect: "manual", signal: init.signal ?? AbortSignal.timeout(30_000) });
  const body = Buffer.from(await res.arrayBuffer());
  return { status: res.status, instance: res.headers.get("x-benchside-instance") ?? "?", text: body.toString("utf8"), bytes: body.length, headers: res.headers, ms: Date.now() - started };
}

/** Repeats a GET until the other instance than `not` answers it (round robin makes that quick). */
export async function callOn(other: { not: string }, pathname: string, init: RequestInit & { cookie?: string } = {}): Promise<Answer> {
  for (let i = 0; i < 20; i++) {
    const answer = await call(pathname, init);
    if (answer.instance !== other.not && answer.instance !== "?") return answer;
  }
  throw new Error(`20 requests to ${pathname} were all answered by instance ${other.not}`);
}

const actions = readActionManifest(path.join(process.env.NEXT_DIST_DIR ?? ".next-cluster"));

export function actionId(key: string): string {
  const ref = actions.get(key);
  if (!ref) throw new Error(`no server action ${key} in the build's manifest`);
  return ref.id;
}

export type ActionAnswer = Answer & { ok: boolean | null; redirect: string | null; cookies: string[]; message: string | null };

/** A server action as `useActionState` posts it: `(previousState, formData)`. */
export async function action(key: string, page: string, fields: Record<string, string>, cookie?: string): Promise<ActionAnswer> {
  const form = new FormData();
  for (const [name, value] of Object.entries(fields)) form.append(`_1_${name}`, value);
  form.append("0", '[null,"$K1"]');
  const answer = await call(page, { method: "POST", cookie, body: form, headers: { "next-action": actionId(key), accept: "text/x-component", origin: APP_URL } });
  const state = actionState(answer.text);
  const redirect = answer.headers.get("x-action-redirect")?.split(";")[0] ?? null;
  const cookies = answer.headers.getSetCookie().map((c) => c.split(";")[0]!);
  return { ...answer, ok: state ? state.ok : redirect ? true : null, redirect, cookies, message: state?.error?.message ?? null };
}

/** A staff session made by the password form; the Cookie header, and which instance made it. */
export async function signInStaff(email: string, password: string): Promise<{ cookie: string; instance: string }> {
  const answer = await action("app/(auth)/sign-in/actions.ts#signInWithPassword", "/sign-in", { email, password });
  const cookie = answer.cookies.filter((c) => c.includes("session-token") && !c.endsWith("=")).join("; ");
  if (!cookie) throw new Error(`signing in as ${email} set no session cookie (HTTP ${answer.status}, ${answer.message ?? answer.text.slice(0, 200)})`);
  return { cookie, instance: answer.instance };
}

export type LiveEvent = { id: number; kind: string; job: unknown };

/** An open live-update stream: the instance serving it and the events it has received so far. */
export type Stream = { instance: string; events: LiveEvent[]; close(): void };

export async function openStream(pathname: string, cookie: string): Promise<Stream> {
  const controller = new AbortController();
  const res = await fetch(`${APP_URL}${pathname}`, { headers: { cookie, accept: "text/event-stream" }, signal: controller.signal });
  if (res.status !== 200 || !res.body) throw new Error(`the event stream answered HTTP ${res.status}`);
  const stream: Stream = { instance: res.headers.get("x-benchside-instance") ?? "?", events: [], close: () => controller.abort() };
  void (async () => {
    const decoder = new TextDecoder();
    let buffered = "";
    try {
      for await (const chunk of res.body as unknown as AsyncIterable<Uint8Array>) {
        buffered += decoder.decode(chunk, { stream: true });
        let end: number;
        while ((end = buffered.indexOf("\n\n")) >= 0) {
          const block = buffered.slice(0, end);
          buffered = buffered.slice(end + 2);
          const data = /^data: (.*)$/m.exec(block)?.[1];
          const kind = /^event: (.*)$/m.exec(block)?.[1];
          if (data && kind && kind !== "ready") stream.events.push(JSON.parse(data) as LiveEvent);
        }
      }
    } catch {
      // Closed by us (abort) or by the server: the events read so far stay.
    }
  })();
  return stream;
}

export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
