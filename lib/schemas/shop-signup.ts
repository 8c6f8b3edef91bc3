import { z } from "zod";
import { RESERVED_SLUGS, SLUG_RULE } from "@/lib/shop-signup";
import { SUPPORTED_CURRENCIES, isTimeZone } from "@/lib/shop-settings";

// The "Start your shop" form and its confirmation (issue 16 §1). FormData, so everything is text.

const email = z
  .string({ error: "Enter your e-mail address." })
  .trim()
  .toLowerCase()
  .max(254, "That e-mail address is too long.")
  .pipe(z.email({ error: "Enter an e-mail address like you@yourshop.test." }));

export const shopSignupSchema = z.object({
  shopName: z.string({ error: "Enter the shop's name." }).trim().min(2, "Enter the shop's name, as customers know it.").max(120, "Keep the name under 120 characters."),
  slug: z
    .string({ error: "Choose the shop's address." })
    .trim()
    .toLowerCase()
    .refine((s) => s.length >= 3 && s.length <= 40, "Use 3 to 40 characters.")
    .refine((s) => SLUG_RULE.test(s), "Use lowercase letters, digits and single hyphens, starting and ending with a letter or digit.")
    .refine((s) => !RESERVED_SLUGS.has(s), "That address is kept for Benchside itself. Choose another."),
  timezone: z.string({ error: "Choose a time zone." }).trim().refine(isTimeZone, "Choose a time zone from the list, e.g. America/Denver."),
  currency: z.enum(SUPPORTED_CURRENCIES, { error: "Choose one of the listed currencies." }),
  ownerName: z.string({ error: "Enter your name." }).trim().min(1, "Enter your name.").max(120, "Keep your name under 120 characters."),
  email,
  // The length and common-password rules are checked on the server (lib/server/password.ts).
  password: z.string({ error: "Choose a password." }).min(1, "Choose a password.").max(400, "That password is too long."),
});
export type ShopSignupInput = z.output<typeof shopSignupSchema>;

export const signupTokenSchema = z.string().regex(/^[A-Za-z0-9_-]{43}$/, "This confirmation link is incomplete; open it again from the e-mail.");

export const confirmSignupSchema = z.object({
  token: signupTokenSchema,
  password: z.string({ error: "Enter your password." }).min(1, "Enter your password.").max(400, "That password is too long."),
});
