"use client";
import Link from "next/link";
import { useActionState } from "react";
import { Button, Field, Input } from "@/components/ui";
import { signInWithPassword } from "../actions";
import { FormError, fieldError } from "./form-error";
import { FORM_VISIBLE } from "@/lib/form-visible";

export function StaffSignInForm({ next }: { next?: string }) {
  const [state, action, pending] = useActionState(signInWithPassword, null);
  const values = state && !state.ok ? state.values : undefined;
  return (
    <form action={action} className="space-y-4" noValidate>
      {next ? <input type="hidden" name="next" value={next} /> : null}
      <FormError state={state} visible={FORM_VISIBLE.passwordSignIn} />
      <Field id="staff-email" label="E-mail" error={fieldError(state, "email")}>
        <Input name="email" type="email" autoComplete="username" inputMode="email" defaultValue={values?.email} required />
      </Field>
      <Field id="staff-password" label="Password" error={fieldError(state, "password")}>
        <Input name="password" type="password" autoComplete="current-password" required />
      </Field>
      <Button type="submit" loading={pending} fullWidth>
        Sign in
      </Button>
      <p className="text-sm">
        <Link href="/sign-in/forgot" className="inline-flex min-h-tap items-center font-semibold text-oil underline underline-offset-2 hover:no-underline">
          Forgot your password?
        </Link>
      </p>
    </form>
  );
}
