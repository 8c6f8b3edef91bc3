"use client";
import { PenLine } from "lucide-react";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { Alert, Button, Field, Input } from "@/components/ui";
import type { ActionState } from "@/lib/action";
import { FORM_VISIBLE } from "@/lib/form-visible";

// Signing the drop-off authorisation: the typed name, parts back or not, and a tick that the
// wording was read (WCAG 3.3.4: nothing binding happens on a single slip). The same form on the
// desk's screen (the owner signs at the counter) and on the owner's own page (online).

type SignAction = (prev: ActionState<{ signed: boolean }>, formData: FormData) => Promise<ActionState<{ signed: boolean }>>;

export function DropoffSignForm({ action, jobPublicId, hash, ownerName, atCounter }: { action: SignAction; jobPublicId: string; hash: string; ownerName: string; atCounter: boolean }) {
  const form = useBenchForm(action, { visible: FORM_VISIBLE.dropoffSign });
  if (form.state?.ok) return <Alert tone="success">Signed. The record is kept with the job and printed on the invoice.</Alert>;
  const id = atCounter ? "counter" : "online";
  return (
    <form action={form.formAction} className="space-y-4" aria-label={atCounter ? "Owner signs at the counter" : "Sign the authorisation"}>
      <input type="hidden" name="job" value={jobPublicId} />
      <input type="hidden" name="shownHash" value={hash} />
      <FormError message={form.formError} />
      {atCounter ? <p className="text-ink-muted">Turn the screen to the owner: they read the wording above and type their name.</p> : null}
      <Field id={`${id}-signature`} label="Full name, typed as a signature" hint={`For example “${ownerName}”.`} error={form.fieldError("signature")} required>
        <Input name="signature" autoComplete={atCounter ? "off" : "name"} maxLength={120} defaultValue={form.values?.signature ?? ""} />
      </Field>
      <label className="flex min-h-tap cursor-pointer items-center gap-3 text-ink">
        <input type="checkbox" name="wantsPartsBack" className="size-6 accent-oil" defaultChecked={form.values?.wantsPartsBack === "on"} />I want the replaced parts back
      </label>
      <div>
        <label className="flex min-h-tap cursor-pointer items-center gap-3 font-semibold text-ink">
          <input type="checkbox" name="agree" className="size-6 accent-oil" aria-describedby={form.fieldError("agree") ? `${id}-agree-error` : undefined} aria-invalid={form.fieldError("agree") ? true : undefined} />I have read the wording above and agree to it
        </label>
        {form.fieldError("agree") ? (
          <p id={`${id}-agree-error`} className="mt-1 text-sm font-semibold text-rust">
            {form.fieldError("agree")}
          </p>
        ) : null}
      </div>
      <Button type="submit" size="lg" loading={form.pending} icon={<PenLine aria-hidden className="size-5" />}>
        Sign the authorisation
      </Button>
    </form>
  );
}
