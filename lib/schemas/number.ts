import { z } from "zod";
import { AppError } from "@/lib/errors";
import { type NumberRules, type NumberStyle, parseNumberInput } from "@/lib/number-input";

// Numeric form fields, built on lib/number-input.ts (the one reader). A form posts text; which
// convention it is read in is the shop's (lib/number-input.ts numberStyleFor), known only once
// the action has resolved the shop, so a schema checks the text's shape (`numberText`) and the
// server reads it (`readNumberField`), pinning the parser's message to the field.

const blank = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);
const SHAPE = /^[-+\u2212]?\s*[\d.,'\u2019 \u00a0\u202f\u2009]*\d[\d.,'\u2019 \u00a0\u202f\u2009]*$/;

/** Typed text that looks like a number in some convention; read later with the shop's style. */
function shaped(what: string) {
  const message = `${what} must be a number, e.g. 12.5.`;
  return z.string({ error: message }).trim().max(40, `${what} is too long to be a number.`).regex(SHAPE, message);
}

/** A number field the server reads in the shop's style; blank → null. */
export const optNumberText = (what: string) => z.preprocess(blank, shaped(what).optional()).transform((s) => s ?? null);
/** The same, required: blank → "Enter …". */
export const reqNumberText = (what: string) => z.preprocess(blank, shaped(what).optional()).pipe(z.string({ error: `Enter ${what.toLowerCase()}.` }));

/** A number as a server function takes it: text from a form (read in the shop's style) or a number from code. */
export type NumberInput = string | number;

/** Reads `input` with the shop's style, or throws a 422 whose message sits beside `field`. */
export function readNumberField(field: string, input: NumberInput, style: NumberStyle, rules: NumberRules): number {
  const fail = (message: string) => new AppError("invalid", message, { [field]: [message] });
  if (typeof input === "number") {
    // From code, not a person: the same range rules, no separators to read.
    const r = parseNumberInput(Number.isFinite(input) ? String(input) : "x", { locale: "en-US", decimal: ".", group: ",", firm: true }, rules);
    if (!r.ok) throw fail(r.message);
    return r.value;
  }
  const r = parseNumberInput(input, style, rules);
  if (!r.ok) throw fail(r.message);
  return r.value;
}
/**
 * The same, with the decimals typed ("0.20" → 2: the instrument's resolution). A number from code
 * carries no resolution: decimals null.
 */
export function readMeasuredField(field: string, input: NumberInput, style: NumberStyle, rules: NumberRules): { value: number; decimals: number | null } {
  const value = readNumberField(field, input, style, rules);
  if (typeof input === "number") return { value, decimals: null };
  const r = parseNumberInput(input, style, rules);
  return { value, decimals: r.ok ? r.decimals : null };
}
export const readOptMeasuredField = (field: string, input: NumberInput | null | undefined, style: NumberStyle, rules: NumberRules) =>
  input == null || input === "" ? null : readMeasuredField(field, input, style, rules);

export const readOptNumberField = (field: string, input: NumberInput | null | undefined, style: NumberStyle, rules: NumberRules) =>
  input == null || input === "" ? null : readNumberField(field, input, style, rules);
