// The one reader of numbers people type (money, torque, readings, chain), shared by server and
// browser. Pure: no zod, no I/O. Lexical rules, decided once here:
// - A mark a shop's style uses for grouping must group well (1–3 digits, then groups of exactly 3);
//   a space, no-break space or apostrophe is always a grouping mark and must group well too.
// - Text with both "." and ",": the last one is the decimal mark (appearing once), the other groups.
// - One "." or "," alone can be a decimal mark or a grouping mark. When both readings are possible
//   ("1,200") the shop's style decides if it firmly names that mark (en-US: "," groups → 1200;
//   da-DK: "," is decimal → 1.2); a style that does not (Canadian-dollar shops, where both
//   habits meet) refuses the text and shows both readings. Never guessed.
// - A shop's grouping mark used as a decimal mark ("1,2" in en-US) is refused with the spelling
//   to use, not read as 1.2: whoever types it would type "1,200" for 1.2 next.
// Numbers come back with their canonical text ("-1200.50": point, no grouping) and the number of
// decimals typed, since trailing zeros carry an instrument's resolution.

export type NumberStyle = {
  /** The BCP 47 locale the marks come from (Intl.NumberFormat), also used to format. */
  locale: string;
  decimal: "." | ",";
  /** The grouping mark: the other of "." / ",", or a space / apostrophe that can't be a decimal. */
  group: string;
  /** False when the shop's customers and staff write both conventions: a lone mark + 3 digits is refused. */
  firm: boolean;
};

