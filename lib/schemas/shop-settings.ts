import { z } from "zod";
import { SUPPORTED_CURRENCIES, TOLERANCE_CHOICES, WEEKDAYS, type Weekday, isTimeZone } from "@/lib/shop-settings";
import { shopRef } from "./bench";

// The shop settings page's forms, one per section (FormData, so everything arrives as text).
// Amounts stay the typed text until the server reads them in the shop's currency (lib/money.ts),
// so a bad amount is refused beside the field it came from. Every key is a field the form shows
// or fills itself (lib/schemas/form-fields.ts lists them; tests/unit/form-fields.test.ts checks).

const text = (max: number, what: string) => z.string({ error: `Enter ${what}.` }).trim().max(max, `Keep ${what} under ${max} characters.`);
const optional = (max: number, what: string) =>
  text(max, what)
    .nullish()
    .transform((s) => (s ? s : null));
const typed = z.string({ error: "Enter a number." }).trim().max(20, "That number is too long.").default("");
const checkbox = z
  .union([z.literal("on"), z.literal("true"), z.literal("false"), z.literal("")], { error: "Tick the box or leave it empty." })
  .optional()
  .transform((v) => v === "on" || v === "true");
const time = z.string({ error: "Enter a time like 08:00." }).trim().default("");

export const profileSettingsSchema = shopRef.extend({
  name: text(120, "the shop's name").min(2, "Enter the shop's name, as customers know it."),
  email: optional(254, "the e-mail address").pipe(z.union([z.null(), z.email("Enter an e-mail address like desk@shop.test.")])),
  phone: optional(40, "the phone number").pipe(z.union([z.null(), z.string().regex(/^[+\d][\d ()./-]{4,}$/, "Enter a phone number: digits, spaces and + ( ) - only.")])),
  address: optional(300, "the address"),
});
export type ProfileSettingsInput = z.output<typeof profileSettingsSchema>;

/** Per weekday: `monClosed` (checkbox), `monOpen` and `monClose` ("HH:MM", needed unless closed). */
// Written out, so tools that read schemas from the source (the fuzz test) see every field; the
// check below fails to compile when a weekday is missing.
const hoursShape = {
  monClosed: checkbox,
  monOpen: time,
  monClose: time,
  tueClosed: checkbox,
  tueOpen: time,
  tueClose: time,
  wedClosed: checkbox,
  wedOpen: time,
  wedClose: time,
  thuClosed: checkbox,
  thuOpen: time,
  thuClose: time,
  friClosed: checkbox,
  friOpen: time,
  friClose: time,
  satClosed: checkbox,
  satOpen: time,
  satClose: time,
  sunClosed: checkbox,
  sunOpen: time,
  sunClose: time,
};
const _everyDay: Record<`${Weekday}${"Closed" | "Open" | "Close"}`, unknown> = hoursShape;
void _everyDay;
const HHMM = /^([01]\d|2[0-3]):[0-5]\d$/;
export const hoursSettingsSchema = shopRef.extend(hoursShape).superRefine((v, ctx) => {
  const values = v as Record<string, unknown>;
  for (const d of WEEKDAYS) {
    if (values[`${d}Closed`]) continue;
    const open = String(values[`${d}Open`] ?? "");
    const close = String(values[`${d}Close`] ?? "");
    if (!HHMM.test(open)) ctx.addIssue({ code: "custom", path: [`${d}Open`], message: open ? "Enter the opening time as HH:MM, e.g. 08:00." : "Enter the opening time, or tick Closed." });
    if (!HHMM.test(close)) ctx.addIssue({ code: "custom", path: [`${d}Close`], message: close ? "Enter the closing time as HH:MM, e.g. 17:30." : "Enter the closing time, or tick Closed." });
    if (HHMM.test(open) && HHMM.test(close) && close <= open) ctx.addIssue({ code: "custom", path: [`${d}Close`], message: "Closing comes after opening." });
  }
});

export const regionSettingsSchema = shopRef.extend({
  timezone: z.string({ error: "Choose a time zone." }).trim().refine(isTimeZone, "Choose a time zone from the list, e.g. America/Denver."),
  currency: z.enum(SUPPORTED_CURRENCIES, { error: "Choose one of the listed currencies." }),
});

