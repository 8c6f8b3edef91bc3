// Receiving mail, the way the hosted mail service does it: a reply to a message arrives as an
// inbound e-mail, announced to the app by an `email.received` webhook whose data carries the
// envelope only (`email_id`, from, to, subject, …; resend 6.38's `EmailReceivedEvent`); the app
// then fetches the body with `GET /emails/receiving/{id}` (the SDK's `emails.receiving.get`).
// Webhooks are signed as the hosted service signs them (Standard Webhooks, which the SDK's
// `webhooks.verify` checks): `svix-id`, `svix-timestamp` (unix seconds) and `svix-signature:
// v1,<base64 HMAC-SHA256 of "${id}.${timestamp}.${rawBody}">`, keyed with the base64 part of the
// `whsec_…` secret. Every retry keeps its id; only the timestamp and signature change.
import { createHmac, randomUUID } from "node:crypto";
import path from "node:path";
import { JsonStateStore, isObject } from "../shared/json-store";
import { type BaseDelivery, type DeliveryAttempt, type WebhookFlavour, type WebhookOptions, WebhookSender } from "../shared/webhooks";
import type { MailMessage } from "./types";

/** One received e-mail, as `GET /emails/receiving/{id}` answers it. */
export type InboundEmail = {
  object: "email";
  id: string;
  to: string[];
  from: string;
  created_at: string;
  subject: string;
  bcc: string[] | null;
  cc: string[] | null;
  reply_to: string[] | null;
  received_for: string[];
  html: string | null;
  text: string | null;
  headers: Record<string, string> | null;
  message_id: string;
  attachments: never[];
};

export type InboundDelivery = BaseDelivery & { id: string; event: { type: "email.received"; created_at: string; data: Record<string, unknown> } };

/** The Standard Webhooks signature of one attempt (what the SDK's `webhooks.verify` recomputes). */
export function standardSignature(secret: string, id: string, timestamp: number, rawBody: string): string {
  const key = Buffer.from(secret.startsWith("whsec_") ? secret.slice("whsec_".length) : secret, "base64");
  return `v1,${createHmac("sha256", key).update(`${id}.${timestamp}.${rawBody}`, "utf8").digest("base64")}`;
}

const FLAVOUR: WebhookFlavour<InboundDelivery> = {
  label: "mail fake",
  signatureHeader: "svix-signature",
  contentType: "application/json",
  userAgent: "Benchside mail fake (Svix-Webhooks)",
  body: (d) => JSON.stringify(d.event),
  newAttempt: (attempt: DeliveryAttempt) => attempt,
  describe: (d) => ({ type: d.event.type, eventId: d.id, objectId: String(d.event.data.email_id) }),
  signingHeaders: (d, rawBody, secret) => {
    const timestamp = Math.floor(Date.now() / 1000);
    return { "svix-id": d.id, "svix-timestamp": String(timestamp), "svix-signature": standardSignature(secret, d.id, timestamp, rawBody) };
  },
};

export class InboundStore extends JsonStateStore<InboundDelivery> {
  protected readonly label = "mail fake (inbound)";
  emails: InboundEmail[] = [];

  protected snapshot() {
    return { emails: this.emails, deliveries: this.deliveries };
  }

  protected restore(state: Record<string, unknown>) {
    if (Array.isArray(state.emails)) this.emails = state.emails.filter((e): e is InboundEmail => isObject(e) && typeof e.id === "string");
    if (Array.isArray(state.deliveries)) this.deliveries = state.deliveries.filter((d): d is InboundDelivery => isObject(d) && typeof d.id === "string" && isObject(d.event));
  }

  async wipe(): Promise<void> {
    this.emails = [];
    this.deliveries = [];
    await this.save();
  }

  get(id: string): InboundEmail | undefined {
    return this.emails.find((e) => e.id === id);
  }
}

export function openInbound(mailDir: string): Promise<InboundStore> {
  return InboundStore.open(path.join(mailDir, "inbound"));
}

export class InboundWebhooks extends WebhookSender<InboundDelivery> {
  constructor(private readonly inbound: InboundStore, opts: WebhookOptions) {
    super(inbound, opts, FLAVOUR);
  }

  /** Announces a received e-mail to the app. */
  announce(email: InboundEmail): InboundDelivery {
    const { id, created_at, from, to, bcc, cc, received_for, message_id, subject } = email;
    return this.record((state) => ({
      id: `msg_${randomUUID().replace(/-/g, "")}`,
      event: { type: "email.received", created_at: new Date().toISOString(), data: { email_id: id, created_at, from, to, bcc: bcc ?? [], cc: cc ?? [], received_for, message_id, subject, attachments: [] } },
      state,
      attempts: [],
    }));
  }

  get received(): InboundStore {
    return this.inbound;
  }
}

const quote = (text: string) =>
  text
    .split("\n")
    .map((line) => `> ${line}`)
    .join("\n");
const escape = (s: string) => s.replace(/[&<>"']/g, (ch) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[ch] ?? ch);

/**
 * The recipient of `original` answers it: from its first recipient, to its Reply-To (or its
 * sender), with the original quoted under the reply as mail programs do ("On …, … wrote:").
 */
export function replyTo(original: MailMessage, text: string, now = new Date()): InboundEmail | { error: string } {
  const from = original.to[0];
  const to = original.reply_to.length ? original.reply_to : [original.from];
  if (!from) return { error: "The message has no recipient to reply as." };
  const intro = `On ${original.created_at.slice(0, 10)}, ${original.from} wrote:`;
  const quoted = original.text ? `\n\n${intro}\n${quote(original.text)}` : "";
  return {
    object: "email",
    id: randomUUID(),
    to,
    from,
    created_at: now.toISOString(),
    subject: /^re:/i.test(original.subject) ? original.subject : `Re: ${original.subject}`,
    bcc: null,
    cc: null,
    reply_to: null,
    received_for: to,
    text: `${text}${quoted}`,
    html: `<div>${escape(text).replace(/\n/g, "<br>")}</div>${original.text ? `<div class="gmail_quote">${escape(intro)}<blockquote>${escape(original.text).replace(/\n/g, "<br>")}</blockquote></div>` : ""}`,
    headers: { "in-reply-to": `<${original.id}@mail-fake.benchside.test>` },
    message_id: `<${randomUUID()}@mail-fake.benchside.test>`,
    attachments: [],
  };
}