const SPACES = /[ \u00a0\u202f\u2009]/g;
const APOSTROPHES = /['\u2019]/g;

/** The marks Intl.NumberFormat uses for `locale` (Node ships full ICU). */
export function styleOfLocale(locale: string, firm = true, groupOverride?: string): NumberStyle {
  const parts = new Intl.NumberFormat(locale).formatToParts(1234567.5);
  const decimal = parts.find((p) => p.type === "decimal")?.value === "," ? "," : ".";
  const group = groupOverride ?? parts.find((p) => p.type === "group")?.value ?? " ";
  return { locale, decimal, group, firm };
}

/**
 * The style a shop's numbers are read in, from the currency it keeps its books in (the shop
 * settings hold no locale yet): the locale of the country the currency belongs to. The euro is
 * written with a decimal comma in nearly all of its countries (fr-FR's marks: comma, space
 * groups, so "1.200" is refused there); Ireland and Malta write a point and need a shop setting
 * for it (not built yet). CAD spans English and French Canada, so those shops group with a space
 * (ISO 80000-1 and the SI Brochure group digits with a thin space, never a point or comma — from
 * memory, unverified) and a lone "1,200" / "1.200" is refused.
 */
const CURRENCY_LOCALE: Record<string, { locale: string; firm?: false; group?: string }> = {
  USD: { locale: "en-US" },
  MXN: { locale: "es-MX" },
  GBP: { locale: "en-GB" },
  AUD: { locale: "en-AU" },
  NZD: { locale: "en-NZ" },
  JPY: { locale: "ja-JP" },
  CHF: { locale: "de-CH" },
  DKK: { locale: "da-DK" },
  SEK: { locale: "sv-SE" },
  NOK: { locale: "nb-NO" },
  PLN: { locale: "pl-PL" },
  ZAR: { locale: "en-ZA" },
  EUR: { locale: "fr-FR" },
  CAD: { locale: "en-CA", firm: false, group: "\u00a0" },
};
export const STYLE_LOCALES = Object.values(CURRENCY_LOCALE).map((c) => c.locale);

/**
 * For a form read before its shop is known (check-in): both conventions, no firm decimal mark, so
 * only text every convention reads the same way is taken (CAD's style).
 */
export const neutralStyle = () => numberStyleFor("CAD");

const cache = new Map<string, NumberStyle>();
export function numberStyleFor(currency: string | null | undefined): NumberStyle {
  const code = (currency ?? "USD").toUpperCase();
  let style = cache.get(code);
  if (!style) {
    const c = CURRENCY_LOCALE[code] ?? CURRENCY_LOCALE.USD!;
    style = styleOfLocale(c.locale, c.firm ?? true, c.group);
    cache.set(code, style);
  }
  return style;
}

/** "1,234.5" / "1 234,5": what the shop's fields show as an example. */
export function exampleIn(style: NumberStyle): string {
  return `1${style.group === "\u00a0" || style.group === "\u202f" ? " " : style.group}234${style.decimal}5`;
}

export type NumberRules = { what?: string; min?: number; max?: number; allowNegative?: boolean; maxDecimals?: number };
export type ParsedNumber = { ok: true; value: number; canonical: string; decimals: number };
export type NumberRefusal = { ok: false; message: string; readings: number[] };

type Reading = { negative: boolean; int: string; frac: string | null };

const groupsWell = (int: string, sep: string) => new RegExp(`^[1-9]\\d{0,2}(?:${sep}\\d{3})+$`).test(int);
const esc = (c: string) => c.replace(/[.]/g, "\\.");

/** Every reading of `body` (no sign, marks normalised to "." "," " " "'") the lexical rules allow. */
function readings(body: string, style: NumberStyle): { list: Reading[]; foreign: Reading | null } {
  const dots = body.split(".").length - 1;
  const commas = body.split(",").length - 1;
  const gaps = /[ ']/.test(body);
  const plainGroups = (int: string) => (/[ ']/.test(int) ? groupsWell(int.replace(/'/g, " "), " ") && !/ .*'|'.* /.test(int) : /^\d+$/.test(int));
  const asDecimal = (mark: "." | ",", group: string | null): Reading | null => {
    const at = body.lastIndexOf(mark);
    const [int, frac] = [body.slice(0, at), body.slice(at + 1)];
    if (!/^\d+$/.test(frac)) return null;
    if (int === "") return { negative: false, int: "0", frac };
    const clean = group ? (groupsWell(int, esc(group)) ? int.split(group).join("") : /^\d+$/.test(int) ? int : null) : plainGroups(int) ? int.replace(/[ ']/g, "") : null;
    return clean == null ? null : { negative: false, int: clean, frac };
  };
  const asGroups = (mark: "." | ","): Reading | null => (!gaps && groupsWell(body, esc(mark)) ? { negative: false, int: body.split(mark).join(""), frac: null } : null);

  if (dots === 0 && commas === 0) return { list: plainGroups(body) && body !== "" ? [{ negative: false, int: body.replace(/[ ']/g, ""), frac: null }] : [], foreign: null };
  if (dots > 0 && commas > 0) {
    const mark = body.lastIndexOf(".") > body.lastIndexOf(",") ? "." : ",";
    const other = mark === "." ? "," : ".";
    if ((mark === "." ? dots : commas) !== 1 || gaps) return { list: [], foreign: null };
    const r = asDecimal(mark, other);
    return mark === style.group && r ? { list: [], foreign: r } : { list: r ? [r] : [], foreign: null };
  }
  const mark = dots > 0 ? "." : ",";
  const count = dots + commas;
  const grouped = asGroups(mark);
  if (count > 1) return { list: grouped ? [grouped] : [], foreign: null };
  const decimal = asDecimal(mark, null);
  if (mark === style.group) return grouped ? { list: [grouped], foreign: null } : { list: [], foreign: decimal };
  if (mark === style.decimal && style.firm) return { list: decimal ? [decimal] : [], foreign: null };
  return { list: [decimal, grouped].filter((r): r is Reading => r != null), foreign: null };
}

const valueOf = (r: Reading) => Number(`${r.negative ? "-" : ""}${r.int}${r.frac ? `.${r.frac}` : ""}`);
function canonicalOf(r: Reading): string {
  const int = r.int.replace(/^0+(?=\d)/, "");
  return `${r.negative && /[1-9]/.test(int + (r.frac ?? "")) ? "-" : ""}${int}${r.frac != null ? `.${r.frac}` : ""}`;
}

/** How a reading is written so that no convention misreads it, with `mark` as the decimal mark. */
function safeSpelling(r: Reading, mark: "." | ",", pad = true): string {
  const sign = r.negative ? "-" : "";
  if (r.frac == null) return `${sign}${r.int.replace(/^0+(?=\d)/, "")}`;
  let frac = r.frac.replace(/0+$/, "");
  if (frac === "") return `${sign}${r.int.replace(/^0+(?=\d)/, "")}`;
  if (pad && frac.length === 3) frac += "0"; // "1,234" would be ambiguous again
  return `${sign}${r.int.replace(/^0+(?=\d)/, "")}${mark}${frac}`;
}

const quote = (s: string) => `“${s}”`;

/** Reads what someone typed, in the shop's style; refuses anything with no reading or two. */
export function parseNumberInput(text: string, style: NumberStyle, rules: NumberRules = {}): ParsedNumber | NumberRefusal {
  const what = rules.what ?? "The number";
  const typed = String(text ?? "").trim();
  const refuse = (message: string, list: number[] = []): NumberRefusal => ({ ok: false, message, readings: list });
  const example = exampleIn(style);
  if (typed === "") return refuse(`Enter ${what.toLowerCase()}.`);
  if (typed.length > 40) return refuse(`${what} is too long to be a number.`);
  const m = /^([-+\u2212]?)\s*(.*)$/.exec(typed)!;
  const negative = m[1] === "-" || m[1] === "\u2212";
  const body = m[2]!.replace(SPACES, " ").replace(APOSTROPHES, "'");
  if (!/^[\d.,' ]*\d[\d.,' ]*$/.test(body) || /^[ ']|[ ']$|[ ']{2}/.test(body)) {
    return refuse(`${what} must be a number, e.g. ${example}.`);
  }
  const { list, foreign } = readings(body, style);
  if (foreign) {
    const spelled = safeSpelling(foreign, style.decimal, !style.firm);
    return refuse(`${what}: ${quote(typed)} isn’t how this shop writes numbers (${example}) — write ${spelled}.`, [valueOf(foreign)]);
  }
  if (list.length === 0) return refuse(`${what} must be a number, e.g. ${example}.`);
  let distinct = [...new Map(list.map((r) => [valueOf(r), r])).values()];
  // A reading the field can't take is no reading: "6,120" in a whole-number field is 6120.
  if (distinct.length > 1 && rules.maxDecimals != null) {
    const fits = distinct.filter((r) => (r.frac?.replace(/0+$/, "").length ?? 0) <= rules.maxDecimals!);
    if (fits.length) distinct = fits;
  }
  if (distinct.length > 1) {
    const [a, b] = distinct as [Reading, Reading];
    const mark = body.includes(",") ? "," : ".";
    const whole = safeSpelling(a.frac == null ? a : b, mark);
    const dec = safeSpelling(a.frac == null ? b : a, mark);
    const markName = mark === "," ? "comma" : "point";
    return refuse(
      `${what}: ${quote(typed)} could be ${whole} (the ${markName} grouping thousands) or ${dec} (a decimal ${markName}) — write ${whole} or ${dec}.`,
      distinct.map(valueOf),
    );
  }
  const r = { ...distinct[0]!, negative };
  const value = valueOf(r);
  const decimals = r.frac?.length ?? 0;
  if (value < 0 && !rules.allowNegative) return refuse(`${what} can’t be negative.`);
  if (rules.maxDecimals != null && decimals > rules.maxDecimals) {
    return refuse(rules.maxDecimals === 0 ? `${what} must be a whole number.` : `${what} takes at most ${rules.maxDecimals} decimal place${rules.maxDecimals === 1 ? "" : "s"}.`);
  }
  if (!Number.isFinite(value)) return refuse(`${what} is too large.`);
  if (rules.min != null && value < rules.min) return refuse(`${what} must be at least ${formatNumberInput(rules.min, style)}.`);
  if (rules.max != null && value > rules.max) return refuse(`${what} must be at most ${formatNumberInput(rules.max, style)}.`);
  return { ok: true, value, canonical: canonicalOf(r), decimals };
}

/**
 * A number as a field shows it in the shop's style, `decimals` kept (trailing zeros are resolution),
 * so the field reads back as the same number in the same style.
 */
export function formatNumberInput(value: number, style: NumberStyle, decimals?: number): string {
  const digits = decimals ?? Math.min(20, (String(Number(value.toPrecision(12))).split(".")[1] ?? "").length);
  const text = new Intl.NumberFormat(style.locale, { minimumFractionDigits: digits, maximumFractionDigits: digits, useGrouping: true }).format(value);
  // A style that groups differently from its locale (CAD: en-CA's marks, grouped with a space).
  const own = styleOfLocale(style.locale).group;
  const regrouped = (own === style.group ? text : text.split(own).join(style.group)).replace(/\u2212/g, "-");
  // Where a lone mark before three digits is refused, show one more zero so what we fill in reads back.
  return !style.firm && /^-?[1-9]\d{0,2}[.,]\d{3}$/.test(regrouped) ? `${regrouped}0` : regrouped;
}
