import { z } from "zod";
import { jobRef, shopRef } from "./bench";

// The ordering forms of issue 19 (lib/server/part-orders.ts does the work). Money stays text here:
// it is read with lib/money.ts once the shop's currency is known.

const blank = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);
const text = (max: number, what: string) => z.string().trim().max(max, `Keep ${what} under ${max} characters.`);
const optText = (max: number, what: string) => z.preprocess(blank, text(max, what).optional()).transform((s) => s ?? null);
const recordId = (what: string) => z.string().trim().regex(/^[1-9]\d{0,15}$/, `No such ${what}.`).transform(Number);
const date = (missing: string) => z.preprocess(blank, z.iso.date({ message: "Use a date like 2026-12-24." }).optional()).pipe(z.string({ error: missing }));
const optDate = z.preprocess(blank, z.iso.date({ message: "Use a date like 2026-12-24." }).optional()).transform((s) => s ?? null);

/** Needed parts onto one supplier order (ticked boxes named `parts`): the fields both order forms share. */
const orderFields = {
  supplier: z.preprocess(blank, text(120, "the supplier").optional()).pipe(z.string({ error: "Name the supplier." })),
  reference: optText(80, "the order reference"),
  orderedOn: date("Give the date it was ordered."),
  expectedOn: optDate,
  // The ticked parts' ids, comma-separated (a form sends one value per name to the action).
  parts: z
    .string({ error: "Tick at least one part for the order." })
    .trim()
    .regex(/^[1-9]\d{0,15}(,[1-9]\d{0,15}){0,99}$/, "Tick at least one part for the order (at most 100).")
    .transform((s) => [...new Set(s.split(",").map(Number))]),
};

/** This job's needed parts onto one supplier order (the bench page). */
export const orderPartsSchema = jobRef.extend(orderFields);

/** Needed parts of any of the shop's jobs onto one supplier order (the parts page). */
export const orderShopPartsSchema = shopRef.extend(orderFields);

export const receiveOrderSchema = shopRef.extend({ order: recordId("order") });

export const backOrderSchema = jobRef.extend({ part: recordId("part"), expectedOn: optDate });

export const movePartSchema = jobRef.extend({
  part: recordId("part"),
  /** The other job's number as the shop writes it (J-0042 or 42). */
  toJob: z
    .string({ error: "Give the job number it goes to." })
    .trim()
    .regex(/^(J-)?0*[1-9]\d{0,8}$/i, "Give a job number like J-0042.")
    .transform((s) => Number(s.replace(/^J-/i, ""))),
  /** What the first job does then (db/queries/part-moves.ts): still needs one, swaps with the other job's awaited one, or nothing. */
  thisJob: z.enum(["needs", "swap", "done"], { message: "Say what this job does without the part." }),
});

export const coreChargeSchema = jobRef.extend({ part: recordId("part"), charge: optText(20, "the core charge") });
export const coreReturnedSchema = jobRef.extend({ part: recordId("part") });
export const specialOrderSchema = jobRef.extend({ part: recordId("part"), special: z.enum(["0", "1"]).transform((v) => v === "1") });
export const partDepositSchema = jobRef.extend({
  part: recordId("part"),
  /** Blank: the part's sell price × quantity. */
  amount: optText(20, "the amount"),
  note: optText(500, "the note"),
});
