// Helpers for reading the mail fake from tests. Shared by Vitest and Playwright, so no test-runner imports.
import type { MailMessage } from "../../fakes/mail/types";

export type { MailMessage };

export type WaitForMailOptions = {
  baseUrl: string;
  to: string;
  subjectIncludes?: string;
  since?: Date;
  timeoutMs?: number;
};

const POLL_MS = 100;

function endpoint(baseUrl: string, path: string): string {
  return `${baseUrl.replace(/\/+$/, "")}${path}`;
}

async function expectOk(res: Response, what: string): Promise<unknown> {
  const text = await res.text();
  if (!res.ok) throw new Error(`mail fake: ${what} failed with HTTP ${res.status}: ${text}`);
  return text ? JSON.parse(text) : null;
}

/** Messages for one recipient (to/cc/bcc), newest first. */
export async function listMail(baseUrl: string, filter: { to?: string; since?: Date } = {}): Promise<MailMessage[]> {
  const query = new URLSearchParams();
  if (filter.to) query.set("to", filter.to);
  if (filter.since) query.set("since", filter.since.toISOString());
  const qs = query.toString();
  const res = await fetch(endpoint(baseUrl, `/_fake/messages${qs ? `?${qs}` : ""}`));
  const body = (await expectOk(res, "listing messages")) as { data: MailMessage[] };
  return body.data;
}

/** Resolves with the newest matching message; the app sends mail asynchronously, so tests poll. */
export async function waitForMail(opts: WaitForMailOptions): Promise<MailMessage> {
  const timeoutMs = opts.timeoutMs ?? 10_000;
  const deadline = Date.now() + timeoutMs;
  let seen: MailMessage[] = [];
  let lastError: unknown = null;
  for (;;) {
    try {
      seen = await listMail(opts.baseUrl, { to: opts.to, since: opts.since });
      lastError = null;
      const hit = seen.find((m) => opts.subjectIncludes === undefined || m.subject.includes(opts.subjectIncludes));
      if (hit) return hit;
    } catch (error) {
      // The fake may still be starting; keep polling and report the last failure if time runs out.
      lastError = error;
    }
    if (Date.now() >= deadline) break;
    await new Promise((resolve) => setTimeout(resolve, POLL_MS));
  }
  const wanted = opts.subjectIncludes === undefined ? "" : ` with a subject containing "${opts.subjectIncludes}"`;
  const since = opts.since ? ` since ${opts.since.toISOString()}` : "";
  const subjects = seen.length ? ` Subjects seen for that address: ${seen.map((m) => JSON.stringify(m.subject)).join(", ")}.` : "";
  const cause = lastError instanceof Error ? ` Last error: ${lastError.message}` : "";
  throw new Error(`No e-mail to ${opts.to}${wanted} arrived at ${opts.baseUrl}${since} within ${timeoutMs} ms.${subjects}${cause}`);
}

export async function getMail(baseUrl: string, id: string): Promise<MailMessage> {
  const res = await fetch(endpoint(baseUrl, `/_fake/messages/${encodeURIComponent(id)}`));
  return (await expectOk(res, `reading message ${id}`)) as MailMessage;
}

export async function clearMailbox(baseUrl: string): Promise<void> {
  await expectOk(await fetch(endpoint(baseUrl, "/_fake/messages"), { method: "DELETE" }), "clearing the mailbox");
}

/** Makes the next `count` Resend API calls fail with `status` (429 adds retry-after). */
export async function failNext(baseUrl: string, count: number, status = 500): Promise<void> {
  const res = await fetch(endpoint(baseUrl, "/_fake/fail"), {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify({ count, status }),
  });
  await expectOk(res, "arming failures");
}

export async function clearFailures(baseUrl: string): Promise<void> {
  await expectOk(await fetch(endpoint(baseUrl, "/_fake/fail"), { method: "DELETE" }), "clearing failures");
}

export async function mailStats(baseUrl: string): Promise<{ accepted: number; failed: number; stored: number; pendingFailures: number }> {
  const res = await fetch(endpoint(baseUrl, "/_fake/stats"));
  return (await expectOk(res, "reading stats")) as { accepted: number; failed: number; stored: number; pendingFailures: number };
}
