import "server-only";
import twilio from "twilio";
import { type ClaimedText, claimTexts, holdText, markTextFailed, markTextSent, revokeTextConsent, textSendFacts } from "@/db/queries/texts";
import { type Tx, transaction } from "@/db/transaction";
import { reportUndeliveredText } from "@/lib/server/inbox";
import { smsClient, smsWebhookUrl } from "@/lib/server/sms";
import { clockText, consentedNumber, quietUntil } from "@/lib/texts";

// Sends what the texts' outbox holds, beside the mail (startOutboxWorker runs it each round). The
// SMS API takes no idempotency key, so duplicates are kept out another way: each text's status
// callback URL carries our row's reference, and a callback marks the row sent with the service's sid
// (db/queries/texts.ts applyTextDelivery). A send whose answer was lost is therefore not retried once
// its first callback arrives (seconds), well inside the retry back-off (OUTBOX_BACKOFF_BASE_MS, 30 s).

/** The recipient opted out at the carrier / the service (Twilio error 21610): never retried. */
const UNSUBSCRIBED = 21610;

export type TextRunSettings = { batchSize: number; leaseMs: number; maxAttempts: number; backoff: (attempt: number) => number };
/** A text given up on: dead, and the desk told (in one transaction, so neither happens without the other). */
async function giveUp(t: ClaimedText, error: string, code: number | null, also?: (tx: Tx) => Promise<void>): Promise<void> {
  await transaction(async (tx) => {
    await markTextFailed(t, { error, code, retryInMs: null }, tx);
    await also?.(tx);
    await reportUndeliveredText(tx, { shopId: t.shop_id, jobId: t.job_id, purpose: t.purpose, kind: t.kind, to: t.to_phone, error });
  });
}

export type TextRun = { claimed: number; sent: number; retrying: number; dead: number; held: number };

type Outcome = { ok: true; sid: string } | { ok: false; status: number | null; code: number | null; message: string };

async function send(t: ClaimedText): Promise<Outcome> {
  try {
    const message = await smsClient().messages.create({ to: t.to_phone, from: t.from_phone, body: t.body, statusCallback: smsWebhookUrl(`/api/webhooks/sms/status?ref=${t.ref}`) });
    return { ok: true, sid: message.sid };
  } catch (error) {
    if (error instanceof twilio.RestException) return { ok: false, status: error.status, code: error.code ?? null, message: error.message };
    return { ok: false, status: null, code: null, message: error instanceof Error ? error.message : String(error) };
  }
}

/** What stops a notice now, checked at send time: consent withdrawn since it was queued, or quiet hours. */
async function refusal(t: ClaimedText, now: Date): Promise<{ dead: string } | { holdUntil: Date; reason: string } | null> {
  if (t.purpose !== "notice") return null;
  const { shop, customer } = await textSendFacts({ shopId: t.shop_id, customerId: t.customer_id });
  if (!shop || !customer || consentedNumber(customer) !== t.to_phone) return { dead: "not sent: the owner opted out of texts (or changed number) after it was queued" };
  const quiet = { start: shop.sms_quiet_start, end: shop.sms_quiet_end };
  const until = quietUntil(now, shop.timezone, quiet);
  return until ? { holdUntil: until, reason: `quiet hours (${clockText(quiet.start)}–${clockText(quiet.end)}, shop time)` } : null;
}

export async function runTextsOnce(s: TextRunSettings, now: () => Date = () => new Date()): Promise<TextRun> {
  const batch = await claimTexts({ limit: s.batchSize, leaseMs: s.leaseMs });
  const run: TextRun = { claimed: batch.length, sent: 0, retrying: 0, dead: 0, held: 0 };
  for (const t of batch) {
    const stop = await refusal(t, now());
    if (stop && "dead" in stop) {
      await giveUp(t, stop.dead, null);
      run.dead++;
      continue;
    }
    if (stop) {
      await holdText(t, { until: stop.holdUntil, reason: stop.reason });
      run.held++;
      continue;
    }
    if (t.attempts > s.maxAttempts) {
      await giveUp(t, `no outcome recorded after ${t.attempts - 1} claims`, null);
      run.dead++;
      continue;
    }
    const outcome = await send(t);
    if (outcome.ok) {
      await markTextSent(t, outcome.sid);
      run.sent++;
      continue;
    }
    const error = `${outcome.status ?? "no status"} ${outcome.code ?? ""}: ${outcome.message}`.replace(/ +:/, ":");
    if (outcome.code === UNSUBSCRIBED && t.customer_id != null) {
      // The service refuses the number: record the opt-out so nothing more is queued for it.
      await giveUp(t, error, outcome.code, (tx) => revokeTextConsent(tx, { shopId: t.shop_id, customerIds: [t.customer_id!], phone: t.to_phone, how: "carrier", userId: null }));
      run.dead++;
      continue;
    }
    const retryable = outcome.status === null || outcome.status === 429 || outcome.status >= 500;
    const retry = retryable && t.attempts < s.maxAttempts;
    if (retry) {
      await markTextFailed(t, { error, code: outcome.code, retryInMs: s.backoff(t.attempts) });
      run.retrying++;
    } else {
      await giveUp(t, error, outcome.code);
      run.dead++;
    }
  }
  return run;
}
