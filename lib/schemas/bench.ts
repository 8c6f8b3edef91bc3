import { z } from "zod";
import { PART_STATUSES, SPEC_KINDS } from "@/lib/bench";
import { JOB_PUBLIC_ID_PATTERN, PHOTO_ID_PATTERN } from "@/lib/journal";
import { MAX_PATTERN_BOLTS } from "@/lib/tightening-order";
import { TORQUE_UNIT_IDS } from "@/lib/torque";
import { DEFAULT_WRENCH_CLASS, WRENCH_CLASS_IDS } from "@/lib/torque-check";
import { LUBRICATIONS } from "@/lib/torque-special";
import { parseNumberInput, styleOfLocale } from "@/lib/number-input";
import { optNumberText, reqNumberText } from "./number";

// The bench forms as they post (flat FormData strings, blanks for untouched fields). Field names
// are the inputs' names so each message lands beside its own field.

const blank = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);
const text = (max: number, what: string) => z.string().trim().max(max, `Keep ${what} under ${max} characters.`);
const optText = (max: number, what: string) => z.preprocess(blank, text(max, what).optional()).transform((s) => s ?? null);
const reqText = (max: number, what: string, missing: string) => z.preprocess(blank, text(max, what).min(1, missing).optional()).pipe(z.string({ error: missing }));

// Decimals stay the typed text here and are read on the server in the shop's style, with the
// one parser (lib/number-input.ts via lib/schemas/number.ts): "1,200" is never 1.2.

function wholeNumber(what: string, min: number, max: number) {
  const message = `${what} must be a whole number from ${min} to ${max}.`;
  return z.string().trim().regex(/^\d{1,6}$/, message).transform(Number).pipe(z.number().int().min(min, message).max(max, message));
}
const optWhole = (what: string, min: number, max: number) => z.preprocess(blank, wholeNumber(what, min, max).optional()).transform((n) => n ?? null);
const recordId = (what: string) => z.string().trim().regex(/^[1-9]\d{0,15}$/, `No such ${what}.`).transform(Number);
const checkbox = z.preprocess((v) => v === "on" || v === "1" || v === "true", z.boolean());

export const jobRef = z.object({ job: z.string().regex(JOB_PUBLIC_ID_PATTERN, "No such job.") });
const torqueUnit = z.enum(TORQUE_UNIT_IDS, { message: "Choose a torque unit." });

const PASS_STYLE = styleOfLocale("en-US");
/** "30, 60, 100" → [30, 60, 100]; the rising-to-100 rule is checked by assertPassPercents. */
export const passPercentsText = z
  .string()
  .trim()
  .regex(/^\d{1,3}(?:\.\d+)?(?:\s*[,;/ →>-]+\s*\d{1,3}(?:\.\d+)?){0,7}$/, 'Write the passes as percentages, e.g. "30, 60, 100".')
  // Each item through the one number reader (lib/number-input.ts). The comma separates passes
  // here, so a decimal takes a point ("33.5"), whatever the shop's convention.
  .transform((s, ctx) =>
    s
      .split(/[^\d.]+/)
      .filter(Boolean)
      .map((item, i) => {
        const r = parseNumberInput(item, PASS_STYLE, { what: `Pass ${i + 1}`, min: 0, max: 100, maxDecimals: 2 });
        if (!r.ok) ctx.addIssue({ code: "custom", message: `${r.message} Write the passes as percentages, e.g. "30, 60, 100".` });
        return r.ok ? r.value : NaN;
      }),
  );

// Issue 18 §4 (lib/torque-special.ts): angle stages stay text (each read with the one number
// reader on the server), lubrication from the list; shared by the torque record and a step's torque.
const angleStages = optText(60, "the angle stages");
const lubrication = z.preprocess(blank, z.enum(LUBRICATIONS, { message: "Choose the thread lubrication from the list." }).optional()).transform((l) => l ?? null);
// Ticked after a plausibility warning: the value was checked against the maker's manual.
const plausibleChecked = checkbox.optional().default(false);

