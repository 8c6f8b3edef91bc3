"use server";
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { formAction } from "@/lib/action";
import { passwordResetRequestSchema, passwordResetSchema } from "@/lib/schemas/staff";
import { clientIp } from "@/lib/server/client-ip";
import { requestPasswordReset, resetPassword } from "@/lib/server/password-reset";

// Forgotten passwords, from the sign-in page. Public: the answer to a request is the same for
// every address (lib/server/password-reset.ts); links and requests are rate-limited.

export const requestPasswordResetAction = formAction({ input: passwordResetRequestSchema, permission: "public" }, async ({ input }) => {
  await requestPasswordReset({ email: input.email, ip: clientIp(await headers()) });
  redirect("/sign-in/forgot?sent=1");
});

/** A new password from the e-mailed link: every session of the person ends; they sign in with it. */
export const resetPasswordAction = formAction({ input: passwordResetSchema, permission: "public" }, async ({ input }) => {
  await resetPassword({ token: input.token, password: input.password, ip: clientIp(await headers()) });
  redirect("/sign-in?password=changed");
});
