"use client";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { Button, Field, Input } from "@/components/ui";
import { CONFIRM_SIGNUP_VISIBLE } from "@/lib/shop-signup";
import { confirmShopAction } from "../actions";

export function ConfirmShopForm({ token, email, existingAccount }: { token: string; email: string; existingAccount: boolean }) {
  const { formAction, pending, fieldError, formError } = useBenchForm(confirmShopAction, { visible: CONFIRM_SIGNUP_VISIBLE });
  return (
    <form action={formAction} className="space-y-4" noValidate>
      <input type="hidden" name="token" value={token} />
      {/* The address, for the browser's password manager. */}
      <input type="hidden" name="username" autoComplete="username" value={email} />
      <FormError message={formError} />
      <Field
        id="confirm-password"
        label={existingAccount ? "Your Benchside password" : "The password you chose"}
        hint={existingAccount ? "This address already has an account: enter the password you sign in with. The new shop is added to that account." : undefined}
        error={fieldError("password")}
        required
      >
        <Input name="password" type="password" autoComplete={existingAccount ? "current-password" : "new-password"} />
      </Field>
      <Button type="submit" size="lg" loading={pending} fullWidth>
        Create the shop and sign in
      </Button>
    </form>
  );
}
