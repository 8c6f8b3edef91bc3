import "server-only";
import EmailReplyParser from "email-reply-parser";
import { z } from "zod";
import { firstMailWebhookDelivery, jobByReplyToken, questionJobFacts } from "@/db/queries/questions";
import { transaction } from "@/db/transaction";
import { AppError } from "@/lib/errors";
import { bareAddress, tokenOfAddress } from "@/lib/questions";
import { resend } from "@/lib/server/mail";
import { recordOwnerQuestion } from "@/lib/server/questions";

// Replies by e-mail (issue 21 §4). The mail service announces a received e-mail with a signed
// `email.received` webhook that carries the envelope only; we verify the signature with the SDK
// (`webhooks.verify`: Standard Webhooks, 5-minute tolerance), read the job from the reply-to token
// in the address it was sent to (never from the subject), fetch the text with
// `emails.receiving.get`, cut the quoted original off, and file it as the owner's question, once
// per delivery (the delivery id is recorded in the question's transaction) and once per e-mail.

const eventSchema = z.object({
  type: z.string(),
  data: z.object({ email_id: z.string().min(1).max(100), to: z.array(z.string()).max(50), from: z.string().max(500) }).passthrough(),
});

export type MailWebhookAnswer = { received: true; duplicate: boolean; applied: boolean; ignored?: string };

function header(headers: Headers, name: string): string | null {
  // The hosted service sends svix-*; Standard Webhooks names them webhook-*.
  return headers.get(`svix-${name}`) ?? headers.get(`webhook-${name}`);
}

/** The verified event, or 401 for a missing, wrong, altered or stale signature. */
export function verifyMailWebhook(rawBody: string, headers: Headers): unknown {
  const secret = process.env.RESEND_WEBHOOK_SECRET;
  if (!secret) throw new AppError("unavailable", "Mail webhooks are not configured (RESEND_WEBHOOK_SECRET).");
  const id = header(headers, "id");
  const timestamp = header(headers, "timestamp");
  const signature = header(headers, "signature");
  if (!id || !timestamp || !signature) throw new AppError("unauthenticated", "The webhook signature is missing, wrong or too old.");
  try {
    return resend().webhooks.verify({ payload: rawBody, headers: { id, timestamp, signature }, webhookSecret: secret });
  } catch {
    throw new AppError("unauthenticated", "The webhook signature is missing, wrong or too old.");
  }
}

/** What the owner wrote, without the quoted mail under it ("On …, … wrote:", "> …" lines, signatures' "--"). */
export function replyText(text: string): string {
  return new EmailReplyParser().parseReply(text.replace(/\r\n?/g, "\n")).trim();
}

/** The plain text of an HTML-only reply: tags dropped, quoted blocks first. Good enough for a question. */
function htmlText(html: string): string {
  return html
    .replace(/<blockquote[\s\S]*?<\/blockquote>/gi, "")
    .replace(/<br\s*\/?>/gi, "\n")
    .replace(/<\/(p|div)>/gi, "\n")
    .replace(/<[^>]+>/g, "")
    .replace(/&nbsp;/g, " ")
    .replace(/&lt;/g, "<")
    .replace(/&gt;/g, ">")
    .replace(/&quot;/g, '"')
    .replace(/&#39;/g, "'")
    .replace(/&amp;/g, "&");
}

function ignored(reason: string, duplicate = false): MailWebhookAnswer {
  console.warn(`mail webhook ignored: ${reason}`);
  return { received: true, duplicate, applied: false, ignored: reason };
}

/** POST /api/webhooks/mail. A signed event we can't use is acknowledged (200) and changes nothing. */
export async function receiveMailWebhook(rawBody: string, headers: Headers): Promise<MailWebhookAnswer> {
  const parsed = eventSchema.safeParse(verifyMailWebhook(rawBody, headers));
  const deliveryId = header(headers, "id")!;
  if (!parsed.success) return ignored(`unusable mail event ${deliveryId}`);
  const event = parsed.data;
  if (event.type !== "email.received") return ignored(`mail event ${deliveryId} of type ${event.type}: not one we act on`);
  const token = event.data.to.map(tokenOfAddress).find((t) => t !== null) ?? null;
  const job = token ? await jobByReplyToken(token) : null;
  if (!job) return ignored(`received e-mail ${event.data.email_id} is not to a job's reply address`);

  // Outside the transaction: a network call. A failure answers 503 so the service delivers again.
  const { data: email, error } = await resend().emails.receiving.get(event.data.email_id);
  if (error || !email) throw new AppError("unavailable", "The received e-mail couldn't be fetched from the mail service; deliver it again later.");
  const body = replyText(email.text ?? htmlText(email.html ?? ""));

  return transaction(async (tx) => {
    if (!(await firstMailWebhookDelivery(tx, { eventId: deliveryId, type: event.type }))) return { received: true, duplicate: true, applied: false };
    const facts = await questionJobFacts(tx, job);
    // Only the owner's own address files a question: a reply-to address passed on is not a key to the job.
    if (!facts?.customerEmail || bareAddress(email.from) !== facts.customerEmail.toLowerCase()) return ignored(`received e-mail ${email.id} is not from the job's owner`);
    if (!body) return ignored(`received e-mail ${email.id} has no text above the quoted mail`);
    await recordOwnerQuestion(tx, { ...job, customerId: facts.customerId, body, via: "email", sourceRef: `mail:${email.id}` });
    return { received: true, duplicate: false, applied: true };
  });
}
