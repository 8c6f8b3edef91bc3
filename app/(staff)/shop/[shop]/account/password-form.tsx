"use client";
import { useActionState } from "react";
import { Alert, Button, Field, Input } from "@/components/ui";
import { FormError, fieldError } from "@/app/(auth)/sign-in/_components/form-error";
import { FORM_VISIBLE } from "@/lib/form-visible";
import { NewPasswordField } from "@/app/(auth)/sign-in/_components/new-password-field";
import { changeOwnPasswordAction } from "./actions";

export function ChangePasswordForm() {
  const [state, action, pending] = useActionState(changeOwnPasswordAction, null);
  return (
    <form action={action} className="max-w-md space-y-4" noValidate>
      <FormError state={state} visible={FORM_VISIBLE.changePassword} />
      {state?.ok ? (
        <Alert tone="success">
          Password changed.{" "}
          {state.data.otherSessionsEnded > 0 ? `Signed out on ${state.data.otherSessionsEnded} other device${state.data.otherSessionsEnded === 1 ? "" : "s"} or browser${state.data.otherSessionsEnded === 1 ? "" : "s"}.` : "You stay signed in here."}
        </Alert>
      ) : null}
      <Field id="current-password" label="Current password" error={fieldError(state, "current")} required>
        <Input name="current" type="password" autoComplete="current-password" />
      </Field>
      <NewPasswordField id="new-password" label="New password" error={fieldError(state, "password")} />
      <Button type="submit" loading={pending}>
        Change password
      </Button>
    </form>
  );
}
