import { z } from "zod";
import { MACHINE_KINDS, type MachineKind } from "@/lib/machine";
import { neutralStyle, parseNumberInput } from "@/lib/number-input";

// The check-in form as it posts (flat FormData strings, blanks for untouched fields) and the
// structured input `checkInJob` takes. Field names are the form's input names, so every
// message lands beside its own field.

const blank = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : typeof v === "number" ? String(v) : v);

/** An optional field: blank or missing is "not given". */
const optional = <T extends z.ZodType>(schema: T) => z.preprocess(blank, schema.optional());

const text = (max: number, tooLong: string) => z.string().trim().max(max, tooLong);

/**
 * A number typed into a text box. Parsed from the string so a typo is a message on that
 * field and the other fields are still checked in the same pass.
 */
function typedNumber(opts: { min: number; max: number; decimals: 0 | 1; message: string }) {
  // The one number reader (lib/number-input.ts), before the shop is known: text with two readings
  // ("1,200" hours) is refused with both; a whole-number field takes "6,120" as 6120, never 6.12.
  return z.string().transform((s, ctx) => {
    const r = parseNumberInput(s, neutralStyle(), { maxDecimals: opts.decimals, min: opts.min, max: opts.max });
    if (r.ok) return r.value;
    ctx.addIssue({ code: "custom", message: r.readings.length > 1 ? r.message : opts.message });
    return z.NEVER;
  });
}

const recordId = (message: string) => z.string().trim().regex(/^\d{1,10}$/, message).transform(Number).pipe(z.number().int().positive(message));

/** Model years run a year ahead of the calendar. */
export const LATEST_MODEL_YEAR = new Date().getUTCFullYear() + 1;
const yearMessage = `Year is four digits, from 1900 to ${LATEST_MODEL_YEAR}`;

/** An e-mail as typed at the desk (also the customer page's contact form). */
export const email = z
  .string()
  .trim()
  .toLowerCase()
  .max(254, "That e-mail address is too long")
  .pipe(z.email({ error: "That doesn't look like an e-mail address" }));

/** A phone number as typed at the desk (also the customer page's contact form). */
export const phone = text(40, "A phone number is at most 40 characters").regex(
  /^\+?[\d\s().-]*\d[\d\s().-]*$/,
  "Use digits, spaces, brackets, dashes and a leading + only",
);

const mode = (message: string) => z.enum(["existing", "new"], { error: message });

const checkInFields = z.object({
  customerMode: mode("Choose an owner on file or add a new one"),
  customerId: optional(recordId("Pick the owner from the search results")),
  customerName: optional(text(120, "A name is at most 120 characters")),
  customerEmail: optional(email),
  customerPhone: optional(phone),
  machineMode: optional(mode("Choose one of the owner's machines or add a new one")),
  machineId: optional(recordId("Pick one of the owner's machines")),
  machineKind: optional(z.enum(MACHINE_KINDS, { error: "Pick the kind of machine" })),
  machineYear: optional(typedNumber({ min: 1900, max: LATEST_MODEL_YEAR, decimals: 0, message: yearMessage })),
  machineMake: optional(text(60, "The make is at most 60 characters")),
  machineModel: optional(text(80, "The model is at most 80 characters")),
  machineEngineCc: optional(typedNumber({ min: 1, max: 20_000, decimals: 0, message: "Engine size is a whole number of cc, 1 to 20000" })),
  machineSerial: optional(text(64, "A serial or VIN is at most 64 characters")),
  machineHours: optional(typedNumber({ min: 0, max: 999_999.9, decimals: 1, message: "Hours like 312 or 312.4 (one decimal place)" })),
  machineOdometer: optional(typedNumber({ min: 0, max: 9_999_999, decimals: 0, message: "Odometer is a whole number, like 6120" })),
  machineOdometerUnit: optional(z.enum(["km", "mi"], { error: "Pick km or miles" })),
  concern: z
    .string({ error: "Write down the owner's concern in their own words" })
    .trim()
    .min(1, "Write down the owner's concern in their own words")
    .max(4000, "The concern is at most 4000 characters"),
  intakeNotes: optional(text(4000, "Intake notes are at most 4000 characters")),
  promisedOn: optional(z.iso.date({ error: "Pick a real date (YYYY-MM-DD)" })),
  technicianId: optional(recordId("Pick someone from the list")),
  // The owner agrees, at the desk, to texts at their phone number (issue 21; recorded with when and how).
  textConsent: optional(z.literal("yes", { error: "Tick the box only if the owner agrees to texts" })),
});

type Fields = z.output<typeof checkInFields>;

