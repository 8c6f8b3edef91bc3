import type { Metadata } from "next";
import { Alert, ButtonLink } from "@/components/ui";
import { RESET_REQUEST_ANSWER } from "@/lib/server/password-reset";
import { ForgotPasswordForm } from "./forgot-form";

export const metadata: Metadata = { title: "Forgot your password?" };

/** Asks for a link to choose a new password; the answer is the same for every address. */
export default async function ForgotPasswordPage({ searchParams }: { searchParams: Promise<{ sent?: string }> }) {
  const sent = (await searchParams).sent === "1";
  return (
    <div className="mx-auto max-w-md space-y-4">
      <h1 className="text-2xl font-bold">Forgot your password?</h1>
      {sent ? (
        <Alert tone="success" title="Check your e-mail" action={<ButtonLink href="/sign-in" variant="secondary">Back to sign-in</ButtonLink>}>
          {RESET_REQUEST_ANSWER}
        </Alert>
      ) : (
        <>
          <p>Enter the e-mail address you sign in with. We&apos;ll send a link to choose a new password.</p>
          <ForgotPasswordForm />
        </>
      )}
    </div>
  );
}
