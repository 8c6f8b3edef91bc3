"use client";
import { useActionState } from "react";
import { Button, Field, Input } from "@/components/ui";
import { requestPasswordResetAction } from "../password-actions";
import { FormError, fieldError } from "../_components/form-error";
import { FORM_VISIBLE } from "@/lib/form-visible";

export function ForgotPasswordForm() {
  const [state, action, pending] = useActionState(requestPasswordResetAction, null);
  const values = state && !state.ok ? state.values : undefined;
  return (
    <form action={action} className="space-y-4" noValidate>
      <FormError state={state} visible={FORM_VISIBLE.passwordResetRequest} />
      <Field id="forgot-email" label="E-mail" error={fieldError(state, "email")} required>
        <Input name="email" type="email" inputMode="email" autoComplete="username" defaultValue={values?.email} />
      </Field>
      <Button type="submit" loading={pending} fullWidth>
        Send me a link
      </Button>
    </form>
  );
}
