"use client";
import { Check, Undo2, X } from "lucide-react";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { Alert, Button, Field, Input } from "@/components/ui";
import type { ConsentDecision } from "@/lib/portfolio";
import { consentAction } from "../actions";
import { FORM_VISIBLE } from "@/lib/form-visible";

const DONE: Record<ConsentDecision, string> = {
  given: "Thank you: the shop may now publish the story. You can withdraw at any time on this page.",
  refused: "Recorded: the shop won't show this job.",
  withdrawn: "Recorded: the story is no longer public, from now on.",
};

/** The owner signs their answer with their typed name; only the answers that apply now are offered. */
export function ConsentForm({ jobPublicId, ownerName, allowed, shownHash }: { jobPublicId: string; ownerName: string; allowed: ConsentDecision[]; shownHash: string }) {
  const form = useBenchForm(consentAction, { visible: FORM_VISIBLE.storyConsent });
  const done = form.state?.ok ? form.state.data.decision : null;
  return (
    <form action={form.formAction} className="space-y-4">
      <input type="hidden" name="job" value={jobPublicId} />
      <input type="hidden" name="shownHash" value={shownHash} />
      <FormError message={form.formError} />
      {done ? <Alert tone="success">{DONE[done]}</Alert> : null}
      <Field id="consent-name" label="Type your full name to sign your answer" hint={`For example “${ownerName}”. It is kept with your answer and never shown in public.`} error={form.fieldError("name")} required>
        <Input name="name" autoComplete="name" maxLength={120} defaultValue={form.values?.name ?? ""} />
      </Field>
      <div className="flex flex-col gap-2 sm:flex-row sm:flex-wrap">
        {allowed.includes("given") ? (
          <Button type="submit" name="decision" value="given" size="lg" loading={form.pending} icon={<Check aria-hidden className="size-5" />}>
            Yes, the shop may show it
          </Button>
        ) : null}
        {allowed.includes("refused") ? (
          <Button type="submit" name="decision" value="refused" size="lg" variant="secondary" disabled={form.pending} icon={<X aria-hidden className="size-5" />}>
            No, keep it private
          </Button>
        ) : null}
        {allowed.includes("withdrawn") ? (
          <Button type="submit" name="decision" value="withdrawn" size="lg" variant="danger" loading={form.pending} icon={<Undo2 aria-hidden className="size-5" />}>
            Withdraw my consent
          </Button>
        ) : null}
      </div>
    </form>
  );
}