/** The rules that tie fields together; each message goes on the field to fix. */
function crossFieldRules(v: Fields, ctx: z.RefinementCtx) {
  const need = (path: keyof Fields, message: string) => ctx.addIssue({ code: "custom", path: [path], message });
  if (v.customerMode === "existing") {
    if (v.customerId == null) need("customerId", "Search for the owner and pick them, or add a new owner");
  } else {
    if (!v.customerName) need("customerName", "Enter the owner's name");
    if (!v.customerEmail && !v.customerPhone) need("customerEmail", "Give an e-mail or a phone number so the shop can reach the owner");
  }
  // A new owner has no machines on file yet, so their machine is always a new one.
  const machineMode = v.customerMode === "new" ? "new" : v.machineMode;
  if (machineMode === undefined) need("machineMode", "Choose one of the owner's machines or add a new one");
  if (machineMode === "existing" && v.machineId == null) need("machineId", "Pick one of the owner's machines, or add a new one");
  if (machineMode === "new") {
    if (!v.machineKind) need("machineKind", "Pick the kind of machine");
    if (!v.machineMake) need("machineMake", "Enter the make");
    if (!v.machineModel) need("machineModel", "Enter the model");
    if (v.machineOdometer != null && !v.machineOdometerUnit) need("machineOdometerUnit", "Say whether the odometer reads km or miles");
  }
}

export type NewCustomer = { name: string; email: string | null; phone: string | null };
export type NewMachine = {
  kind: MachineKind;
  year: number | null;
  make: string;
  model: string;
  engineCc: number | null;
  serial: string | null;
  hours: number | null;
  odometer: number | null;
  odometerUnit: "km" | "mi" | null;
};

/** What `checkInJob` takes: an owner and machine either on file (by id) or new. */
export type CheckInInput = {
  customer: { mode: "existing"; id: number } | ({ mode: "new" } & NewCustomer);
  machine: { mode: "existing"; id: number } | ({ mode: "new" } & NewMachine);
  concern: string;
  intakeNotes: string | null;
  promisedOn: string | null;
  technicianId: number | null;
  /** The owner agreed at the desk to texts at their phone number (issue 21). */
  textConsent?: boolean;
};

function toInput(v: Fields): CheckInInput {
  const customer: CheckInInput["customer"] =
    v.customerMode === "existing"
      ? { mode: "existing", id: v.customerId! }
      : { mode: "new", name: v.customerName!, email: v.customerEmail ?? null, phone: v.customerPhone ?? null };
  const machine: CheckInInput["machine"] =
    v.customerMode === "existing" && v.machineMode === "existing"
      ? { mode: "existing", id: v.machineId! }
      : {
          mode: "new",
          kind: v.machineKind!,
          year: v.machineYear ?? null,
          make: v.machineMake!,
          model: v.machineModel!,
          engineCc: v.machineEngineCc ?? null,
          serial: v.machineSerial ?? null,
          hours: v.machineHours ?? null,
          odometer: v.machineOdometer ?? null,
          odometerUnit: v.machineOdometer != null ? (v.machineOdometerUnit ?? null) : null,
        };
  return {
    customer,
    machine,
    concern: v.concern,
    intakeNotes: v.intakeNotes ?? null,
    promisedOn: v.promisedOn ?? null,
    technicianId: v.technicianId ?? null,
    textConsent: v.textConsent === "yes",
  };
}

/** The check-in form's fields → `CheckInInput`. */
export const checkInSchema = checkInFields.superRefine(crossFieldRules).transform(toInput);

/** The same, plus the shop's slug the form posts alongside (for the server action). */
export const checkInFormSchema = checkInFields
  .extend({ shop: z.string().regex(/^[a-z0-9-]{1,60}$/, "Unknown shop") })
  .superRefine(crossFieldRules)
  .transform((v) => ({ shop: v.shop, input: toInput(v) }));

/**
 * A promised date may be today or later on the shop's calendar (`today` as YYYY-MM-DD in the
 * shop's time zone). Returns the message to show, or null when the date is fine.
 */
export function promisedOnProblem(promisedOn: string | null, today: string): string | null {
  if (promisedOn == null || promisedOn >= today) return null;
  return `The promised date can't be in the past: pick ${today} (today) or later`;
}

/** GET /api/shops/[shop]/customers?q= — the owner search of the check-in form. */
export const customerSearchQuerySchema = z.object({
  q: z.string().trim().max(100, "Search is limited to 100 characters").optional().default(""),
});

export type CustomerSearchResult = {
  id: number;
  name: string;
  email: string | null;
  phone: string | null;
  machines: { id: number; kind: MachineKind; year: number | null; make: string; model: string; serial: string | null }[];
};
