import { z } from "zod";
import { DECISION_METHODS, EVIDENCE_KINDS, LINE_KINDS, SAFETY_CATEGORIES } from "@/lib/approvals";

// What the findings and approval screens send (JSON). Amounts, quantities and hours arrive as the
// text that was typed ("42.50", "1.5"); lib/server/findings.ts reads them with lib/money.ts in
// the shop's currency, so a bad value is refused with the field it came from.

export const REQUEST_PUBLIC_ID_PATTERN = /^[A-Za-z0-9_-]{16}$/;
export const HASH_PATTERN = /^[0-9a-f]{64}$/;
export const MAX_FINDING_LINES = 30;
export const MAX_EVIDENCE = 20;
/** A version only a stale or tampered page sends wrong, said in the editor's banner. */
const STALE_FINDING = "This finding changed or couldn't be read: reload the page and try again.";

const text = (max: number, what: string) => z.string({ message: `Type ${what} as text.` }).trim().max(max, `Keep ${what} under ${max} characters.`);
const required = (max: number, what: string, missing: string) => text(max, what).min(1, missing);
const optional = (max: number, what: string) =>
  text(max, what)
    .nullish()
    .transform((s) => (s ? s : null));
/** Typed amount: absent keeps what is stored, "" clears it. */
const typed = z.string({ message: "Type a number, e.g. 1.5." }).trim().max(20, "That number is too long.").optional();

export const evidenceInputSchema = z.object({
  kind: z.enum(EVIDENCE_KINDS, { message: "Evidence is a photo, a reading or a clip." }),
  ref: z.string({ message: "That is not an evidence id." }).trim().regex(/^[A-Za-z0-9_-]{1,64}$/, "That is not an evidence id."),
  momentMs: z
    .number({ message: "The clip's moment couldn't be read: pick it again." })
    .int("The clip's moment couldn't be read: pick it again.")
    .min(0, "The clip's moment couldn't be read: pick it again.")
    .max(24 * 3_600_000, "The clip's moment couldn't be read: pick it again.")
    .nullish()
    .transform((n) => n ?? null),
});
export type EvidenceInput = z.output<typeof evidenceInputSchema>;

export const lineInputSchema = z.object({
  id: z.number({ message: STALE_FINDING }).int(STALE_FINDING).positive(STALE_FINDING).optional(),
  kind: z.enum(LINE_KINDS, { message: "A line is a part, labour or a fee." }),
  description: required(200, "the description", "Say what this line is, e.g. “Front brake pads”."),
  partNumber: optional(60, "the part number"),
  qty: typed,
  hours: typed,
  unitPrice: typed,
  rate: typed,
  amount: typed,
  taxable: z.boolean({ message: "Tick Taxable or leave it empty." }).optional(),
  /** A part line's unit cost (staff only; the shop's markup rule prices from it), why the price differs from the rule, and an existing job part it stands for. */
  cost: typed,
  priceReason: text(200, "the reason for the price").optional(),
  partId: z.number({ message: STALE_FINDING }).int(STALE_FINDING).positive(STALE_FINDING).nullish(),
  /** A saved part line stands for a new job part instead of the one it has (before the owner answers). */
  newPart: z.boolean({ message: STALE_FINDING }).optional(),
});
export type LineInput = z.output<typeof lineInputSchema>;

export const findingInputSchema = z.object({
  /** The version the editor loaded; absent when drafting a new finding. */
  version: z.number({ message: STALE_FINDING }).int(STALE_FINDING).positive(STALE_FINDING).optional(),
  title: required(200, "the title", "Give the finding a short title, e.g. “Front brake pads worn to the backing plate”."),
  found: required(4000, "what was found", "Say what you found."),
  whyItMatters: optional(4000, "why it matters"),
  safety: z.enum(SAFETY_CATEGORIES, { message: "Choose whether this is about brakes, steering, suspension, wheels and tyres, the drivetrain, fuel, the throttle, or none." }),
  evidence: z.array(evidenceInputSchema, { message: "The evidence list couldn't be read; reload the page." }).max(MAX_EVIDENCE, `Attach at most ${MAX_EVIDENCE} pieces of evidence.`).default([]),
  lines: z.array(lineInputSchema, { message: "The lines couldn't be read; reload the page." }).max(MAX_FINDING_LINES, `A finding holds at most ${MAX_FINDING_LINES} lines.`).default([]),
});
export type FindingInput = z.output<typeof findingInputSchema>;

export const sendRequestSchema = z.object({
  /** The finding version on the sender's screen: what they checked is what goes out. */
  findingVersion: z.number().int().positive(),
});

const STALE_ANSWERS = "The answers couldn't be read; reload the request and answer again.";
const answers = z
  .array(z.object({ no: z.number({ message: STALE_ANSWERS }).int(STALE_ANSWERS).min(1, STALE_ANSWERS).max(MAX_FINDING_LINES, STALE_ANSWERS), answer: z.enum(["approved", "declined"], { message: "Approve or decline each line." }) }), {
    message: "The answers couldn't be read; reload the request and answer again.",
  })
  .max(MAX_FINDING_LINES, "The answers couldn't be read; reload the request and answer again.");
/** A tick box the page sends as true / false. */
const partsBack = z.boolean({ message: "Say whether the owner wants the old parts back." }).default(false);

export const answerSchema = z.object({
  shownHash: z.string().regex(HASH_PATTERN, "Reload the request and answer again."),
  lines: answers,
  signature: required(120, "your name", "Type your name to sign."),
  wantsPartsBack: partsBack,
  /** Set by the confirm step: nothing is recorded from a single tap. */
  confirmed: z.literal(true, { message: "Check your answers and confirm." }),
});
export type AnswerInput = z.output<typeof answerSchema>;

export const recordDecisionSchema = z
  .object({
    shownHash: z.string().regex(HASH_PATTERN, "Reload the request and record the answer again."),
    lines: answers,
    method: z.enum(DECISION_METHODS.filter((m) => m !== "online") as ["phone", "in_person"], { message: "Say whether the owner answered by phone or in person." }),
    personName: required(120, "the name", "Enter the name of the person who gave the answer."),
    phoneCalled: optional(40, "the phone number"),
    decidedAt: z.iso.datetime({ offset: true, message: "Enter the date and time the owner answered." }).transform((s) => new Date(s)),
    note: optional(500, "the note"),
    wantsPartsBack: partsBack,
  })
  .superRefine((v, ctx) => {
    if (v.method === "phone" && !v.phoneCalled) ctx.addIssue({ code: "custom", path: ["phoneCalled"], message: "Enter the number you called." });
    if (v.phoneCalled && !/^[+()\d][\d\s().-]{3,39}$/.test(v.phoneCalled)) ctx.addIssue({ code: "custom", path: ["phoneCalled"], message: "That doesn't look like a phone number." });
  });
export type RecordDecisionInput = z.output<typeof recordDecisionSchema>;

export const withdrawSchema = z.object({ reason: optional(500, "the reason") });
