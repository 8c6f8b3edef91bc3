"use client";
import { useActionState, useState } from "react";
import { Alert, Button, Field, Input } from "@/components/ui";
import { FREQUENCIES, FREQUENCY_HINT, FREQUENCY_LABEL, type Frequency } from "@/lib/following";
import { inviteFollowerAction, removeFollowerAction, setFrequencyAction } from "../following-actions";
import { FORM_VISIBLE, formBanner } from "@/lib/form-visible";

/** How often this person hears about the job; with e-mail stopped, the same choice starts it again. */
export function FrequencyForm({ jobPublicId, current }: { jobPublicId: string; current: Frequency | null }) {
  const [state, action, pending] = useActionState(setFrequencyAction, null);
  return (
    <form action={action} className="space-y-3">
      <input type="hidden" name="job" value={jobPublicId} />
      {current == null ? <p className="font-semibold">You get no e-mail about this job. Choose how often to start again.</p> : null}
      <fieldset className="space-y-1">
        <legend className="mb-1 font-semibold text-ink">How often you hear about it</legend>
        {FREQUENCIES.map((f) => (
          <label key={f} className="flex min-h-tap cursor-pointer items-start gap-3 rounded-md px-1 py-2 hover:bg-sunken">
            <input type="radio" name="frequency" value={f} defaultChecked={f === (current ?? "every")} className="mt-0.5 size-6 shrink-0 accent-oil" />
            <span>
              <span className="block font-semibold">{FREQUENCY_LABEL[f]}</span>
              <span className="block text-sm text-ink-muted">{FREQUENCY_HINT[f]}</span>
            </span>
          </label>
        ))}
      </fieldset>
      {state && !state.ok ? <Alert tone="error">{formBanner(state.error, FORM_VISIBLE.frequency)}</Alert> : null}
      {state?.ok ? <Alert tone="success">Saved: {FREQUENCY_LABEL[state.data.frequency].toLowerCase()}.</Alert> : null}
      <Button type="submit" variant="secondary" loading={pending}>
        {current == null ? "Start e-mails" : "Save"}
      </Button>
    </form>
  );
}

export function InviteFollowerForm({ jobPublicId }: { jobPublicId: string }) {
  const [state, action, pending] = useActionState(inviteFollowerAction, null);
  const error = state && !state.ok ? state.error : null;
  return (
    <form action={action} className="space-y-3" noValidate>
      <input type="hidden" name="job" value={jobPublicId} />
      {formBanner(error, FORM_VISIBLE.inviteFollower) ? <Alert tone="error">{formBanner(error, FORM_VISIBLE.inviteFollower)}</Alert> : null}
      {state?.ok ? <Alert tone="success">Invitation on its way to {state.data.invited}.</Alert> : null}
      <Field id="follower-email" label="Invite someone by e-mail" hint="They get an e-mail with a link to sign in and follow along." error={error?.fields?.email?.[0]}>
        <Input name="email" type="email" autoComplete="off" inputMode="email" defaultValue={state && !state.ok ? state.values?.email : ""} key={state?.ok ? state.data.invited : "form"} required />
      </Field>
      <Button type="submit" loading={pending}>
        Invite
      </Button>
    </form>
  );
}

/** Two steps, as every destructive action here: the first press asks, the second removes. */
export function RemoveFollowerButton({ jobPublicId, subscriberId, email }: { jobPublicId: string; subscriberId: number; email: string }) {
  const [state, action, pending] = useActionState(removeFollowerAction, null);
  const [asking, setAsking] = useState(false);
  if (!asking) {
    return (
      <Button type="button" variant="ghost" onClick={() => setAsking(true)} aria-label={`Remove ${email}`}>
        Remove
      </Button>
    );
  }
  return (
    <form action={action} className="flex flex-wrap items-center gap-2">
      <input type="hidden" name="job" value={jobPublicId} />
      <input type="hidden" name="subscriber" value={subscriberId} />
      {state && !state.ok ? <span className="text-sm text-rust">{formBanner(state.error, [])}</span> : null}
      <span className="text-sm">Stop sharing with {email}?</span>
      <Button type="submit" variant="danger" loading={pending}>
        Remove
      </Button>
      <Button type="button" variant="ghost" onClick={() => setAsking(false)}>
        Keep
      </Button>
    </form>
  );
}