export const torqueRecordSchema = jobRef.extend({
  fastener: reqText(200, "what was torqued", "Say what was torqued, e.g. “pump cover bolts, 8 × M6”."),
  specValue: reqNumberText("Spec torque"),
  unit: torqueUnit,
  appliedValue: optNumberText("Applied torque"),
  // The wrench's ISO 6789-1 class gives the default tolerance; a typed tolerance overrides it.
  wrenchClass: z.preprocess(blank, z.enum(WRENCH_CLASS_IDS, { message: "Choose the wrench type from the list." }).optional()).transform((c) => c ?? null),
  tolerancePct: optNumberText("The tolerance (%)"),
  passesDone: checkbox.optional().default(false),
  checkPass: checkbox.optional().default(false),
  plausibleChecked,
  tool: optText(120, "the tool"),
  // Issue 18 §3: the wrench's serial, calibration date (a future one is refused on the server, in
  // the shop's time zone) and maximum, in its own unit (the record's when blank).
  toolSerial: optText(60, "the serial number"),
  calibratedOn: z.preprocess(blank, z.iso.date({ message: "Use a date like 2026-03-14." }).optional()).transform((s) => s ?? null),
  wrenchMax: optNumberText("The wrench's maximum"),
  wrenchMaxUnit: z.preprocess(blank, torqueUnit.optional()).transform((u) => u ?? null),
  angleStages,
  angleDone: checkbox.optional().default(false),
  lubrication,
  lubricationOther: optText(60, "what was on the threads"),
  loosenRetorque: checkbox.optional().default(false),
  retorqueSequence: optText(300, "the sequence"),
  oneTime: checkbox.optional().default(false),
  passes: z.preprocess(blank, passPercentsText.optional()).transform((p) => p ?? null),
  boltCount: optWhole("Bolt count", 1, 999),
  note: optText(500, "the note"),
  share: checkbox.optional().default(false),
});
export type TorqueRecordInput = z.output<typeof torqueRecordSchema>;

export const readingSchema = jobRef.extend({
  label: reqText(200, "what was measured", "Say what was measured, e.g. “front brake disc thickness”."),
  value: reqNumberText("The reading"),
  unit: optText(20, "the unit"),
  min: optNumberText("The minimum"),
  max: optNumberText("The maximum"),
  source: optText(200, "the source"),
});
export type ReadingInput = z.output<typeof readingSchema>;

export const chainReadingSchema = jobRef.extend({
  label: optText(200, "what was measured").transform((s) => s ?? "Drive chain wear"),
  pitchMm: reqNumberText("The chain pitch (mm)"),
  pitches: wholeNumber("Pitches measured", 1, 500),
  measuredMm: reqNumberText("The measured length (mm)"),
  limitPct: optNumberText("The wear limit (%)"),
  // The large sprocket's tooth count, optional: over 67 teeth the limit tightens to 200/N % (lib/chain-wear.ts).
  sprocketTeeth: optWhole("The large sprocket's teeth", 1, 300),
  // Ticked after "this length fits one more pitch": the count was checked (pitches = pins − 1).
  countChecked: checkbox.optional().default(false),
  source: optText(200, "the source"),
});
export type ChainReadingInput = z.output<typeof chainReadingSchema>;


export const teardownStepSchema = jobRef.extend({
  removed: reqText(200, "what came off", "Say what came off, e.g. “clutch cover”."),
  count: optWhole("Count", 1, 999),
  size: optText(60, "the size"),
  notes: optText(1000, "the notes"),
  storage: optText(80, "the storage label"),
  photo: z.preprocess(blank, z.string().regex(PHOTO_ID_PATTERN, "Choose one of this job's photos.").optional()).transform((s) => s ?? null),
});
export type TeardownStepInput = z.output<typeof teardownStepSchema>;

export const stepTorqueSchema = jobRef.extend({
  step: recordId("step"),
  torqueValue: reqNumberText("Torque"),
  torqueUnit: torqueUnit,
  boltCount: optWhole("Bolt count", 1, 999),
  angleStages,
  lubrication,
  lubricationOther: optText(60, "what was on the threads"),
  loosenRetorque: checkbox.optional().default(false),
  retorqueSequence: optText(300, "the sequence"),
  oneTime: checkbox.optional().default(false),
  plausibleChecked,
});
export const stepFlagSchema = jobRef.extend({ step: recordId("step"), value: z.enum(["0", "1"]).transform((v) => v === "1") });

// Editing or deleting a logged step (issue 18 §7): the version on screen, so a stale form is refused.
const stepVersion = z.string().trim().regex(/^[1-9]\d{0,8}$/, "Reload the bench page and try again.").transform(Number);
export const teardownEditSchema = jobRef.extend({
  step: recordId("step"),
  version: stepVersion,
  removed: reqText(200, "what came off", "Say what came off, e.g. “clutch cover”."),
  count: optWhole("Count", 1, 999),
  size: optText(60, "the size"),
  notes: optText(1000, "the notes"),
  storage: optText(80, "the storage label"),
});
export type TeardownEditInput = z.output<typeof teardownEditSchema>;
export const teardownDeleteSchema = jobRef.extend({ step: recordId("step"), version: stepVersion });
export type TeardownDeleteInput = z.output<typeof teardownDeleteSchema>;

