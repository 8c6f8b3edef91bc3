// The texts forms' inputs (lib/texts.ts holds the words): the owner's choice and consent on their page,
// and the shop's sender number, quiet hours and languages in the settings.
import { z } from "zod";
import { shopRef } from "@/lib/schemas/bench";
import { jobPublicIdField } from "@/lib/schemas/following";
import { LANGUAGE_LABEL, NOTIFY_CHANNELS, parseClock } from "@/lib/texts";

export const textChoiceSchema = z
  .object({
    job: jobPublicIdField,
    channels: z.enum(NOTIFY_CHANNELS, { message: "Choose e-mail, text or both." }),
    phone: z.string({ error: "Enter your mobile number" }).trim().max(40, "A phone number is at most 40 characters").optional(),
    consent: z.literal("yes", { message: "Tick the box to agree to texts, or choose e-mail only." }).optional(),
  })
  .superRefine((v, ctx) => {
    if (v.channels === "email") return;
    if (!v.phone) ctx.addIssue({ code: "custom", path: ["phone"], message: "Enter the mobile number to text." });
    if (v.consent !== "yes") ctx.addIssue({ code: "custom", path: ["consent"], message: "Tick the box to agree to texts, or choose e-mail only." });
  });
export type TextChoiceInput = z.infer<typeof textChoiceSchema>;

export const stopTextsSchema = z.object({ job: jobPublicIdField });

const clock = (what: string) =>
  z
    .string({ error: `Enter the time ${what}` })
    .trim()
    .refine((s) => parseClock(s) !== null, `Write the time ${what} as HH:MM, such as 21:00.`);

/** A language's box in the settings (English is always on, so has none): ticked or not, nothing else. */
const languageBox = (language: "es" | "fr") =>
  z
    .union([z.literal("on"), z.literal("")], { error: `Tick the box to text in ${LANGUAGE_LABEL[language]} too, or leave it empty.` })
    .optional()
    .transform((v) => v === "on");

export const textSettingsSchema = shopRef.extend({
  smsFrom: z
    .string()
    .trim()
    .max(16, "At most 16 characters: + and the number with its country code.")
    .refine((s) => s === "" || /^\+[1-9]\d{6,14}$/.test(s), "Write the number with + and its country code, such as +15550100777, or leave it empty.")
    .optional(),
  quietStart: clock("quiet hours start"),
  quietEnd: clock("quiet hours end"),
  languageEs: languageBox("es"),
  languageFr: languageBox("fr"),
});
export type TextSettingsInput = z.infer<typeof textSettingsSchema>;
