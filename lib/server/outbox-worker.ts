import "server-only";
import { type ClaimedMail, claimBatch, markFailed, markSent, releaseClaim } from "@/db/queries/outbox";
import type { Tx } from "@/db/transaction";
import { reportUndeliverable } from "@/lib/server/inbox";
import { sweepInboxDigests } from "@/lib/server/inbox-digest";
import { resend } from "@/lib/server/mail";
import { sweepNotifications } from "@/lib/server/notify-sweep";
import { runTextsOnce } from "@/lib/server/text-worker";

// Sends what the outbox holds. Any number of workers may run (one per app host, or more):
// claimBatch hands each row to one of them, and the idempotency key stored with the row makes
// the provider drop a repeat if a worker dies after sending but before recording it.

export type OutboxSettings = {
  batchSize: number;
  /** How long a claimed row stays with its worker before another may take it. */
  leaseMs: number;
  /** Tries before a mail is dead-lettered for staff to look at. */
  maxAttempts: number;
  backoffBaseMs: number;
  backoffMaxMs: number;
  /** Priority mail (sign-in links) is retried sooner: someone is waiting for it. */
  priorityBackoffBaseMs: number;
  priorityBackoffMaxMs: number;
};

const envNumber = (key: string, fallback: number, min = 0) => {
  const n = Number(process.env[key]);
  return process.env[key] !== undefined && Number.isFinite(n) && n >= min ? n : fallback;
};

export function outboxSettings(): OutboxSettings {
  return {
    batchSize: envNumber("OUTBOX_BATCH_SIZE", 20, 1),
    leaseMs: envNumber("OUTBOX_LEASE_MS", 120_000, 1000),
    maxAttempts: envNumber("OUTBOX_MAX_ATTEMPTS", 8, 1),
    backoffBaseMs: envNumber("OUTBOX_BACKOFF_BASE_MS", 30_000),
    backoffMaxMs: envNumber("OUTBOX_BACKOFF_MAX_MS", 3_600_000),
    priorityBackoffBaseMs: envNumber("OUTBOX_PRIORITY_BACKOFF_BASE_MS", 1_000),
    priorityBackoffMaxMs: envNumber("OUTBOX_PRIORITY_BACKOFF_MAX_MS", 15_000),
  };
}

/** Exponential back-off with jitter (half fixed, half random) so retries of many rows spread out. */
export function backoffMs(attempt: number, s: Pick<OutboxSettings, "backoffBaseMs" | "backoffMaxMs">): number {
  const full = Math.min(s.backoffMaxMs, s.backoffBaseMs * 2 ** Math.max(0, attempt - 1));
  return full / 2 + Math.random() * (full / 2);
}

type SendOutcome = { ok: true; id: string } | { ok: false; status: number | null; name: string; message: string; retryAfterMs: number | null };

async function send(mail: ClaimedMail): Promise<SendOutcome> {
  try {
    const { data, error, headers } = await resend().emails.send(
      {
        from: mail.from,
        to: mail.to,
        subject: mail.subject,
        html: mail.html,
        text: mail.text,
        ...(mail.replyTo ? { replyTo: mail.replyTo } : {}),
        ...(mail.headers ? { headers: mail.headers } : {}),
      },
      { idempotencyKey: mail.idempotencyKey },
    );
    if (data) return { ok: true, id: data.id };
    const retryAfter = Number(headers?.["retry-after"]);
    return {
      ok: false,
      status: error?.statusCode ?? null,
      name: error?.name ?? "unknown",
      message: error?.message ?? "no answer",
      retryAfterMs: Number.isFinite(retryAfter) && retryAfter >= 0 ? retryAfter * 1000 : null,
    };
  } catch (error) {
    // The SDK reports HTTP failures as results; a throw is a local problem such as a missing key.
    return { ok: false, status: null, name: "exception", message: error instanceof Error ? error.message : String(error), retryAfterMs: null };
  }
}

/** Network trouble, rate limits and the provider's own errors pass; a refused request would be refused again. */
function isRetryable(o: Extract<SendOutcome, { ok: false }>): boolean {
  return o.status === null || o.status === 429 || o.status >= 500 || o.name === "concurrent_idempotent_requests";
}

export type OutboxRun = { claimed: number; sent: number; retrying: number; dead: number; released: number };

/** Given up on: the desk's inbox hears who it was for and what it was, in the same transaction. */
const toInbox = (mail: ClaimedMail, error: string) => (tx: Tx) => reportUndeliverable(tx, { shopId: mail.shopId, jobId: mail.jobId, kind: mail.kind, to: mail.to, subject: mail.subject, error });

/**
 * Claims one batch and sends it, one mail at a time (the hosted API allows a few requests a second).
 * `lane: "priority"` claims only priority mail (the worker's fast lane).
 */
