// The message resource as the hosted API's 2010-04-01 Messages endpoint returns it (JSON, snake_case,
// RFC 2822 dates), plus what the fake keeps beside it. Inbound texts (a tester replying as the owner)
// are messages too, with direction "inbound".
import type { BaseDelivery } from "../shared/webhooks";

export type MessageStatus = "accepted" | "queued" | "sending" | "sent" | "delivered" | "undelivered" | "failed" | "receiving" | "received";

export type SmsMessage = {
  sid: string;
  account_sid: string;
  api_version: "2010-04-01";
  body: string;
  date_created: string;
  date_sent: string | null;
  date_updated: string;
  direction: "outbound-api" | "inbound";
  error_code: number | null;
  error_message: string | null;
  from: string;
  messaging_service_sid: string | null;
  num_media: string;
  num_segments: string;
  price: string | null;
  price_unit: string;
  status: MessageStatus;
  subresource_uris: Record<string, string>;
  to: string;
  uri: string;
};

/** What the fake keeps per message: the resource, and where its status callbacks go. */
export type StoredMessage = SmsMessage & { status_callback: string | null; created_ms: number };

/** How the next outbound messages end (POST /_fake/outcome). */
export type Outcome = "delivered" | "failed" | "undelivered";

/** A form POST to the app: a status callback about a message, or an inbound text. */
export type Delivery = BaseDelivery & {
  id: string;
  kind: "status" | "inbound";
  url: string | null;
  message_sid: string;
  params: Record<string, string>;
};
