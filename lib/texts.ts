// Text messages to machine owners, the pure part: numbers, consent words, keywords per language,
// quiet hours on the shop's clock and the wording of each text. Zod-free (client pages may import it).

export const NOTIFY_CHANNELS = ["email", "text", "both"] as const;
export type NotifyChannels = (typeof NOTIFY_CHANNELS)[number];
export const NOTIFY_CHANNEL_LABEL: Record<NotifyChannels, string> = { email: "E-mail", text: "Text message", both: "E-mail and text" };

export type ConsentHow = "check_in" | "owner_page" | "start_keyword";
export type OptOutHow = "stop_keyword" | "owner_page" | "carrier";
export const CONSENT_HOW_LABEL: Record<ConsentHow | OptOutHow, string> = {
  check_in: "at check-in, at the desk",
  owner_page: "on their own page",
  start_keyword: "by texting START",
  stop_keyword: "by texting STOP",
  carrier: "refused by their carrier (opted out there)",
};
export type TextDelivery = "queued" | "sent" | "delivered" | "undelivered" | "failed";
export type TextFiled = "stop" | "start" | "help" | "question" | "unmatched";

/** What the owner agreed to, stated where consent is asked (check-in and the owner's page). */
export const CONSENT_WORDING =
  "Text me about this shop's work on my machines (approval requests, ready to collect, invoices, answers to my questions). Reply STOP to stop, HELP for help. Message and data rates may apply.";

/** The number a customer may be texted at now: consent given, not withdrawn since. */
export function consentedNumber(c: { text_consent_phone: string | null; text_consent_at: Date | null; text_opt_out_at: Date | null }): string | null {
  return c.text_consent_phone && c.text_consent_at && !c.text_opt_out_at ? c.text_consent_phone : null;
}

/** Whether e-mail and text go for a notice, given the owner's choice and whether a text can reach them. */
export function channelsFor(choice: NotifyChannels, textPossible: boolean): { email: boolean; text: boolean } {
  const text = choice !== "email" && textPossible;
  // An owner who chose text only but can't be texted (no consent, opted out, no number) still gets e-mail.
  return { text, email: choice !== "text" || !text };
}

/**
 * A phone number as typed, in E.164 (ITU-T E.164 §6: "+", country code, at most 15 digits), or null.
 * Numbers without "+" or "00" are read as North American only for shops in a NANP country (USD, CAD:
 * NXX-NXX-XXXX, N = 2–9, per the North American Numbering Plan); elsewhere the country code is needed.
 */
export function toE164(raw: string | null | undefined, currency: string): string | null {
  if (!raw) return null;
  const trimmed = raw.trim();
  if (/[^\d\s()+.\-/]/.test(trimmed)) return null;
  const digits = trimmed.replace(/\D/g, "");
  if (trimmed.startsWith("+")) return /^[1-9]\d{7,14}$/.test(digits) ? `+${digits}` : null;
  if (trimmed.startsWith("00")) return /^00[1-9]\d{7,14}$/.test(digits) ? `+${digits.slice(2)}` : null;
  if (currency === "USD" || currency === "CAD") {
    const national = digits.length === 11 && digits.startsWith("1") ? digits.slice(1) : digits;
    return /^[2-9]\d{2}[2-9]\d{6}$/.test(national) ? `+1${national}` : null;
  }
  return null;
}

// ---- keywords --------------------------------------------------------------------------------
// CTIA Messaging Principles and Best Practices (2019 edition, §5.1.2 opt-in, §5.1.3 opt-out and HELP):
// senders honour the standard opt-out words and answer HELP with who they are and how to reach them;
// one confirmation may follow an opt-out, then nothing until the person opts in again. The words are
// the standard set (STOP, END, CANCEL, UNSUBSCRIBE, QUIT, STOPALL; START, UNSTOP; HELP, INFO) plus
// REVOKE and OPT OUT, which 47 CFR § 64.1200(a)(12) also names — section numbers from memory, unverified.
// Shops have no language setting today: every shop uses English only. The lists are kept per language
// so a shop language adds its own words and answers here.

export type Language = "en";
export type Keyword = "stop" | "start" | "help";

export const KEYWORDS: Record<Language, Record<Keyword, string[]>> = {
  en: {
    stop: ["STOP", "STOPALL", "END", "CANCEL", "UNSUBSCRIBE", "QUIT", "REVOKE", "OPTOUT", "OPT OUT"],
    start: ["START", "UNSTOP", "YES"],
    help: ["HELP", "INFO"],
  },
};

/** The languages a shop texts in. Shops have no language setting yet, so English only. */
export function shopLanguages(): Language[] {
  return ["en"];
}