export async function runOutboxOnce(overrides: Partial<OutboxSettings> = {}, lane: "all" | "priority" = "all"): Promise<OutboxRun> {
  const s = { ...outboxSettings(), ...overrides };
  const batch = await claimBatch({ limit: s.batchSize, leaseMs: s.leaseMs, priorityOnly: lane === "priority" });
  const run: OutboxRun = { claimed: batch.length, sent: 0, retrying: 0, dead: 0, released: 0 };
  for (let i = 0; i < batch.length; i++) {
    const mail = batch[i]!;
    if (mail.sendBefore && mail.sendBefore.getTime() <= Date.now()) {
      // A sign-in link past its end: sending it now would only confuse.
      const why = "no longer useful: its send-before time passed";
      await markFailed(mail, { error: why, retryInMs: null }, toInbox(mail, why));
      run.dead++;
      continue;
    }
    // Mail with a send-before time is retried until then; the rest a fixed number of times.
    if (!mail.sendBefore && mail.attempts > s.maxAttempts) {
      // Claimed again and again with no outcome recorded: whatever stops its worker, stop here.
      const why = `no outcome recorded after ${mail.attempts - 1} claims`;
      await markFailed(mail, { error: why, retryInMs: null }, toInbox(mail, why));
      run.dead++;
      continue;
    }
    const outcome = await send(mail);
    if (outcome.ok) {
      await markSent(mail, outcome.id);
      run.sent++;
      continue;
    }
    const error = `${outcome.status ?? "no status"} ${outcome.name}: ${outcome.message}`;
    const backoff = mail.priority > 0 ? { backoffBaseMs: s.priorityBackoffBaseMs, backoffMaxMs: s.priorityBackoffMaxMs } : s;
    const wait = Math.max(backoffMs(mail.attempts, backoff), outcome.retryAfterMs ?? 0);
    const retry = isRetryable(outcome) && (mail.sendBefore ? Date.now() + wait < mail.sendBefore.getTime() : mail.attempts < s.maxAttempts);
    await markFailed(mail, { error, retryInMs: retry ? wait : null }, toInbox(mail, error));
    if (retry) run.retrying++;
    else run.dead++;
    if (outcome.status === 429) {
      // Told to slow down: the rest of the batch goes back untried rather than each collecting a 429.
      for (const rest of batch.slice(i + 1)) await releaseClaim(rest, outcome.retryAfterMs ?? wait);
      run.released = batch.length - i - 1;
      break;
    }
    if (!retry) console.error(`outbox: mail ${mail.id} dead-lettered after ${mail.attempts} tries: ${error}`);
  }
  return run;
}

/** One batch of the texts' outbox (lib/server/text-worker.ts) with the mail's settings and back-off. */
export function runTextOutboxOnce(overrides: Partial<OutboxSettings> = {}, now?: () => Date) {
  const s = { ...outboxSettings(), ...overrides };
  return runTextsOnce({ batchSize: s.batchSize, leaseMs: s.leaseMs, maxAttempts: s.maxAttempts, backoff: (attempt) => backoffMs(attempt, s) }, now);
}

export type OutboxWorker = { stop(): Promise<void> };

const INBOX_DIGEST_EVERY_MS = 60_000;

/**
 * Every `intervalMs`: turn due notifications into mail (notify-sweep.ts) and, once a minute, the
 * staff's inbox digests (inbox-digest.ts), then send until the outbox has nothing due. Beside it, a fast lane every `priorityIntervalMs` (OUTBOX_PRIORITY_POLL_MS,
 * default 500 ms) sends priority mail only, so a sign-in link never waits for a slow poll or
 * behind a long batch of digests. Errors are logged and the loops go on; stop() waits for both.
 */
export function startOutboxWorker({
  intervalMs,
  priorityIntervalMs = envNumber("OUTBOX_PRIORITY_POLL_MS", Math.min(500, intervalMs), 50),
}: {
  intervalMs: number;
  priorityIntervalMs?: number;
}): OutboxWorker {
  let stopped = false;
  let inboxSweptAt = 0;
  const wakers = new Set<() => void>();
  const drain = async (lane: "all" | "priority") => {
    const { batchSize } = outboxSettings();
    for (let run = await runOutboxOnce({}, lane); run.claimed === batchSize && !stopped; run = await runOutboxOnce({}, lane));
    // Texts ride the fast lane too: an owner waits on a keyword's answer as on a sign-in link.
    for (let run = await runTextOutboxOnce(); run.claimed === batchSize && !stopped; run = await runTextOutboxOnce());
  };
  const repeat = async (everyMs: number, label: string, round: () => Promise<void>) => {
    while (!stopped) {
      try {
        await round();
      } catch (error) {
        console.error(`outbox: ${label} round failed`, error);
      }
      if (stopped) break;
      await new Promise<void>((resolve) => {
        const wake = () => {
          clearTimeout(timer);
          wakers.delete(wake);
          resolve();
        };
        const timer = setTimeout(wake, everyMs);
        wakers.add(wake);
      });
    }
  };
  const loops = [
    repeat(intervalMs, "mail", async () => {
      await sweepNotifications();
      // The staff's morning inbox digests: a minute's precision is plenty for a daily mail.
      if (Date.now() - inboxSweptAt >= INBOX_DIGEST_EVERY_MS) {
        inboxSweptAt = Date.now();
        await sweepInboxDigests().catch((error: unknown) => console.error("outbox: inbox digest round failed", error));
      }
      await drain("all");
    }),
    repeat(priorityIntervalMs, "priority mail", () => drain("priority")),
  ];
  return {
    async stop() {
      stopped = true;
      for (const wake of [...wakers]) wake();
      await Promise.all(loops);
    },
  };
}
