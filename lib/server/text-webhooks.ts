import "server-only";
import {
  applyTextDelivery,
  customersByTextPhone,
  getShopTextSettings,
  grantTextConsent,
  inboundSeen,
  insertInbound,
  insertText,
  lastTextedOpenJob,
  latestOpenJob,
  lockTextByRef,
  recordStatusEvent,
  revokeTextConsent,
  shopsForNumber,
  shopsTextLanguages,
} from "@/db/queries/texts";
import { type Tx, transaction } from "@/db/transaction";
import { AppError } from "@/lib/errors";
import { smsConfig } from "@/lib/server/config";
import { reportUndeliveredText } from "@/lib/server/inbox";
import { recordOwnerQuestion } from "@/lib/server/questions";
import { verifySmsSignature } from "@/lib/server/sms";
import { KEYWORD_REPLY, type Keyword, keywordOf, LANGUAGES, type Language, shopLanguages, type TextDelivery } from "@/lib/texts";

// What the SMS service POSTs to us, form-encoded and signed with X-Twilio-Signature (checked by the
// SDK's validator against the URL as we published it). A forged or altered request is refused (401)
// and changes nothing. The signature carries no time, so a genuine request sent again is recognised by
// its content: a status already applied to a message (text_status_events) or an inbound sid already
// filed (text_inbound) answers 200 and changes nothing, as the service would otherwise retry it.

const SID = /^(SM|MM)[0-9a-f]{32}$/;
const REF = /^[0-9a-f]{32}$/;
const E164 = /^\+[1-9]\d{6,14}$/;
/** Statuses in the order a message goes through them; a callback never moves a text back. */
const RANK: Record<TextDelivery, number> = { queued: 0, sent: 1, delivered: 2, undelivered: 2, failed: 2 };

export type WebhookAnswer = { received: true; applied: boolean; duplicate?: boolean; ignored?: string };

function signedParams(req: Request, rawBody: string): Record<string, string> {
  const params = Object.fromEntries(new URLSearchParams(rawBody));
  if (!verifySmsSignature(req, params)) throw new AppError("unauthenticated", "The X-Twilio-Signature is missing or does not match this request.");
  return params;
}

function ignored(reason: string): WebhookAnswer {
  console.warn(`sms webhook ignored: ${reason}`);
  return { received: true, applied: false, ignored: reason };
}

/** POST /api/webhooks/sms/status?ref=… — a text's delivery status. */
export async function receiveTextStatus(req: Request, rawBody: string): Promise<WebhookAnswer> {
  if (!smsConfig()) throw new AppError("unavailable", "Texts are not configured (TWILIO_ACCOUNT_SID, TWILIO_AUTH_TOKEN).");
  const p = signedParams(req, rawBody);
  const ref = new URL(req.url).searchParams.get("ref") ?? "";
  const sid = p.MessageSid ?? "";
  const status = (p.MessageStatus ?? p.SmsStatus ?? "") as TextDelivery;
  if (!REF.test(ref) || !SID.test(sid)) return ignored(`status callback without our reference or a message sid (${ref || "-"}, ${sid || "-"})`);
  if (!(status in RANK)) return ignored(`status ${status} of ${sid}: not one we record`);
  const errorCode = p.ErrorCode && /^\d{1,6}$/.test(p.ErrorCode) ? Number(p.ErrorCode) : null;
  return transaction(async (tx) => {
    const text = await lockTextByRef(tx, ref);
    if (!text) return ignored(`status ${status} for an unknown text (${ref})`);
    if (text.provider_sid && text.provider_sid !== sid) return ignored(`status for ${sid}, but text ${text.id} is ${text.provider_sid}`);
    if (!(await recordStatusEvent(tx, { sid, status }))) return { received: true, applied: false, duplicate: true };
    if (text.delivery && RANK[status] <= RANK[text.delivery] && text.provider_sid) return { received: true, applied: false };
    await applyTextDelivery(tx, { id: text.id, sid, delivery: status, errorCode });
    if (status === "failed" || status === "undelivered") {
      await reportUndeliveredText(tx, { shopId: Number(text.shop_id), jobId: text.job_id == null ? null : Number(text.job_id), purpose: text.purpose, kind: text.kind, to: text.to_phone, error: `${status}${errorCode ? ` (error ${errorCode})` : ""}` });
    }
    return { received: true, applied: true };
  });
}