/** Whether a whole message (spaces, case and trailing punctuation aside) is a keyword in one of `languages`. */
export function keywordOf(body: string, languages: Language[], optedOut: boolean): { keyword: Keyword; language: Language } | null {
  const word = body
    .normalize("NFKC")
    .trim()
    .replace(/[.!?\s]+$/u, "")
    .replace(/\s+/g, " ")
    .toUpperCase();
  for (const language of languages) {
    for (const keyword of ["stop", "start", "help"] as const) {
      // "YES" opts back in only a number that is opted out; otherwise it is a reply to the shop.
      const words = KEYWORDS[language][keyword].filter((w) => keyword !== "start" || w !== "YES" || optedOut);
      if (words.includes(word)) return { keyword, language };
    }
  }
  return null;
}

export const KEYWORD_REPLY: Record<Language, Record<Keyword, (shop: { name: string; phone: string | null; email: string | null }) => string>> = {
  en: {
    stop: (s) => `${s.name}: you won't get more texts from us. Reply START to get them again.`,
    start: (s) => `${s.name}: texts about your jobs are on again. Reply STOP to stop, HELP for help. Message and data rates may apply.`,
    help: (s) =>
      `${s.name}: texts about your repair jobs.${s.phone ? ` Call ${s.phone}` : ""}${s.email ? `${s.phone ? " or" : ""} e-mail ${s.email}` : ""}. Reply STOP to stop. Message and data rates may apply.`,
  },
};

// ---- quiet hours -------------------------------------------------------------------------------
// Default 21:00–08:00 on the shop's clock, from 47 CFR § 64.1200(c)(1) (no telephone solicitation
// before 8 a.m. or after 9 p.m. local time). That rule is about marketing; holding service texts to
// it is common carrier practice, no published source.
export const DEFAULT_QUIET = { start: 21 * 60, end: 8 * 60 } as const;

function localMinutes(now: Date, timeZone: string): { minutes: number; seconds: number } {
  const parts = new Intl.DateTimeFormat("en-US", { timeZone, hourCycle: "h23", hour: "2-digit", minute: "2-digit", second: "2-digit" }).formatToParts(now);
  const get = (type: Intl.DateTimeFormatPartTypes) => Number(parts.find((p) => p.type === type)?.value);
  return { minutes: get("hour") * 60 + get("minute"), seconds: get("second") };
}

/** Whether a minute of the day falls in [start, end), the window wrapping midnight when start > end. */
export function inQuietWindow(minute: number, start: number, end: number): boolean {
  if (start === end) return false;
  return start < end ? minute >= start && minute < end : minute >= start || minute < end;
}

/**
 * When a text may go: null now, else the end of the quiet hours on the shop's clock. Across a clock
 * change the computed morning may be an hour off; the worker checks again before sending.
 */
export function quietUntil(now: Date, timeZone: string, quiet: { start: number; end: number }): Date | null {
  const { minutes, seconds } = localMinutes(now, timeZone);
  if (!inQuietWindow(minutes, quiet.start, quiet.end)) return null;
  const wait = (quiet.end - minutes + 1440) % 1440;
  return new Date(now.getTime() - (now.getTime() % 1000) - seconds * 1000 + wait * 60_000);
}

/** "21:00". */
export const clockText = (minutes: number) => `${String(Math.floor(minutes / 60)).padStart(2, "0")}:${String(minutes % 60).padStart(2, "0")}`;

/** "21:00" → 1260, or null. */
export function parseClock(text: string): number | null {
  const m = /^([01]?\d|2[0-3]):([0-5]\d)$/.exec(text.trim());
  return m ? Number(m[1]) * 60 + Number(m[2]) : null;
}

// ---- wording -----------------------------------------------------------------------------------

/** Every text starts with the shop's name and ends with how to stop them (CTIA, as above). */
export function noticeBody(shopName: string, message: string): string {
  const name = shopName.replace(/\s+/g, " ").trim();
  return `${name}: ${message.replace(/\s+/g, " ").trim()} Reply STOP to stop.`;
}

/** The dedupe key of a request's reminder text: the one the send queues and the answer drops. */
export const reminderTextKey = (requestPublicId: string) => `approval-reminder:${requestPublicId}`;

export type TextNotice =
  | { kind: "approval"; machine: string; link: string }
  | { kind: "approval_reminder"; machine: string; link: string }
  | { kind: "ready"; machine: string; link: string }
  | { kind: "invoice"; machine: string; total: string; link: string }
  | { kind: "answer"; machine: string; excerpt: string; link: string };

export function noticeMessage(n: TextNotice): string {
  switch (n.kind) {
    case "approval":
      return `Work on your ${n.machine} needs your OK. See it and answer here: ${n.link}`;
    case "approval_reminder":
      return `Reminder: work on your ${n.machine} is still waiting for your OK. See it and answer here: ${n.link}`;
    case "ready":
      return `Your ${n.machine} is ready to collect. Details: ${n.link}`;
    case "invoice":
      return `The invoice for your ${n.machine} is ready (${n.total}). View or pay: ${n.link}`;
    case "answer": {
      const excerpt = n.excerpt.length > 140 ? `${n.excerpt.slice(0, 139).trimEnd()}…` : n.excerpt;
      return `About your ${n.machine}: "${excerpt}" More: ${n.link}`;
    }
  }
}
