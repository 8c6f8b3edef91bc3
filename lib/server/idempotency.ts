import "server-only";
import crypto from "node:crypto";
import { NextResponse } from "next/server";
import { claimKey, findAnswer, isDuplicateKey, purgeExpiredKeys, storeAnswer } from "@/db/queries/idempotency";
import { enclosingTransaction } from "@/db/transaction";
import { AppError } from "@/lib/errors";

// Issue 20 §2: the posts a phone's outbox replays (a note, a photo set, a clip's upload ticket, a
// torque record, a reading and the other bench records, a status move) carry a client-made `Idempotency-Key`. The first
// request with a key runs and its answer is stored with the change, in one transaction; a replay
// of the same key by the same person creates nothing and gets that answer again (status and
// body); the same key with another request is refused (422). A request that fails writes nothing,
// key included (its transaction rolled back), so sending it again is a fresh attempt.

/** How long a key is honoured: far longer than a phone stays offline with the app open. */
export const IDEMPOTENCY_TTL_MS = 7 * 24 * 60 * 60 * 1000;
export const IDEMPOTENCY_HEADER = "idempotency-key";
const KEY_PATTERN = /^[A-Za-z0-9_.:-]{8,100}$/;

export type IdempotentRequest = {
  userId: number;
  /** null: the caller sent no key; the work just runs. */
  key: string | null;
  method: string;
  /** The path the request was sent to (the same key on another address is another request). */
  path: string;
  body: unknown;
};
export type Answer<T> = { status: number; body: T; replayed: boolean };

/** The key of a request's `Idempotency-Key` header; null without one, 422 when it is malformed. */
export function idempotencyKeyOf(headers: Headers): string | null {
  const key = headers.get(IDEMPOTENCY_HEADER);
  if (key === null) return null;
  if (!KEY_PATTERN.test(key)) {
    throw new AppError("invalid", "The Idempotency-Key header must be 8 to 100 letters, digits or the marks - _ . : (a fresh random id per post).");
  }
  return key;
}

/** JSON with object keys sorted at every level, so the same content always hashes alike. */
export function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(",")}]`;
  if (value && typeof value === "object" && !(value instanceof Date)) {
    const entries = Object.entries(value as Record<string, unknown>).filter(([, v]) => v !== undefined);
    entries.sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(",")}}`;
  }
  return JSON.stringify(value) ?? "null";
}

export function requestHash(r: Pick<IdempotentRequest, "method" | "path" | "body">): string {
  return crypto.createHash("sha256").update(`${r.method.toUpperCase()} ${r.path}\n${canonicalJson(r.body)}`).digest("hex");
}

function replay<T>(stored: { request_hash: string; response_status: number; response_body: string }, hash: string): Answer<T> {
  if (stored.request_hash !== hash) {
    throw new AppError("invalid", "This post's Idempotency-Key was already used for a different post (other content or another address). Nothing was recorded; send it with a new key.");
  }
  return { status: stored.response_status, body: JSON.parse(stored.response_body) as T, replayed: true };
}

/**
 * Runs `work` once per (person, key): the key's row is claimed first in one transaction that the
 * writers inside `work` join (enclosingTransaction), and the answer is stored before it commits.
 * `work` may call a hosted service (a clip's direct upload): a concurrent duplicate waits on the
 * key's row before its own `work` starts, so that call is made once.
 */
export async function runIdempotent<T>(request: IdempotentRequest, work: () => Promise<T>, now: () => Date = () => new Date()): Promise<Answer<T>> {
  if (request.key === null) return { status: 200, body: await work(), replayed: false };
  const key = request.key;
  const hash = requestHash(request);
  const earlier = await findAnswer({ userId: request.userId, key, now: now() });
  if (earlier) return replay<T>(earlier, hash);
  if (Math.random() < 0.01) void purgeExpiredKeys({ now: now() }).catch((error) => console.warn("idempotency: purging expired keys failed", error));
  let claimed = false;
  try {
    return await enclosingTransaction(async (tx) => {
      claimed = false;
      await claimKey(tx, { userId: request.userId, key, requestHash: hash, expiresAt: new Date(now().getTime() + IDEMPOTENCY_TTL_MS) });
      claimed = true;
      const body = await work();
      await storeAnswer(tx, { userId: request.userId, key, status: 200, body: JSON.stringify(body ?? null) });
      return { status: 200, body, replayed: false };
    });
  } catch (error) {
    // A duplicate from the writer's own tables is the writer's error, not a second send.
    if (!isDuplicateKey(error) || claimed) throw error;
    // Another send of this key committed while we waited on its row: answer as it was answered.
    const stored = await findAnswer({ userId: request.userId, key, now: now() });
    if (stored) return replay<T>(stored, hash);
    throw new AppError("conflict", "This post is being sent by another request at this moment. Try again in a few seconds.");
  }
}

/**
 * For a route handler: the work's result as the route answers it the first time, or the stored
 * answer as a Response (marked `Idempotent-Replayed: true`) on a replay.
 */
export async function idempotentRoute<T>(req: Request, userId: number, body: unknown, work: () => Promise<T>): Promise<T | Response> {
  const answer = await runIdempotent({ userId, key: idempotencyKeyOf(req.headers), method: req.method, path: new URL(req.url).pathname, body }, work);
  if (!answer.replayed) return answer.body;
  return NextResponse.json(answer.body, { status: answer.status, headers: { "idempotent-replayed": "true" } });
}