/** A keyword's answer, from the number they texted, at once (quiet hours are for notices, not answers). */
async function answerKeyword(tx: Tx, { shopId, customerId, keyword, language, to, from, sid }: { shopId: number; customerId: number | null; keyword: Keyword; language: Language; to: string; from: string; sid: string }) {
  const shop = await getShopTextSettings(tx, shopId);
  if (!shop) return;
  await insertText(tx, {
    shopId,
    jobId: null,
    customerId,
    kind: `keyword-${keyword}`,
    purpose: "keyword_reply",
    to,
    from,
    body: KEYWORD_REPLY[language][keyword]({ name: shop.name, phone: shop.phone, email: shop.email }),
    sendAfter: null,
    heldReason: null,
    dedupeKey: `keyword:${sid}`,
  });
}

/**
 * The languages whose keywords a text to this number is read in: those of the shops that answer it.
 * A carrier sees a number, not a shop, so on a number two shops share (the default sender) a word is a
 * keyword when either shop texts in its language.
 */
async function languagesOf(tx: Tx, shopIds: number[]): Promise<Language[]> {
  const shops = await shopsTextLanguages(tx, shopIds);
  const used = new Set<Language>(["en", ...shops.flatMap((s) => shopLanguages(s))]);
  return LANGUAGES.filter((l) => used.has(l));
}

/** POST /api/webhooks/sms/inbound — a text from an owner: a keyword, or a question on the job it answers. */
export async function receiveInboundText(req: Request, rawBody: string): Promise<WebhookAnswer> {
  const config = smsConfig();
  if (!config) throw new AppError("unavailable", "Texts are not configured (TWILIO_ACCOUNT_SID, TWILIO_AUTH_TOKEN).");
  const p = signedParams(req, rawBody);
  const [sid, from, to, body] = [p.MessageSid ?? "", p.From ?? "", p.To ?? "", (p.Body ?? "").slice(0, 1600)];
  if (!SID.test(sid) || !E164.test(from) || !E164.test(to)) return ignored(`inbound text without a message sid or E.164 numbers (${sid || "-"})`);
  return transaction(async (tx) => {
    if (await inboundSeen(tx, sid)) return { received: true, applied: false, duplicate: true };
    const shopIds = await shopsForNumber(tx, { to, defaultFrom: config.defaultFrom });
    const customers = await customersByTextPhone(tx, { shopIds, phone: from });
    const optedOut = customers.length > 0 && customers.every((c) => c.text_opt_out_at !== null);
    // The shops that answer: those that know this number; else the one shop whose own number it is.
    const answering = customers.length ? [...new Set(customers.map((c) => c.shop_id))] : shopIds.length === 1 ? shopIds : [];
    const found = keywordOf(body, await languagesOf(tx, answering), optedOut);
    const first = (shopId: number) => customers.find((c) => c.shop_id === shopId)?.id ?? null;

    if (found) {
      for (const shopId of answering) {
        const mine = customers.filter((c) => c.shop_id === shopId);
        if (found.keyword === "stop") {
          const ids = mine.filter((c) => c.text_opt_out_at === null).map((c) => c.id);
          await revokeTextConsent(tx, { shopId, customerIds: ids, phone: from, how: "stop_keyword", userId: null });
        }
        if (found.keyword === "start") for (const c of mine) await grantTextConsent(tx, { shopId, customerId: c.id, phone: from, how: "start_keyword", userId: null });
        // After STOP one confirmation goes; a START from a number we never had consent for gets none.
        if (found.keyword !== "start" || mine.length) await answerKeyword(tx, { shopId, customerId: first(shopId), keyword: found.keyword, language: found.language, to: from, from: to, sid: `${sid}:${shopId}` });
      }
      await insertInbound(tx, { sid, shopId: answering[0] ?? null, customerId: answering[0] ? first(answering[0]) : null, jobId: null, from, to, body, filed: found.keyword });
      return { received: true, applied: true };
    }

    const listening = customers.filter((c) => c.text_opt_out_at === null).map((c) => ({ shopId: c.shop_id, customerId: c.id }));
    // The job the owner is answering: that of the last text we sent them from this number, while the
    // job is open; else (no text about an open job went from it) their newest open job.
    const job = body.trim() ? ((await lastTextedOpenJob(tx, { customers: listening, ownerPhone: from, senderPhone: to })) ?? (await latestOpenJob(tx, listening))) : null;
    if (!job) {
      await insertInbound(tx, { sid, shopId: answering[0] ?? null, customerId: answering[0] ? first(answering[0]) : null, jobId: null, from, to, body, filed: "unmatched" });
      return ignored(`inbound text ${sid} from a number with no open job here: kept unmatched`);
    }
    await recordOwnerQuestion(tx, { shopId: job.shopId, jobId: job.jobId, customerId: job.customerId, body, via: "sms", sourceRef: sid });
    await insertInbound(tx, { sid, shopId: job.shopId, customerId: job.customerId, jobId: job.jobId, from, to, body, filed: "question" });
    return { received: true, applied: true };
  });
}
