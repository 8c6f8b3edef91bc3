"use client";
import { useActionState } from "react";
import { Button, Field, Input } from "@/components/ui";
import { NewPasswordField } from "../sign-in/_components/new-password-field";
import { FormError, fieldError } from "../sign-in/_components/form-error";
import { FORM_VISIBLE } from "@/lib/form-visible";
import { acceptInviteAction } from "./actions";

// A button rather than accepting on page load: mail scanners that open links must not use up the invitation.
export function JoinForm({ token, name, email, needsPassword }: { token: string; name: string; email: string; needsPassword: boolean }) {
  const [state, action, pending] = useActionState(acceptInviteAction, null);
  const values = state && !state.ok ? state.values : undefined;
  return (
    <form action={action} className="space-y-4" noValidate>
      <input type="hidden" name="token" value={token} />
      <FormError state={state} visible={FORM_VISIBLE.acceptInvite} />
      <input type="email" name="username" autoComplete="username" value={email} readOnly hidden />
      <Field id="join-name" label="Your name" hint="As the shop will see it on jobs and in the journal." error={fieldError(state, "name")} required>
        <Input name="name" autoComplete="name" defaultValue={values?.name ?? name} maxLength={120} />
      </Field>
      {needsPassword ? (
        <NewPasswordField id="join-password" label="Choose a password" error={fieldError(state, "password")} />
      ) : null}
      <Button type="submit" size="lg" loading={pending} fullWidth>
        {needsPassword ? "Join and sign in" : "Join the shop"}
      </Button>
    </form>
  );
}
