// Form POSTs to the app as the hosted service sends them: a status callback to the message's own
// StatusCallback URL at each change (sent, delivered, undelivered, failed), and each inbound text to
// the number's incoming-message webhook. Signed with X-Twilio-Signature (signature.ts); retries and the
// delivery log are the shared sender's.
import { type WebhookFlavour, type WebhookOptions, WebhookSender } from "../shared/webhooks";
import { signFormBody } from "./signature";
import { newSid, type SmsStore } from "./store";
import type { Delivery, StoredMessage } from "./types";

const FLAVOUR: WebhookFlavour<Delivery> = {
  label: "sms fake",
  signatureHeader: "x-twilio-signature",
  contentType: "application/x-www-form-urlencoded; charset=utf-8",
  userAgent: "Benchside SMS fake",
  body: (delivery) => new URLSearchParams(delivery.params).toString(),
  newAttempt: (attempt) => attempt,
  describe: (delivery) => ({ type: delivery.kind, eventId: delivery.id, objectId: delivery.message_sid }),
  target: (delivery) => delivery.url,
  sign: signFormBody,
};

export class SmsWebhooks extends WebhookSender<Delivery> {
  constructor(
    store: SmsStore,
    private readonly options: WebhookOptions,
  ) {
    super(store, options, FLAVOUR);
  }

  /** A status callback for the message as it now stands; nothing when it named no StatusCallback. */
  status(message: StoredMessage): Delivery | null {
    if (!message.status_callback) return null;
    const params: Record<string, string> = {
      AccountSid: message.account_sid,
      ApiVersion: message.api_version,
      From: message.from,
      MessageSid: message.sid,
      MessageStatus: message.status,
      SmsSid: message.sid,
      SmsStatus: message.status,
      To: message.to,
    };
    if (message.error_code !== null) params.ErrorCode = String(message.error_code);
    return this.record((state) => ({ id: newSid("WH"), kind: "status", url: message.status_callback, message_sid: message.sid, params, state, attempts: [] }));
  }

  /** The incoming-message webhook for a text a tester sent as the owner. */
  inbound(message: StoredMessage): Delivery {
    const params: Record<string, string> = {
      AccountSid: message.account_sid,
      ApiVersion: message.api_version,
      Body: message.body,
      From: message.from,
      MessageSid: message.sid,
      NumMedia: "0",
      NumSegments: message.num_segments,
      SmsMessageSid: message.sid,
      SmsSid: message.sid,
      SmsStatus: "received",
      To: message.to,
    };
    return this.record((state) => ({ id: newSid("WH"), kind: "inbound", url: this.options.url ?? null, message_sid: message.sid, params, state, attempts: [] }));
  }
}
