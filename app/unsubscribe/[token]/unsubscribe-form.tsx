"use client";
import { useActionState } from "react";
import { Alert, Button } from "@/components/ui";
import { unsubscribeAction } from "./actions";
import { formBanner } from "@/lib/form-visible";

export function UnsubscribeForm({ token, already }: { token: string; already: boolean }) {
  const [state, action, pending] = useActionState(unsubscribeAction, null);
  if (state?.ok || already) {
    return <Alert tone="success">You won&apos;t get any more e-mail about this job. To start again, open the job page and choose how often.</Alert>;
  }
  return (
    <form action={action} className="space-y-4">
      <input type="hidden" name="token" value={token} />
      {state && !state.ok ? <Alert tone="error">{formBanner(state.error, [])}</Alert> : null}
      <Button type="submit" size="lg" variant="danger" loading={pending} fullWidth>
        Stop e-mails about this job
      </Button>
    </form>
  );
}
