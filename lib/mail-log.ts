// A job's sent log (what the shop sent to whom, and whether it went), in words for the desk.
// Pure: the rows come from db/queries/mail-log.ts.

/** How a message went out: e-mail (outbox) or text (text_outbox, migration 34), in the same list. */
export type MessageChannel = "email" | "text";

export const CHANNEL_LABEL: Record<MessageChannel, string> = { email: "E-mail", text: "Text message" };

export type SentMessage = {
  channel: MessageChannel;
  id: number;
  kind: string;
  to: string;
  subject: string;
  state: "queued" | "sending" | "retrying" | "sent" | "dead";
  attempts: number;
  lastError: string | null;
  /** The mail service's id for the message once it took it: what to quote to the service. */
  providerId: string | null;
  queuedAt: Date;
  sentAt: Date | null;
  /** The next try, a scheduled send (a reminder), or the end of a sending lease. */
  nextAttemptAt: Date;
  sendBefore: Date | null;
  /** Texts: what the carrier reported (delivered, undelivered…), and why a text waits (quiet hours). */
  delivery?: "queued" | "sent" | "delivered" | "undelivered" | "failed" | null;
  heldReason?: string | null;
};

/** What each kind of mail is, as the desk would say it (kinds are set by the code that queues them). */
export const MAIL_KIND_LABEL: Record<string, string> = {
  progress: "Updates",
  daily: "Daily digest",
  ready: "Ready to collect",
  "approval-request": "Owner asked for an OK (to followers)",
  approval: "Approval request",
  "approval-reminder": "Approval reminder",
  "parts-in": "Parts are in",
  invitation: "Invitation to follow",
  invoice: "Invoice",
  deposit: "Deposit request",
  receipt: "Receipt",
  "portfolio-consent": "Portfolio consent request",
  "dropoff-authorisation": "Drop-off authorisation to sign",
  "question-answer": "Answer to the owner's question",
  inbox: "Desk inbox alert (staff)",
  "keyword-stop": "Text: opt-out confirmed",
  "keyword-start": "Text: opt-in confirmed",
  "keyword-help": "Text: help answer",
  answer: "Answer to a question",
  "inbox-digest": "Desk inbox digest (staff)",
};

/** A kind's label; a kind added later without one reads as its own words ("parts-late" → "Parts late"). */
export function mailKindLabel(kind: string): string {
  const known = MAIL_KIND_LABEL[kind];
  if (known) return known;
  const words = kind.replace(/[-_]+/g, " ").trim();
  return words ? words.charAt(0).toUpperCase() + words.slice(1) : "E-mail";
}

export type MessageStateTone = "moss" | "oil" | "signal" | "rust";

/** "1 try", "5 tries". */
export const triesText = (attempts: number) => `${attempts} ${attempts === 1 ? "try" : "tries"}`;

/**
 * Where a message stands, in a word or two (short enough for a badge on a 320 px phone), with
 * the tone of its badge; the page says the rest (tries, error, times) beside it.
 */
export function messageState(m: Pick<SentMessage, "state" | "nextAttemptAt">, now: Date): { label: string; tone: MessageStateTone; icon: "sent" | "waiting" | "retrying" | "failed" } {
  switch (m.state) {
    case "sent":
      return { label: "Sent", tone: "moss", icon: "sent" };
    case "dead":
      return { label: "Not sent", tone: "rust", icon: "failed" };
    case "retrying":
      return { label: "Retrying", tone: "signal", icon: "retrying" };
    case "sending":
      return { label: "Sending now", tone: "oil", icon: "waiting" };
    default:
      // A reminder waits for its hour; anything else is about to go.
      return m.nextAttemptAt.getTime() > now.getTime() + 60_000 ? { label: "Scheduled", tone: "oil", icon: "waiting" } : { label: "Waiting to send", tone: "oil", icon: "waiting" };
  }
}
