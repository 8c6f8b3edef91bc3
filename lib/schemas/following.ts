// The following forms' inputs (lib/following.ts holds the words and pure helpers): kept apart so
// the owner's client components can import lib/following.ts without zod.
import { z } from "zod";
import { FREQUENCIES } from "@/lib/following";

const email = z
  .string({ error: "Enter an e-mail address" })
  .trim()
  .toLowerCase()
  .max(254, "That e-mail address is too long")
  .pipe(z.email({ error: "That doesn't look like an e-mail address" }));

export const jobPublicIdField = z.string().regex(/^[A-Za-z0-9_-]{16}$/, "No such job.");
export const inviteFollowerSchema = z.object({ job: jobPublicIdField, email });
export const removeFollowerSchema = z.object({ job: jobPublicIdField, subscriber: z.coerce.number().int().positive("No such follower.") });
export const frequencySchema = z.object({
  job: jobPublicIdField,
  frequency: z.enum(FREQUENCIES, { message: "Choose how often you want e-mail." }),
});
