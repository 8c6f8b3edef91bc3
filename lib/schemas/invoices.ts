import { z } from "zod";
import { LINE_KINDS } from "@/lib/approvals";
import { COUNTER_METHODS, INVOICE_PUBLIC_ID_PATTERN } from "@/lib/invoices";

// What the invoice and payment forms send (FormData, so numbers arrive as text). Amounts stay the
// typed text ("42.50") until lib/money.ts reads them in the invoice's currency, so a bad value is
// refused with the field it came from.

const publicId = (what: string) => z.string().regex(INVOICE_PUBLIC_ID_PATTERN, `No such ${what}.`);
const text = (max: number, what: string) => z.string().trim().max(max, `Keep ${what} under ${max} characters.`);
const optional = (max: number, what: string) =>
  text(max, what)
    .nullish()
    .transform((s) => (s ? s : null));
const typed = z.string().trim().max(20, "That number is too long.");
const checkbox = z
  .union([z.literal("on"), z.literal("true"), z.literal("false"), z.literal("")], { error: "Tick the box or leave it empty." })
  .optional()
  .transform((v) => v === "on" || v === "true");

export const jobRefSchema = z.object({ job: publicId("job") });
export const invoiceRefSchema = z.object({
  invoice: publicId("invoice"),
  /** The version on the sender's screen: a change made meanwhile by someone else is refused, not overwritten. */
  version: z.coerce.number({ error: "Reload the invoice and try again." }).int("Reload the invoice and try again.").positive("Reload the invoice and try again."),
});

export const addLineSchema = invoiceRefSchema.extend({
  kind: z.enum(LINE_KINDS, { message: "A line is a part, labour or a fee." }),
  description: text(200, "the description").min(1, "Say what this line is, e.g. “Drain plug washer”."),
  partNumber: optional(60, "the part number"),
  qty: typed.optional(),
  hours: typed.optional(),
  unitPrice: typed.optional(),
  rate: typed.optional(),
  amount: typed.optional(),
  taxable: checkbox,
});
export type AddLineInput = z.output<typeof addLineSchema>;

export const removeLineSchema = invoiceRefSchema.extend({ line: z.coerce.number({ error: "No such line: reload the invoice." }).int("No such line: reload the invoice.").positive("No such line: reload the invoice.") });

export const draftDetailsSchema = invoiceRefSchema.extend({
  discountKind: z.enum(["none", "amount", "percent"], { message: "Choose no discount, an amount or a percent." }).default("none"),
  discountValue: typed.default(""),
  returnedPartsNote: optional(500, "the returned-parts note"),
  note: optional(1000, "the note"),
});
export type DraftDetailsInput = z.output<typeof draftDetailsSchema>;

export const issueSchema = invoiceRefSchema.extend({ confirmed: z.literal("yes", { message: "Check the invoice, then confirm." }) });
export const voidSchema = invoiceRefSchema.extend({
  reason: text(300, "the reason").min(1, "Say why the invoice is cancelled."),
  confirmed: z.literal("yes", { message: "Confirm that the invoice is cancelled." }),
});

const counterMethod = z.enum(COUNTER_METHODS, { message: "Choose cash, card at the counter or cheque." });
const reference = optional(120, "the reference");

/** Cash may go without a reference; a card slip or a cheque has a number to write down. */
function needsReference<T extends { method: (typeof COUNTER_METHODS)[number]; reference: string | null }>(v: T, ctx: z.RefinementCtx) {
  if (v.method !== "cash" && !v.reference) ctx.addIssue({ code: "custom", path: ["reference"], message: v.method === "cheque" ? "Enter the cheque number." : "Enter the terminal's receipt or authorisation number." });
}

export const recordPaymentSchema = z
  .object({ invoice: publicId("invoice"), method: counterMethod, amount: typed.min(1, "Enter the amount received."), reference })
  .superRefine(needsReference);
export type RecordPaymentInput = z.output<typeof recordPaymentSchema>;

export const requestDepositSchema = z.object({
  job: publicId("job"),
  amount: typed.min(1, "Enter the deposit amount."),
  note: optional(500, "the note"),
  request: z
    .string()
    .regex(INVOICE_PUBLIC_ID_PATTERN, "No such approval request.")
    .optional()
    .or(z.literal(""))
    .transform((s) => s || null),
});
export type RequestDepositInput = z.output<typeof requestDepositSchema>;

export const recordDepositSchema = z.object({ deposit: publicId("deposit"), method: counterMethod, reference }).superRefine(needsReference);
export type RecordDepositInput = z.output<typeof recordDepositSchema>;

export const refundSchema = z.object({
  /** The job the payment was taken on: access is checked on the job, and the payment must be one of its own. */
  job: publicId("job"),
  payment: z.coerce.number({ message: "No such payment." }).int("No such payment.").positive("No such payment."),
  amount: typed.min(1, "Enter the amount to refund."),
  reason: optional(300, "the reason"),
  confirmed: z.literal("yes", { message: "Confirm the refund." }),
});
export type RefundInput = z.output<typeof refundSchema>;

export const payInvoiceSchema = z.object({ invoice: publicId("invoice") });
export const payDepositSchema = z.object({ deposit: publicId("deposit") });

/** The owner's invoice page query: ?paid=<invoice or deposit public id> on return from paying, ?cancelled=1 when they went back. */
export const invoiceReturnSchema = z.object({
  paid: z
    .string()
    .regex(/^[\w-]{1,255}$/)
    .optional()
    .catch(undefined),
  cancelled: z.string().optional().catch(undefined),
});
