// Helpers for tests that drive the payments fake: the payment page as a browser would submit it, and
// the /_fake switches. Plain fetch, no SDK (the SDK has no such calls).
import type { Delivery } from "./types";

async function control(baseUrl: string, method: string, path: string, body?: unknown) {
  const res = await fetch(`${baseUrl}${path}`, {
    method,
    headers: body === undefined ? undefined : { "content-type": "application/json" },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  const json = (await res.json()) as unknown;
  if (!res.ok) throw new Error(`payments fake ${method} ${path}: ${res.status} ${JSON.stringify(json)}`);
  return json;
}

/** Submits the payment page's form: a card number, or "cancel". Returns the raw answer (no redirects followed). */
export async function submitPaymentPage(sessionUrl: string, choice: { card: string } | "cancel"): Promise<{ status: number; location: string | null; html: string }> {
  const form = choice === "cancel" ? new URLSearchParams({ action: "cancel" }) : new URLSearchParams({ action: "pay", card: choice.card });
  const res = await fetch(sessionUrl, { method: "POST", headers: { "content-type": "application/x-www-form-urlencoded" }, body: form.toString(), redirect: "manual" });
  return { status: res.status, location: res.headers.get("location"), html: await res.text() };
}

export const failNextApiCalls = (baseUrl: string, count: number, status = 500) => control(baseUrl, "POST", "/_fake/fail", { count, status });
export const dropWebhooks = (baseUrl: string, drop: boolean) => control(baseUrl, "POST", "/_fake/webhooks/drop", { drop });
export const redeliverWebhook = (baseUrl: string, eventId: string) => control(baseUrl, "POST", "/_fake/webhooks/redeliver", { event_id: eventId });
export const resetPaymentsFake = (baseUrl: string, state = false) => control(baseUrl, "POST", "/_fake/reset", { state });

export async function listWebhookDeliveries(baseUrl: string, filter: { type?: string; objectId?: string } = {}): Promise<Delivery[]> {
  const q = new URLSearchParams();
  if (filter.type) q.set("type", filter.type);
  if (filter.objectId) q.set("object_id", filter.objectId);
  return ((await control(baseUrl, "GET", `/_fake/webhooks?${q}`)) as { data: Delivery[] }).data;
}

/** Waits until an event about this object has reached `state` (default delivered). */
export async function waitForWebhook(baseUrl: string, filter: { type: string; objectId: string }, state: Delivery["state"] = "delivered", timeoutMs = 30_000): Promise<Delivery> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const found = (await listWebhookDeliveries(baseUrl, filter)).find((d) => d.state === state);
    if (found) return found;
    if (Date.now() > deadline) throw new Error(`payments fake: no ${filter.type} for ${filter.objectId} reached "${state}" in ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 100));
  }
}
