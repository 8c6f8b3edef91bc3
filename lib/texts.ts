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
//
// A shop texts in English and, if it says so in its settings (shops.sms_languages), Spanish and French.
// Each language has its own words and answers; an answer goes in the language of the word the owner
// sent. An opt-out word is honoured in every language we know, whatever the shop ticked: someone who
// asked to stop is never texted again because the shop didn't expect their language. START and HELP
// of a language the shop doesn't text in are read as a reply (a question on the owner's job, which
// lands in the desk inbox, where a person reads it).
// - es: ALTO (stop) and AYUDA (help) are the words carriers expect of Spanish-language US short codes,
//   answered in Spanish (Twilio, "Industry Standards for Spanish-language Short Code campaigns",
//   support.twilio.com article 223182348). INICIO (start) is listed as the Spanish START by an SMS
//   platform's reserved keywords (support.textizen.com, "Reserved Keywords"); no carrier guideline for it
//   was found. PARAR (stop): common carrier practice, no published source.
// - fr: ARRET (stop) and AIDE (help) are mandatory on Canadian short codes and answered in French (CWTA
//   Canadian Common Short Code Application Guidelines v3.9, as quoted by Infobip's "Canadian mandatory
//   keyword responses" and Twilio's "Mandatory keyword responses required in Canada"; the CWTA text
//   itself was not read). INFO, the fifth mandatory word, is English's already. No French opt-in word is
//   named there, so French has none: START, always on, opts back in, and the French answers say so.
// Matching ignores case and accents (ARRÊT = ARRET, "Ayuda" = AYUDA), spaces around and closing
// punctuation, Spanish opening marks (¡ ¿) too.

export const LANGUAGES = ["en", "es", "fr"] as const;
export type Language = (typeof LANGUAGES)[number];
/** The languages a shop may add to English, which it always texts in. */
export const EXTRA_LANGUAGES = ["es", "fr"] as const satisfies readonly Language[];
export const LANGUAGE_LABEL: Record<Language, string> = { en: "English", es: "Spanish", fr: "French" };
export type Keyword = "stop" | "start" | "help";

export const KEYWORDS: Record<Language, Record<Keyword, string[]>> = {
  en: {
    stop: ["STOP", "STOPALL", "END", "CANCEL", "UNSUBSCRIBE", "QUIT", "REVOKE", "OPTOUT", "OPT OUT"],
    start: ["START", "UNSTOP", "YES"],
    help: ["HELP", "INFO"],
  },
  es: {
    stop: ["ALTO", "PARAR"],
    start: ["INICIO"],
    help: ["AYUDA"],
  },
  fr: {
    stop: ["ARRÊT"],
    start: [],
    help: ["AIDE"],
  },
};

/** A whole message as a keyword is compared: no accents, upper case, single spaces, no closing (or Spanish opening) punctuation. */
export function keywordForm(text: string): string {
  return text
    .normalize("NFKD")
    .replace(/\p{M}/gu, "")
    .trim()
    .replace(/^[¡¿\s]+/u, "")
    .replace(/[.!?\s]+$/u, "")
    .replace(/\s+/g, " ")
    .toUpperCase();
}

/**
 * The languages a shop texts in, English first, from its `sms_languages` (MariaDB SET text, "en,es").
 * Unknown or missing values leave English alone.
 */
export function shopLanguages(shop: { sms_languages: string | null | undefined }): Language[] {
  const stored = new Set((shop.sms_languages ?? "").split(","));
  return LANGUAGES.filter((l) => l === "en" || stored.has(l));
}

/**
 * Whether a whole message (spaces, case, accents and closing punctuation aside) is a keyword in one of
 * `languages`, or an opt-out word in any language we know.
 */
export function keywordOf(body: string, languages: Language[], optedOut: boolean): { keyword: Keyword; language: Language } | null {
  const word = keywordForm(body);
  for (const language of languages) {
    for (const keyword of ["stop", "start", "help"] as const) {
      // "YES" opts back in only a number that is opted out; otherwise it is a reply to the shop.
      const words = KEYWORDS[language][keyword].filter((w) => keyword !== "start" || w !== "YES" || optedOut);
      if (words.some((w) => keywordForm(w) === word)) return { keyword, language };
    }
  }
  const stop = LANGUAGES.find((language) => KEYWORDS[language].stop.some((w) => keywordForm(w) === word));
  return stop ? { keyword: "stop", language: stop } : null;
}

type ShopContact = { name: string; phone: string | null; email: string | null };
/** "Call X or e-mail Y. ", in each language, or nothing when the shop gave neither. */
const reach = (s: ShopContact, call: string, or: string, write: string) => {
  const ways = [s.phone ? `${call} ${s.phone}` : null, s.email ? `${write} ${s.email}` : null].filter(Boolean);
  if (!ways.length) return "";
  const joined = ways.join(` ${or} `);
  return ` ${joined.charAt(0).toUpperCase()}${joined.slice(1)}.`;
};

// The Spanish and French answers are our own wording (checked by nobody whose first language it is:
// from memory, unverified), kept to letters of the GSM 7-bit alphabet (3GPP TS 23.038) where a word
// allowed it, so they don't fall back to the 70-character UCS-2 segments.
export const KEYWORD_REPLY: Record<Language, Record<Keyword, (shop: ShopContact) => string>> = {
  en: {
    stop: (s) => `${s.name}: you won't get more texts from us. Reply START to get them again.`,
    start: (s) => `${s.name}: texts about your jobs are on again. Reply STOP to stop, HELP for help. Message and data rates may apply.`,
    help: (s) => `${s.name}: texts about your repair jobs.${reach(s, "call", "or", "e-mail")} Reply STOP to stop. Message and data rates may apply.`,
  },
  es: {
    stop: (s) => `${s.name}: ya no le enviaremos mensajes. Responda INICIO para recibirlos de nuevo.`,
    start: (s) => `${s.name}: vuelve a recibir mensajes sobre sus trabajos. Responda ALTO para dejar de recibirlos, AYUDA para ayuda. Pueden aplicarse cargos por mensajes y datos.`,
    help: (s) => `${s.name}: mensajes sobre sus reparaciones.${reach(s, "llame al", "o", "escriba a")} Responda ALTO para dejar de recibirlos. Pueden aplicarse cargos por mensajes y datos.`,
  },
  fr: {
    stop: (s) => `${s.name}: vous ne recevrez plus de messages de notre part. Répondez START pour les recevoir à nouveau.`,
    start: (s) => `${s.name}: vous recevez à nouveau les messages sur vos travaux. Répondez ARRET pour ne plus les recevoir, AIDE pour de l'aide. Des frais de messages et de données peuvent s'appliquer.`,
    help: (s) => `${s.name}: messages sur vos réparations.${reach(s, "appelez le", "ou", "écrivez à")} Répondez ARRET pour ne plus les recevoir. Des frais de messages et de données peuvent s'appliquer.`,
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
