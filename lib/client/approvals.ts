// Writes for the approval screens. Unlike sendJson these keep the whole refusal (which version
// is current, the answer already on record) and the per-field messages, so forms can show them.
import type { DecisionRow } from "@/db/queries/approvals";
import type { RefusalReason } from "@/lib/server/approvals";

export type Refusal = { reason: RefusalReason; current: string | null; decision?: DecisionRow };
export type Outcome<T> = { ok: true; data: T } | { ok: false; status: number; message: string; fields?: Record<string, string[]>; refusal?: Refusal };

export async function postJson<T>(url: string, body: unknown, method: "POST" | "PATCH" = "POST"): Promise<Outcome<T>> {
  try {
    const res = await fetch(url, { method, headers: { "content-type": "application/json", accept: "application/json" }, body: JSON.stringify(body) });
    const data = (await res.json().catch(() => null)) as (T & { error?: { message?: string; fields?: Record<string, string[]> }; refusal?: Refusal }) | null;
    if (res.ok) return { ok: true, data: data as T };
    return { ok: false, status: res.status, message: data?.error?.message ?? `Request failed (${res.status}).`, fields: data?.error?.fields, refusal: data?.refusal };
  } catch {
    return { ok: false, status: 0, message: "We couldn't reach Benchside. Check the connection and try again; nothing was recorded." };
  }
}

export type AnswerBody = { shownHash: string; lines: { no: number; answer: "approved" | "declined" }[]; signature: string; wantsPartsBack: boolean; confirmed: true };
export type RecordedBody = Omit<AnswerBody, "signature" | "confirmed"> & { method: "phone" | "in_person"; personName: string; phoneCalled: string | null; decidedAt: string; note: string | null };

export const postDecision = (request: string, body: AnswerBody) => postJson<{ decision: DecisionRow }>(`/api/approvals/${request}/decision`, body);
export const postRecordedDecision = (request: string, body: RecordedBody) => postJson<{ decision: DecisionRow }>(`/api/approvals/${request}/recorded-decision`, body);
export const postWithdraw = (request: string, reason: string | null) => postJson<{ withdrawn: true }>(`/api/approvals/${request}/withdraw`, { reason });
export const postSend = (job: string, finding: number, findingVersion: number) =>
  postJson<{ request: string; hash: string; mailed: boolean; texted: boolean }>(`/api/jobs/${job}/findings/${finding}/send`, { findingVersion });
