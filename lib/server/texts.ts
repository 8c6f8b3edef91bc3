import "server-only";
import crypto from "node:crypto";
import { insertSignInLink } from "@/db/queries/sign-in";
import { getCustomerTextState, jobTextFacts, textSendFacts, setNotifyChannels, getShopTextSettings, grantTextConsent, insertText, revokeTextConsent, type ShopTextSettings } from "@/db/queries/texts";
import { type Tx, transaction } from "@/db/transaction";
import type { JobAccess } from "@/lib/server/access";
import type { Actor } from "@/lib/permissions";
import type { TextChoiceInput } from "@/lib/schemas/texts";
import { AppError } from "@/lib/errors";
import { appUrl, smsConfig } from "@/lib/server/config";
import { hashToken } from "@/lib/server/signed-token";
import { channelsFor, clockText, reminderTextKey, type ConsentHow, consentedNumber, noticeBody, noticeMessage, quietUntil, type TextNotice, toE164 } from "@/lib/texts";

// Texts to machine owners: consent, the owner's channel choice and queueing through the texts'
// outbox (lib/server/text-worker.ts sends). Every write runs in the caller's transaction, so a text
// exists exactly when the change that causes it commits.

/** The number a shop texts from: its own, else SMS_DEFAULT_FROM; null when texts can't go at all. */
export function senderOf(shop: Pick<ShopTextSettings, "sms_from">): string | null {
  const config = smsConfig();
  if (!config) return null;
  return shop.sms_from ?? config.defaultFrom;
}

/** Which channels a notice to this customer uses (their choice, and whether a text can reach them). */
export async function noticeChannels(tx: Tx, { shopId, customerId }: { shopId: number; customerId: number }): Promise<{ email: boolean; text: boolean }> {
  const [shop, customer] = await Promise.all([getShopTextSettings(tx, shopId), getCustomerTextState(tx, { shopId, customerId })]);
  if (!shop || !customer) return { email: true, text: false };
  return channelsFor(customer.notify_channels, senderOf(shop) !== null && consentedNumber(customer) !== null);
}

/** How a notice would reach the owner now, for the desk's "goes to" line: by e-mail (when chosen) and the number a text would go to (when chosen and agreed). */
export async function ownerReach({ shopId, customerId }: { shopId: number; customerId: number }): Promise<{ email: boolean; textTo: string | null }> {
  const { shop, customer } = await textSendFacts({ shopId, customerId });
  if (!shop || !customer) return { email: true, textTo: null };
  const to = consentedNumber(customer);
  const channels = channelsFor(customer.notify_channels, senderOf(shop) !== null && to !== null);
  return { email: channels.email, textTo: channels.text ? to : null };
}

export type QueuedText = { id: number; heldUntil: Date | null } | { id: null; why: string };

/**
 * Queues a notice to the job's owner if they can be texted (consent, a sender number); held to the end
 * of the shop's quiet hours when `now` falls inside them. Does not decide the owner's channel choice:
 * callers ask `noticeChannels` first.
 */
export async function queueNoticeText(
  tx: Tx,
  { shopId, jobId, customerId, notice, dedupeKey, now = new Date(), dueAt = null }: { shopId: number; jobId: number | null; customerId: number; notice: TextNotice; dedupeKey: string | null; now?: Date; dueAt?: Date | null },
): Promise<QueuedText> {
  const shop = await getShopTextSettings(tx, shopId);
  if (!shop) throw new AppError("not_found", `No shop ${shopId} to text for.`);
  const customer = await getCustomerTextState(tx, { shopId, customerId });
  if (!customer) throw new AppError("not_found", `No customer ${customerId} in shop ${shopId}.`);
  const from = senderOf(shop);
  const to = consentedNumber(customer);
  if (!from) return { id: null, why: "texts are not set up (no account or sender number)" };
  if (!to) return { id: null, why: "the owner has not agreed to texts, or opted out" };
  const quiet = { start: shop.sms_quiet_start, end: shop.sms_quiet_end };
  // A text due later (a reminder) is judged against quiet hours at the time it is due.
  const heldUntil = quietUntil(dueAt ?? now, shop.timezone, quiet);
  const id = await insertText(tx, {
    shopId,
    jobId,
    customerId,
    kind: notice.kind,
    purpose: "notice",
    to,
    from,
    body: noticeBody(shop.name, noticeMessage(notice)),
    sendAfter: heldUntil ?? dueAt,
    heldReason: heldUntil ? `quiet hours (${clockText(quiet.start)}–${clockText(quiet.end)}, shop time)` : null,
    dedupeKey,
  });
  return { id, heldUntil };
}

/** The owner agrees to texts at `phone` (typed at the desk or on their page; normalised to E.164). */
export async function recordTextConsent(tx: Tx, { shopId, customerId, phone, how, userId }: { shopId: number; customerId: number; phone: string; how: ConsentHow; userId: number | null }): Promise<string> {
  const shop = await getShopTextSettings(tx, shopId);
  if (!shop) throw new AppError("not_found", `No shop ${shopId}.`);
  const e164 = toE164(phone, shop.currency);
  if (!e164) {
    const message = "That number can't be texted: give it with its country code, such as +44 7700 900123.";
    throw new AppError("invalid", message, { phone: [message] });
  }
  if (!(await getCustomerTextState(tx, { shopId, customerId, lock: true }))) throw new AppError("not_found", "That customer doesn't exist.");
  await grantTextConsent(tx, { shopId, customerId, phone: e164, how, userId });
  return e164;
}