/** Named rates as numbered rows (`rateName0`, `rateAmount0`…); an empty row is left out. */
export const LABOUR_RATE_ROWS = 5;
const rateName = z.string({ error: "Enter a name." }).trim().max(60, "Keep the name under 60 characters.").default("");
// Written out like the hours above; one name and one amount for each of LABOUR_RATE_ROWS rows.
const rateRows = {
  rateName0: rateName,
  rateAmount0: typed,
  rateName1: rateName,
  rateAmount1: typed,
  rateName2: rateName,
  rateAmount2: typed,
  rateName3: rateName,
  rateAmount3: typed,
  rateName4: rateName,
  rateAmount4: typed,
};
if (Object.keys(rateRows).length !== LABOUR_RATE_ROWS * 2) throw new Error("labour rate rows: one name and one amount per row");
export const labourSettingsSchema = shopRef.extend({ defaultRate: typed }).extend(rateRows).superRefine((v, ctx) => {
  const values = v as Record<string, string>;
  const seen = new Set<string>();
  for (let i = 0; i < LABOUR_RATE_ROWS; i++) {
    const name = values[`rateName${i}`] ?? "";
    const amount = values[`rateAmount${i}`] ?? "";
    if (name && !amount) ctx.addIssue({ code: "custom", path: [`rateAmount${i}`], message: `Enter the hourly rate for “${name}”.` });
    if (amount && !name) ctx.addIssue({ code: "custom", path: [`rateName${i}`], message: "Name this rate, e.g. Diagnosis." });
    if (name && seen.has(name.toLowerCase())) ctx.addIssue({ code: "custom", path: [`rateName${i}`], message: "Each rate needs its own name." });
    seen.add(name.toLowerCase());
  }
});

export const taxSettingsSchema = shopRef.extend({
  taxMethod: z.enum(["per_line", "per_invoice"], { error: "Choose per line or per invoice." }),
  taxRate: typed,
  /** Empty: labour, fees or the supplies fee are taxed at the shop's rate (taxRate). */
  labourTaxRate: typed,
  feeTaxRate: typed,
  suppliesTaxRate: typed,
  partsTaxable: checkbox,
  labourTaxable: checkbox,
  feesTaxable: checkbox,
});

export const suppliesSettingsSchema = shopRef.extend({
  /** Empty: no shop-supplies fee. */
  suppliesPercent: typed,
  suppliesBase: z.enum(["labour", "parts_and_labour"], { error: "Choose labour, or parts and labour." }),
  suppliesCap: typed,
  suppliesTaxable: checkbox,
});

export const toleranceSettingsSchema = shopRef
  .extend({
    toleranceKind: z.enum(TOLERANCE_CHOICES, { error: "Choose one of the rules." }),
    tolerancePercent: typed,
    toleranceFixed: typed,
    toleranceCap: typed,
  })
  .superRefine((v, ctx) => {
    if (v.toleranceKind === "custom" && !v.tolerancePercent && !v.toleranceFixed) {
      ctx.addIssue({ code: "custom", path: ["tolerancePercent"], message: "Enter a percent, a fixed amount or both (the greater applies)." });
    }
  });

/** Both empty: no standard terms (the desk types them for each job). */
export const dropoffSettingsSchema = shopRef
  .extend({
    dropoffCharge: typed,
    dropoffUpTo: typed,
  })
  .superRefine((v, ctx) => {
    if (v.dropoffCharge && !v.dropoffUpTo) ctx.addIssue({ code: "custom", path: ["dropoffUpTo"], message: "Enter the amount the owner authorises, or empty both." });
    if (v.dropoffUpTo && !v.dropoffCharge) ctx.addIssue({ code: "custom", path: ["dropoffCharge"], message: "Enter the diagnosis charge (0 for none), or empty both." });
  });

export const digestSettingsSchema = shopRef.extend({
  digestWindowMinutes: z.coerce
    .number({ error: "Enter a number of minutes." })
    .int("Enter whole minutes.")
    .min(0, "0 sends each update at once; no less.")
    .max(1440, "At most 1,440 minutes (a day)."),
});

export type HoursSettingsInput = z.output<typeof hoursSettingsSchema>;
export type RegionSettingsInput = z.output<typeof regionSettingsSchema>;
export type LabourSettingsInput = z.output<typeof labourSettingsSchema>;
export type TaxSettingsInput = z.output<typeof taxSettingsSchema>;
export type SuppliesSettingsInput = z.output<typeof suppliesSettingsSchema>;
export type ToleranceSettingsInput = z.output<typeof toleranceSettingsSchema>;
export type DigestSettingsInput = z.output<typeof digestSettingsSchema>;
export type DropoffSettingsInput = z.output<typeof dropoffSettingsSchema>;
