import { z } from "zod";
import { STAFF_ROLES } from "@/lib/permissions";
import { SHOP_SLUG_PATTERN } from "@/lib/portfolio";
import { passwordSignInSchema } from "./auth";

// Forms of the staff page, the invitation and password pages (issue 16 §3). The password rules
// themselves (length, common passwords) are checked on the server: lib/password-rules.ts.

const shop = z.string().regex(SHOP_SLUG_PATTERN, "No such shop.");
const row = z.string().regex(/^[1-9]\d{0,14}$/, "No such item.").transform(Number);
const email = passwordSignInSchema.shape.email;
const role = z.enum(STAFF_ROLES, { error: "Choose a role." });
/** Long enough for any password the rules allow (100 characters of up to 2 UTF-16 units each). */
const newPassword = z.string({ error: "Choose a password." }).min(1, "Choose a password.").max(400, "Use at most 100 characters.");
const token = z.string().regex(/^[A-Za-z0-9_-]{43}$/, "This link is incomplete; open it again from the e-mail.");
const personName = z.string({ error: "Enter a name." }).trim().min(1, "Enter a name.").max(120, "Use at most 120 characters.");

export const inviteStaffSchema = z.object({ shop, email, name: personName, role });
export const staffRoleSchema = z.object({ shop, user: row, role });
export const staffMemberSchema = z.object({ shop, user: row });
export const revokeInviteSchema = z.object({ shop, invite: row });

export const acceptInviteSchema = z.object({ token, name: personName, password: newPassword.optional() });
export const passwordResetRequestSchema = z.object({ email });
export const passwordResetSchema = z.object({ token, password: newPassword });
export const changePasswordSchema = z.object({
  current: z.string({ error: "Enter your current password." }).min(1, "Enter your current password.").max(400, "That password is too long."),
  password: newPassword,
});