const partStatus = z.enum(PART_STATUSES, { message: "Choose a status for the part." });
const isoDate = z.preprocess(blank, z.iso.date({ message: "Use a date like 2026-12-24." }).optional()).transform((s) => s ?? null);

export const partSchema = jobRef.extend({
  description: reqText(200, "the description", "Say what the part is."),
  partNumber: optText(60, "the part number"),
  supplier: optText(120, "the supplier"),
  // Parsed with lib/money.ts once the shop's currency is known.
  qty: z.preprocess(blank, text(20, "the quantity").optional()).transform((s) => s ?? "1"),
  cost: optText(20, "the cost"),
  status: partStatus.default("needed"),
  expectedOn: isoDate,
  // What work the part is for: the work booked in (needs no further OK) or a finding, whose
  // part waits the job only once the owner approves it.
  forWork: z
    .string({ message: "Say what work the part is for." })
    .regex(/^(booked|finding:\d{1,12})$/, "Say what work the part is for.")
    .transform((v) => (v === "booked" ? { findingId: null, noOkNeeded: true } : { findingId: Number(v.slice("finding:".length)), noOkNeeded: false })),
});
export type PartInput = z.output<typeof partSchema>;

export const partStatusSchema = jobRef.extend({ part: recordId("part"), from: partStatus, to: partStatus, expectedOn: isoDate });

// The shop's hidden field: a message only a tampered or stale page can get, said in the banner.
const noShop = "This page names no shop of yours: reload it and try again.";
export const shopRef = z.object({ shop: z.string({ error: noShop }).trim().min(1, noShop).max(60, noShop) });

export const specSchema = shopRef
  .extend({
    make: reqText(60, "the make", "Enter the make."),
    model: reqText(80, "the model", "Enter the model."),
    kind: z.enum(SPEC_KINDS, { message: "Choose what kind of spec this is." }),
    label: reqText(200, "the label", "Say what the spec is for, e.g. “clutch cover bolts”."),
    value: optNumberText("The value"),
    unit: optText(20, "the unit"),
    min: optNumberText("The minimum"),
    max: optNumberText("The maximum"),
    boltCount: optWhole("Bolt count", 1, MAX_PATTERN_BOLTS),
    notes: optText(1000, "the notes"),
    source: optText(200, "the source"),
  })
  .superRefine((s, ctx) => {
    const need = (path: string, message: string) => ctx.addIssue({ code: "custom", path: [path], message });
    if (s.kind === "torque") {
      if (s.value == null) need("value", "A torque spec needs its value.");
      if (!s.unit || !(TORQUE_UNIT_IDS as readonly string[]).includes(s.unit)) need("unit", `Choose a torque unit: ${TORQUE_UNIT_IDS.join(", ")}.`);
    }
    if (s.kind === "limit" && s.min == null && s.max == null) need("max", "A service limit needs a minimum, a maximum or both.");
    if (s.kind === "capacity" && s.value == null) need("value", "A capacity needs its amount.");
    if (s.kind === "note" && !s.notes) need("notes", "Write the note.");
  });
export type SpecInput = z.output<typeof specSchema>;

export const specDeleteSchema = shopRef.extend({ spec: recordId("spec") });

export const benchSettingsSchema = shopRef.extend({
  torqueUnit,
  passes: passPercentsText,
  // The shop's usual wrench (ISO 6789-1 class): a new torque record's default tolerance.
  wrenchClass: z.preprocess(blank, z.enum(WRENCH_CLASS_IDS, { message: "Choose the wrench type from the list." }).optional()).transform((c) => c ?? DEFAULT_WRENCH_CLASS),
  chainLimitPct: reqNumberText("The chain wear limit (%)"),
  // Clips from the bench (defaults 10 minutes, 2 GB).
  clipMaxMinutes: reqNumberText("The longest clip (minutes)"),
  clipMaxGb: reqNumberText("The largest clip (GB)"),
  // The board's "owner slow to answer" filter: days a job may wait on the owner (default 3).
  ownerWaitDays: z.coerce
    .number({ message: "Enter a number of days." })
    .int("Enter whole days.")
    .min(1, "At least 1 day.")
    .max(60, "At most 60 days."),
});
