import { z } from "zod";
import { MAX_SET_ITEMS, MEASUREMENT_KINDS, MEASUREMENT_ROW_FIELDS, VALVE_SIDES, type ValveSide, rowField } from "@/lib/measurements";
import { jobRef } from "./bench";
import { optNumberText } from "./number";

// The measurement-set form (bench page) as it posts: flat FormData strings, one numbered row per
// item (`value0`, `cyl0`, `side0`, `shim0`, `label0` …), blanks for untouched fields. Numbers stay
// text and are read on the server in the shop's style by the one parser (lib/schemas/number.ts).
// A row without a value is left out.

const blank = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);
const optText = (max: number, what: string) =>
  z.preprocess(blank, z.string({ error: `Type ${what} as text.` }).trim().max(max, `Keep ${what} under ${max} characters.`).optional()).transform((s) => s ?? null);
const NO_SET = "This form names no measurement set: reload the bench page and try again.";


const cylinder = z.preprocess(
  blank,
  z
    .string({ error: "The cylinder must be a whole number from 1 to 12." })
    .trim()
    .regex(/^\d{1,2}$/, "The cylinder must be a whole number from 1 to 12.")
    .transform(Number)
    .pipe(z.number().int().min(1, "The cylinder must be a whole number from 1 to 12.").max(12, "The cylinder must be a whole number from 1 to 12."))
    .optional(),
);
const side = z.preprocess(blank, z.enum(VALVE_SIDES, { message: "Choose intake or exhaust." }).optional());

const label = optText(120, "the item's name");
const measured = optNumberText("The measurement");
const shim = optNumberText("The old shim");
// Written out (one line per row) so the field names read from the source (tests/support/schema-fields.ts, the fuzz test).
const rowShape = {
  label0: label, value0: measured, cyl0: cylinder, side0: side, shim0: shim,
  label1: label, value1: measured, cyl1: cylinder, side1: side, shim1: shim,
  label2: label, value2: measured, cyl2: cylinder, side2: side, shim2: shim,
  label3: label, value3: measured, cyl3: cylinder, side3: side, shim3: shim,
  label4: label, value4: measured, cyl4: cylinder, side4: side, shim4: shim,
  label5: label, value5: measured, cyl5: cylinder, side5: side, shim5: shim,
  label6: label, value6: measured, cyl6: cylinder, side6: side, shim6: shim,
  label7: label, value7: measured, cyl7: cylinder, side7: side, shim7: shim,
  label8: label, value8: measured, cyl8: cylinder, side8: side, shim8: shim,
  label9: label, value9: measured, cyl9: cylinder, side9: side, shim9: shim,
  label10: label, value10: measured, cyl10: cylinder, side10: side, shim10: shim,
  label11: label, value11: measured, cyl11: cylinder, side11: side, shim11: shim,
  label12: label, value12: measured, cyl12: cylinder, side12: side, shim12: shim,
  label13: label, value13: measured, cyl13: cylinder, side13: side, shim13: shim,
  label14: label, value14: measured, cyl14: cylinder, side14: side, shim14: shim,
  label15: label, value15: measured, cyl15: cylinder, side15: side, shim15: shim,
};
const ROW_NAMES = Array.from({ length: MAX_SET_ITEMS }, (_, i) => MEASUREMENT_ROW_FIELDS.map((f) => rowField(f, i))).flat();
if (Object.keys(rowShape).join() !== ROW_NAMES.join()) throw new Error("measurement set rows: one label, value, cyl, side and shim per row, MAX_SET_ITEMS rows");

export type MeasurementRowInput = { row: number; label: string | null; value: string; cylinder: number | null; side: ValveSide | null; oldShim: string | null };

const base = jobRef.extend({
  kind: z.enum(MEASUREMENT_KINDS, { message: "Choose what was measured." }),
  unit: optText(20, "the unit"),
  // Intake limits for a valve set; the set's limits for every other kind.
  min: optNumberText("The minimum"),
  max: optNumberText("The maximum"),
  exhaustMin: optNumberText("The exhaust minimum"),
  exhaustMax: optNumberText("The exhaust maximum"),
  source: z.preprocess(
    blank,
    z
      .string({ error: "Say where the limit comes from, e.g. “maker's manual p. 3-14”." })
      .trim()
      .min(1, "Say where the limit comes from, e.g. “maker's manual p. 3-14”.")
      .max(200, "Keep the source under 200 characters."),
  ),
  note: optText(500, "the note"),
});

export const measurementSetSchema = base.extend(rowShape).transform((parsed) => {
  // The row fields are built in a loop, so their keys aren't typed; the base fields are.
  const raw = parsed as unknown as z.output<typeof base>;
  const r = parsed as Record<string, unknown>;
  const rows: MeasurementRowInput[] = [];
  for (let i = 0; i < MAX_SET_ITEMS; i++) {
    const value = r[rowField("value", i)] as string | null;
    if (value == null) continue;
    rows.push({
      row: i,
      label: (r[rowField("label", i)] as string | null) ?? null,
      value,
      cylinder: (r[rowField("cyl", i)] as number | undefined) ?? null,
      side: (r[rowField("side", i)] as ValveSide | undefined) ?? null,
      oldShim: (r[rowField("shim", i)] as string | null) ?? null,
    });
  }
  const { job, kind, unit, min, max, exhaustMin, exhaustMax, source, note } = raw;
  return { job, kind, unit, min, max, exhaustMin, exhaustMax, source, note, rows };
});
export type MeasurementSetInput = z.output<typeof measurementSetSchema>;

/** "Draft a finding" on a set: a button; job and set are filled by the page. */
export const draftSetFindingSchema = jobRef.extend({
  set: z.string({ error: NO_SET }).trim().regex(/^[1-9]\d{0,15}$/, NO_SET).transform(Number),
});
