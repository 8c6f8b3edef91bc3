import { z } from "zod";
import { CONTACT_PREFERENCES, type ContactPreference } from "@/lib/customers";
import { email, phone } from "@/lib/schemas/check-in";

// The customer list's query, the contact form and the merge form. Field names are the forms'
// input names, so every message lands beside its own field.

export const CUSTOMER_PAGE_SIZE = 25;

/** Search params of /shop/[shop]/customers. */
export const customerListQuerySchema = z.object({
  q: z.string().trim().max(100, "Search is limited to 100 characters").optional().default(""),
  page: z.coerce.number().int().min(1).max(100_000).optional().default(1),
});
export type CustomerListQuery = z.output<typeof customerListQuerySchema>;

const blank = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);
const optional = <T extends z.ZodType>(schema: T) => z.preprocess(blank, schema.optional());

/** The shop's address the forms post beside their fields (filled by the form). */
const shopField = z.string({ error: "Reload the page: the form lost its shop." }).max(60, "Reload the page: the form lost its shop.");

/** A customer or machine id in a path or form: positive, at most 10 digits. */
export const recordIdParam = z.string().regex(/^[1-9]\d{0,9}$/, "No such record.");

const contactFields = z.object({
  name: z.string({ error: "Enter the owner's name" }).trim().min(1, "Enter the owner's name").max(120, "A name is at most 120 characters"),
  email: optional(email),
  phone: optional(phone),
  contactPreference: optional(
    z.enum(CONTACT_PREFERENCES, {
      error: "Pick e-mail, phone call or text message",
    }),
  ),
});

/** A way to reach them, and the way they prefer must be one on file; each message on the field to fix. */
function contactRules(v: z.output<typeof contactFields>, ctx: z.RefinementCtx) {
  const need = (path: string, message: string) => ctx.addIssue({ code: "custom", path: [path], message });
  if (!v.email && !v.phone) need("email", "Give an e-mail or a phone number so the shop can reach the owner");
  if (v.contactPreference === "email" && !v.email) need("contactPreference", "Add an e-mail address to be reached by e-mail");
  if ((v.contactPreference === "phone" || v.contactPreference === "text") && !v.phone) need("contactPreference", "Add a phone number to be called or texted");
}

export type ContactInput = {
  name: string;
  email: string | null;
  phone: string | null;
  contactPreference: ContactPreference | null;
};

/** The contact form as it posts: the shop and customer beside the fields. */
export const contactFormSchema = contactFields
  .extend({ shop: shopField, customer: recordIdParam })
  .superRefine(contactRules)
  .transform((v) => ({
    shop: v.shop,
    customer: v.customer,
    contact: {
      name: v.name,
      email: v.email ?? null,
      phone: v.phone ?? null,
      contactPreference: v.contactPreference ?? null,
    } satisfies ContactInput,
  }));

/** Merge: the record kept (`customer`, resolved) and the duplicate folded into it. */
export const mergeFormSchema = z.object({
  shop: shopField,
  customer: recordIdParam,
  duplicate: z
    .string({ error: "Pick the duplicate record to merge" })
    .trim()
    .regex(/^[1-9]\d{0,9}$/, "Pick the duplicate record to merge")
    .transform(Number),
  confirm: z.literal("yes", { error: "Tick the box to confirm the merge" }),
});
