"use client";
import { useActionState } from "react";
import { Button } from "@/components/ui";
import { NewPasswordField } from "../_components/new-password-field";
import { resetPasswordAction } from "../password-actions";
import { FormError, fieldError } from "../_components/form-error";
import { FORM_VISIBLE } from "@/lib/form-visible";

export function ResetPasswordForm({ token, email }: { token: string; email: string }) {
  const [state, action, pending] = useActionState(resetPasswordAction, null);
  return (
    <form action={action} className="space-y-4" noValidate>
      <input type="hidden" name="token" value={token} />
      <input type="email" name="username" autoComplete="username" value={email} readOnly hidden />
      <FormError state={state} visible={FORM_VISIBLE.passwordReset} />
      <NewPasswordField id="reset-password" label="New password" error={fieldError(state, "password")} />
      <Button type="submit" size="lg" loading={pending} fullWidth>
        Save the new password
      </Button>
    </form>
  );
}
