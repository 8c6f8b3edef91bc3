"use client";
import { useActionState } from "react";
import { Button, Field, Input } from "@/components/ui";
import { requestOwnerLink } from "../actions";
import { FormError, fieldError } from "./form-error";
import { FORM_VISIBLE } from "@/lib/form-visible";

export function OwnerLinkForm({ next }: { next?: string }) {
  const [state, action, pending] = useActionState(requestOwnerLink, null);
  const values = state && !state.ok ? state.values : undefined;
  const emailError = fieldError(state, "email");
  return (
    <form action={action} className="space-y-4" noValidate>
      {next ? <input type="hidden" name="next" value={next} /> : null}
      {emailError ? null : <FormError state={state} visible={FORM_VISIBLE.ownerLink} />}
      <Field
        id="owner-email"
        label="E-mail you gave the shop"
        hint="We'll e-mail you a link that signs you in. No password needed."
        error={emailError}
      >
        <Input name="email" type="email" autoComplete="email" inputMode="email" defaultValue={values?.email} required />
      </Field>
      <Button type="submit" variant="secondary" loading={pending} fullWidth>
        E-mail me a sign-in link
      </Button>
    </form>
  );
}
