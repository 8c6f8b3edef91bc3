"use client";
import { useActionState } from "react";
import { Alert, Button, Field, Input } from "@/components/ui";
import { FORM_VISIBLE, formBanner } from "@/lib/form-visible";
import { CONSENT_WORDING, NOTIFY_CHANNELS, NOTIFY_CHANNEL_LABEL, type NotifyChannels } from "@/lib/texts";
import { chooseTextsAction, stopTextsAction } from "../actions";

export function ChooseTextsForm({ jobPublicId, channels, phone }: { jobPublicId: string; channels: NotifyChannels; phone: string }) {
  const [state, action, pending] = useActionState(chooseTextsAction, null);
  const error = state && !state.ok ? state.error : null;
  const banner = formBanner(error, FORM_VISIBLE.textChoice);
  return (
    <form action={action} className="space-y-4" noValidate>
      <input type="hidden" name="job" value={jobPublicId} />
      {banner ? <Alert tone="error">{banner}</Alert> : null}
      {state?.ok ? <Alert tone="success">Saved: {NOTIFY_CHANNEL_LABEL[state.data.channels].toLowerCase()}.</Alert> : null}
      <fieldset className="space-y-1" aria-describedby={error?.fields?.channels ? "channels-error" : undefined}>
        <legend className="mb-1 font-semibold text-ink">How to reach you</legend>
        {NOTIFY_CHANNELS.map((c) => (
          <label key={c} className="flex min-h-tap cursor-pointer items-center gap-3 rounded-md px-1 py-2 hover:bg-sunken">
            <input type="radio" name="channels" value={c} defaultChecked={c === channels} className="size-6 shrink-0 accent-oil" />
            <span className="font-semibold">{NOTIFY_CHANNEL_LABEL[c]}</span>
          </label>
        ))}
        {error?.fields?.channels ? (
          <p id="channels-error" className="text-sm text-rust">
            {error.fields.channels[0]}
          </p>
        ) : null}
      </fieldset>
      <Field id="texts-phone" label="Mobile number for texts" hint="With the country code if you are outside North America, such as +44 7700 900123." error={error?.fields?.phone?.[0]}>
        <Input name="phone" type="tel" autoComplete="tel" inputMode="tel" defaultValue={phone} />
      </Field>
      <div className="space-y-1">
        <label className="flex min-h-tap cursor-pointer items-start gap-3 rounded-md px-1 py-2 hover:bg-sunken">
          <input type="checkbox" name="consent" value="yes" className="mt-0.5 size-6 shrink-0 accent-oil" aria-describedby={error?.fields?.consent ? "consent-error" : undefined} />
          <span>{CONSENT_WORDING}</span>
        </label>
        {error?.fields?.consent ? (
          <p id="consent-error" className="text-sm text-rust">
            {error.fields.consent[0]}
          </p>
        ) : null}
      </div>
      <Button type="submit" loading={pending}>
        Save
      </Button>
    </form>
  );
}

/** Stops texts at once (the same as texting STOP). */
export function StopTextsButton({ jobPublicId }: { jobPublicId: string }) {
  const [state, action, pending] = useActionState(stopTextsAction, null);
  return (
    <form action={action} className="mt-3 space-y-2">
      <input type="hidden" name="job" value={jobPublicId} />
      {state && !state.ok ? <Alert tone="error">{formBanner(state.error, [])}</Alert> : null}
      {state?.ok ? <Alert tone="success">Texts stopped. You get e-mail instead.</Alert> : null}
      <Button type="submit" variant="secondary" loading={pending}>
        Stop texts
      </Button>
    </form>
  );
}
