"use client";
import { useActionState } from "react";
import { Button, ButtonLink } from "@/components/ui";
import { signInWithLink } from "../actions";
import { FormError } from "../_components/form-error";
import { FORM_VISIBLE } from "@/lib/form-visible";

// A button rather than signing in on page load: mail scanners that open links
// must not use up the one-time token before the owner does.
export function LinkSignInForm({ token, next }: { token: string; next?: string }) {
  const [state, action, pending] = useActionState(signInWithLink, null);
  return (
    <form action={action} className="space-y-4">
      <input type="hidden" name="token" value={token} />
      {next ? <input type="hidden" name="next" value={next} /> : null}
      <FormError state={state} visible={FORM_VISIBLE.linkSignIn} />
      {state && !state.ok ? (
        <ButtonLink href="/sign-in" variant="secondary" fullWidth>
          Ask for a new link
        </ButtonLink>
      ) : (
        <Button type="submit" size="lg" loading={pending} fullWidth>
          Sign in and see my jobs
        </Button>
      )}
    </form>
  );
}
