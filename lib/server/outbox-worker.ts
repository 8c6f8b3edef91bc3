import "server-only";
import { type ClaimedMail, claimBatch, markFailed, markSent, releaseClaim } from "@/db/queries/outbox";
import { resend } from "@/lib/server/mail";
import { sweepNotifications } from "@/lib/server/notify-sweep";

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

/** Claims one batch and sends it, one mail at a time (the hosted API allows a few requests a second). */
export async function runOutboxOnce(overrides: Partial<OutboxSettings> = {}): Promise<OutboxRun> {
  const s = { ...outboxSettings(), ...overrides };
  const batch = await claimBatch({ limit: s.batchSize, leaseMs: s.leaseMs });
  const run: OutboxRun = { claimed: batch.length, sent: 0, retrying: 0, dead: 0, released: 0 };
  for (let i = 0; i < batch.length; i++) {
    const mail = batch[i]!;
    if (mail.attempts > s.maxAttempts) {
      // Claimed again and again with no outcome recorded: whatever stops its worker, stop here.
      await markFailed(mail, { error: `no outcome recorded after ${mail.attempts - 1} claims`, retryInMs: null });
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
    const retry = isRetryable(outcome) && mail.attempts < s.maxAttempts;
    const wait = Math.max(backoffMs(mail.attempts, s), outcome.retryAfterMs ?? 0);
    await markFailed(mail, { error, retryInMs: retry ? wait : null });
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

export type OutboxWorker = { stop(): Promise<void> };

/**
 * Every `intervalMs`: turn due notifications into mail (notify-sweep.ts), then send until the
 * outbox has nothing due. Errors are logged and the loop goes on; stop() waits for the round.
 */
export function startOutboxWorker({ intervalMs }: { intervalMs: number }): OutboxWorker {
  let stopped = false;
  let wake: (() => void) | null = null;
  const loop = (async () => {
    while (!stopped) {
      try {
        await sweepNotifications();
        const { batchSize } = outboxSettings();
        for (let run = await runOutboxOnce(); run.claimed === batchSize && !stopped; run = await runOutboxOnce());
      } catch (error) {
        console.error("outbox: round failed", error);
      }
      if (stopped) break;
      await new Promise<void>((resolve) => {
        const timer = setTimeout(resolve, intervalMs);
        wake = () => {
          clearTimeout(timer);
          resolve();
        };
      });
      wake = null;
    }
  })();
  return {
    async stop() {
      stopped = true;
      (wake as (() => void) | null)?.();
      await loop;
    },
  };
}