/** The owner withdraws consent on their own page. */
export async function withdrawTextConsent(tx: Tx, { shopId, customerId, userId }: { shopId: number; customerId: number; userId: number | null }): Promise<void> {
  const customer = await getCustomerTextState(tx, { shopId, customerId, lock: true });
  if (!customer) throw new AppError("not_found", "That customer doesn't exist.");
  const phone = consentedNumber(customer);
  if (phone) await revokeTextConsent(tx, { shopId, customerIds: [customerId], phone, how: "owner_page", userId });
}

/**
 * A text's link that signs the owner in and opens `nextPath` (an approval request): a sign-in link of
 * its own (sign_in_links, the same single-use redemption as the e-mailed ones) whose token is the whole
 * short path, /t/<token>. Opening it only shows a button (a link preview or scanner uses nothing up);
 * pressing it signs in once. It lasts TEXT_LINK_HOURS, longer than an asked-for e-mail link (20 minutes)
 * because a text is read when the owner gets to it; used or expired, the page offers the normal sign-in,
 * which comes back to the same request. Without an e-mail on record there is no account to sign in to,
 * so the text carries the request's plain address.
 */
export const TEXT_LINK_HOURS = 48;

export async function textLinkTo(tx: Tx, { email, nextPath }: { email: string | null; nextPath: string }): Promise<string> {
  if (!email) return `${appUrl()}${nextPath}`;
  const token = crypto.randomBytes(32).toString("base64url");
  await insertSignInLink(tx, { email: email.toLowerCase(), tokenHash: hashToken(token), ttlMinutes: TEXT_LINK_HOURS * 60, nextPath });
  return `${appUrl()}/t/${token}`;
}

/** An approval request by text, when the owner chose text (or both) and can be texted. */
export async function queueApprovalText(
  tx: Tx,
  r: { shopId: number; jobId: number; customerId: number; email: string | null; machine: string; answerPath: string; requestPublicId: string; now?: Date },
): Promise<QueuedText> {
  const link = await textLinkTo(tx, { email: r.email, nextPath: r.answerPath });
  return queueNoticeText(tx, { shopId: r.shopId, jobId: r.jobId, customerId: r.customerId, notice: { kind: "approval", machine: r.machine, link }, dedupeKey: `approval:${r.requestPublicId}`, now: r.now });
}

/**
 * The request's one reminder by text, as the e-mail has one (lib/server/approval-mail.ts): due after
 * the shop's reminder delay (then held to the morning if that falls in quiet hours), with a sign-in
 * link of its own, and dropped with the e-mail's when the request is answered or withdrawn.
 */
export async function queueApprovalReminderText(
  tx: Tx,
  r: { shopId: number; jobId: number; customerId: number; email: string | null; machine: string; answerPath: string; requestPublicId: string; delayHours: number; now?: Date },
): Promise<QueuedText> {
  const link = await textLinkTo(tx, { email: r.email, nextPath: r.answerPath });
  const due = new Date((r.now ?? new Date()).getTime() + r.delayHours * 3_600_000);
  return queueNoticeText(tx, { shopId: r.shopId, jobId: r.jobId, customerId: r.customerId, notice: { kind: "approval_reminder", machine: r.machine, link }, dedupeKey: reminderTextKey(r.requestPublicId), now: r.now, dueAt: due });
}

/** "Ready to collect" by text, when the job's status entry says so (db/queries/following.ts). */
export async function queueReadyText(tx: Tx, { shopId, jobId, entryId }: { shopId: number; jobId: number; entryId: number }): Promise<{ ownerEmail: boolean }> {
  const job = await jobTextFacts(tx, { shopId, jobId });
  if (!job) return { ownerEmail: true };
  const channels = await noticeChannels(tx, { shopId, customerId: job.customerId });
  if (!channels.text) return { ownerEmail: true };
  const link = await textLinkTo(tx, { email: job.email, nextPath: `/my/jobs/${job.publicId}` });
  await queueNoticeText(tx, { shopId, jobId, customerId: job.customerId, notice: { kind: "ready", machine: job.machine, link }, dedupeKey: `ready:${entryId}` });
  // Whether the owner also wants the e-mail (text only: the followers' e-mails still go).
  return { ownerEmail: channels.email };
}

/**
 * The owner's own page (/my/jobs/<job>/texts): their choice of e-mail, text or both, and for text their
 * consent with the number, recorded as given "on their own page" (a number already agreed to and not
 * withdrawn keeps its first record).
 */
export async function chooseTextsAs(actor: Actor, { job }: JobAccess, input: TextChoiceInput): Promise<{ channels: TextChoiceInput["channels"]; phone: string | null }> {
  return transaction(async (tx) => {
    const customer = await getCustomerTextState(tx, { shopId: job.shopId, customerId: job.customerId, lock: true });
    if (!customer) throw new AppError("not_found", "That job doesn't exist.");
    let phone = consentedNumber(customer);
    if (input.channels !== "email") {
      const shop = (await getShopTextSettings(tx, job.shopId))!;
      const wanted = toE164(input.phone, shop.currency);
      if (wanted !== phone) phone = await recordTextConsent(tx, { shopId: job.shopId, customerId: job.customerId, phone: input.phone ?? "", how: "owner_page", userId: actor.userId });
    }
    await setNotifyChannels(tx, { shopId: job.shopId, customerId: job.customerId, channels: input.channels });
    return { channels: input.channels, phone };
  });
}

/** "Stop texts" on the owner's page: consent withdrawn (logged), notices by e-mail. */
export async function stopTextsAs(actor: Actor, { job }: JobAccess): Promise<void> {
  await transaction(async (tx) => {
    await withdrawTextConsent(tx, { shopId: job.shopId, customerId: job.customerId, userId: actor.userId });
    await setNotifyChannels(tx, { shopId: job.shopId, customerId: job.customerId, channels: "email" });
  });
}
