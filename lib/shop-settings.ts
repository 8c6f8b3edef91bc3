// The shop settings' pure parts: weekdays and opening hours, the currencies the settings page
// offers, the statutory over-estimate rules it offers as presets, and time-zone checks. No I/O.
import { MoneyError, type ToleranceSetting, currencyDigits, inputText } from "@/lib/money";

export const WEEKDAYS = ["mon", "tue", "wed", "thu", "fri", "sat", "sun"] as const;
export type Weekday = (typeof WEEKDAYS)[number];
export const WEEKDAY_LABEL: Record<Weekday, string> = { mon: "Monday", tue: "Tuesday", wed: "Wednesday", thu: "Thursday", fri: "Friday", sat: "Saturday", sun: "Sunday" };
/** A day's hours as "HH:MM" on the shop's clock; null = closed that day. */
export type DayHours = { open: string; close: string } | null;
export type OpeningHours = Record<Weekday, DayHours>;

/**
 * Currencies a shop may keep its books in: ISO 4217 codes that lib/money.ts knows the minor
 * units of (currency-codes) and that Intl formats. A short list on purpose: the payments
 * service and the invoice layout were checked with these.
 */
export const SUPPORTED_CURRENCIES = ["USD", "CAD", "MXN", "GBP", "EUR", "CHF", "SEK", "NOK", "DKK", "PLN", "AUD", "NZD", "JPY", "ZAR"] as const;
export type SupportedCurrency = (typeof SUPPORTED_CURRENCIES)[number];
export function isSupportedCurrency(code: string): code is SupportedCurrency {
  return (SUPPORTED_CURRENCIES as readonly string[]).includes(code);
}

/** True for an IANA zone name the runtime knows ("America/Denver"), false for anything else. */
export function isTimeZone(name: string): boolean {
  if (!/^[A-Za-z_]+(?:\/[A-Za-z0-9_+-]+)*$/.test(name) || name.length > 64) return false;
  try {
    new Intl.DateTimeFormat("en-US", { timeZone: name });
    return true;
  } catch {
    return false;
  }
}

/** The zones offered in the picker (every zone the runtime lists). */
export function timeZoneChoices(): string[] {
  return typeof Intl.supportedValuesOf === "function" ? Intl.supportedValuesOf("timeZone") : ["UTC"];
}

/**
 * Over-estimate rules a shop may pick by name; amounts are in US dollars, so they are offered to
 * USD shops only. Values from REFERENCES §6: Florida §559.909 (greater of $10 or 10 %, capped at
 * $50) and Maryland Com. Law §14-1002(b) (10 %, no fixed amount, no cap).
 */
export const TOLERANCE_PRESETS = {
  florida: { label: "Florida §559.909: greater of $10 or 10 %, at most $50", setting: { kind: "greater_of", fixedMinor: 1000, percent: "10", capMinor: 5000 } },
  maryland: { label: "Maryland §14-1002(b): 10 %", setting: { kind: "greater_of", fixedMinor: 0, percent: "10", capMinor: null } },
} as const satisfies Record<string, { label: string; setting: ToleranceSetting }>;
export type TolerancePreset = keyof typeof TOLERANCE_PRESETS;
export const TOLERANCE_CHOICES = ["strict", "florida", "maryland", "custom"] as const;
export type ToleranceChoice = (typeof TOLERANCE_CHOICES)[number];

/** Which choice a stored setting is (a custom one that happens to equal a preset shows as the preset). */
export function toleranceChoice(setting: ToleranceSetting, currency: string): ToleranceChoice {
  if (setting.kind === "strict") return "strict";
  if (currency === "USD") {
    for (const [name, preset] of Object.entries(TOLERANCE_PRESETS) as [TolerancePreset, (typeof TOLERANCE_PRESETS)[TolerancePreset]][]) {
      const p = preset.setting;
      if (p.fixedMinor === setting.fixedMinor && Number(p.percent) === Number(setting.percent) && (p.capMinor ?? null) === (setting.capMinor ?? null)) return name;
    }
  }
  return "custom";
}

/** Opening hours as stored (JSON text or parsed) → a full week, unknown or broken days closed. */
export function readOpeningHours(stored: unknown): OpeningHours | null {
  const value = typeof stored === "string" ? safeJson(stored) : stored;
  if (!value || typeof value !== "object") return null;
  const out = {} as OpeningHours;
  for (const day of WEEKDAYS) {
    const d = (value as Record<string, unknown>)[day] as { open?: unknown; close?: unknown } | null | undefined;
    out[day] = d && typeof d.open === "string" && typeof d.close === "string" ? { open: d.open, close: d.close } : null;
  }
  return out;
}

function safeJson(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return null;
  }
}

/** Checks a currency is one we offer and lib/money.ts can count (throws MoneyError). */
export function assertCurrency(code: string): SupportedCurrency {
  if (!isSupportedCurrency(code)) throw new MoneyError(`Choose one of the listed currencies (got ${JSON.stringify(code)}).`);
  currencyDigits(code);
  return code;
}

/** Minor units → the plain text a settings field shows and parseMoney reads back ("1234.50", "1234,50" in a comma shop, "¥" shops "1234"). */
export function minorToInput(minor: number | null | undefined, currency: string): string {
  if (minor == null) return "";
  const digits = currencyDigits(currency);
  const text = String(Math.abs(minor)).padStart(digits + 1, "0");
  const body = digits ? `${text.slice(0, -digits)}.${text.slice(-digits)}` : text;
  return inputText(minor < 0 ? `-${body}` : body, currency);
}

/** "10.000000" (a DECIMAL column) → "10"; "8.250000" → "8.25". */
export function trimPercent(text: string): string {
  return text.includes(".") ? text.replace(/0+$/, "").replace(/\.$/, "") : text;
}
