import { z } from "zod";
import { DEFAULT_DIAGNOSIS_DESCRIPTION } from "@/lib/dropoff";

// Form fields of the drop-off authorisation: the desk prepares it, the owner signs it (at the
// counter on the desk's screen, or online). Amounts stay text here; the server parses them in the
// shop's currency and names the field when one can't be read.

const typed = (max: number) => z.string().trim().max(max, "That is too long.");
const checkbox = z
  .union([z.literal("on"), z.literal("true"), z.literal("false"), z.literal("")], { error: "Tick the box or leave it empty." })
  .optional()
  .transform((v) => v === "on" || v === "true");

export const dropoffFields = z.object({
  chargeKind: z.enum(["amount", "time"], { message: "Choose an amount or a labour time." }),
  chargeAmount: typed(20).optional().default(""),
  chargeHours: typed(10).optional().default(""),
  description: z
    .string()
    .trim()
    .max(200, "Keep the description under 200 characters.")
    .optional()
    .transform((s) => s || DEFAULT_DIAGNOSIS_DESCRIPTION),
  authorisedUpTo: typed(20).min(1, "Enter the amount the owner authorises."),
  terms: z
    .string()
    .trim()
    .max(1000, "Keep this under 1,000 characters.")
    .optional()
    .transform((s) => s || null),
});
export type DropoffFieldsInput = z.infer<typeof dropoffFields>;

export const dropoffSignatureFields = z.object({
  shownHash: z.string().regex(/^[0-9a-f]{64}$/, "Reload the page and sign again."),
  signature: z.string().trim().min(1, "Type the full name to sign.").max(120, "Keep the name under 120 characters."),
  wantsPartsBack: checkbox,
  agree: checkbox.refine((v) => v, "Tick the box to confirm the wording was read and agreed."),
});
export type DropoffSignatureInput = z.infer<typeof dropoffSignatureFields>;
