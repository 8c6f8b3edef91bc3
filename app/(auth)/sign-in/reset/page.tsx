import type { Metadata } from "next";
import { headers } from "next/headers";
import { Alert, ButtonLink } from "@/components/ui";
import { AppError } from "@/lib/errors";
import { passwordResetSchema } from "@/lib/schemas/staff";
import { clientIp } from "@/lib/server/client-ip";
import { RESET_REFUSALS, viewPasswordReset } from "@/lib/server/password-reset";
import { ResetPasswordForm } from "./reset-form";

export const metadata: Metadata = { title: "Choose a new password" };

/** The page a reset e-mail links to. Looking at it uses nothing up; saving does. */
export default async function ResetPasswordPage({ searchParams }: { searchParams: Promise<{ token?: string }> }) {
  const token = passwordResetSchema.shape.token.safeParse((await searchParams).token);
  let problem: string = RESET_REFUSALS.unknown;
  let email: string | null = null;
  if (token.success) {
    try {
      const found = await viewPasswordReset({ token: token.data, ip: clientIp(await headers()) });
      if (found.ok) email = found.email;
      else problem = RESET_REFUSALS[found.reason];
    } catch (error) {
      if (!(error instanceof AppError && error.code === "rate_limited")) throw error;
      problem = error.message;
    }
  }
  return (
    <div className="mx-auto max-w-md space-y-4">
      <h1 className="text-2xl font-bold">Choose a new password</h1>
      {email && token.success ? (
        <>
          <p>For {email}. Saving it signs you out on every phone and computer; then sign in with the new password.</p>
          <ResetPasswordForm token={token.data} email={email} />
        </>
      ) : (
        <Alert tone="error" action={<ButtonLink href="/sign-in/forgot">Ask for a new link</ButtonLink>}>
          {problem}
        </Alert>
      )}
    </div>
  );
}
