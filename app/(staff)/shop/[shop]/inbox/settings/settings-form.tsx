"use client";
import { useActionState } from "react";
import { Save } from "lucide-react";
import { Alert, Button } from "@/components/ui";
import { DELIVERY_LABEL } from "@/lib/inbox";
import { DELIVERIES, type Delivery, INBOX_KINDS, INBOX_KIND_LABEL, type InboxKind } from "@/lib/shop-events";
import { saveInboxSettingsAction } from "../actions";
import { FORM_VISIBLE, formBanner } from "@/lib/form-visible";

/** One group of three choices per kind; radios stack on a phone. */
export function SettingsForm({ shopSlug, deliveries, mayViewMoney }: { shopSlug: string; deliveries: Record<InboxKind, Delivery>; mayViewMoney: boolean }) {
  const [state, action, pending] = useActionState(saveInboxSettingsAction, null);
  // After a refused save, the form shows what was sent, not what is stored.
  const chosen = (kind: InboxKind): Delivery => {
    const sent = state && !state.ok ? state.values?.[kind] : undefined;
    return (DELIVERIES as readonly string[]).includes(sent ?? "") ? (sent as Delivery) : deliveries[kind];
  };
  return (
    <form action={action} className="space-y-4">
      <input type="hidden" name="shop" value={shopSlug} />
      {mayViewMoney ? null : <Alert tone="info">Payment e-mails to you say what happened, without the amounts.</Alert>}
      <div className="grid gap-3 md:grid-cols-2">
        {INBOX_KINDS.map((kind) => (
          <fieldset key={`${kind}-${chosen(kind)}`} className="rounded-xl border border-line bg-surface p-3 sm:p-4">
            <legend className="px-1 font-bold text-ink">{INBOX_KIND_LABEL[kind]}</legend>
            <div className="flex flex-col gap-1">
              {DELIVERIES.map((d) => (
                <label key={d} className="flex min-h-tap items-center gap-3 rounded-lg px-2 text-ink hover:bg-sunken">
                  <input type="radio" name={kind} value={d} defaultChecked={chosen(kind) === d} className="size-5 accent-oil" />
                  {DELIVERY_LABEL[d]}
                </label>
              ))}
            </div>
            {state && !state.ok && state.error.fields?.[kind] ? (
              <p role="alert" className="mt-1 text-sm text-rust">
                {state.error.fields[kind]![0]}
              </p>
            ) : null}
          </fieldset>
        ))}
      </div>
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" loading={pending} icon={<Save aria-hidden className="size-5" />}>
          Save settings
        </Button>
        <p aria-live="polite" className="text-ink-muted">
          {state?.ok ? "Saved." : null}
        </p>
        {state && !state.ok && formBanner(state.error, FORM_VISIBLE.inboxSettings) ? (
          <p role="alert" className="text-rust">
            {formBanner(state.error, FORM_VISIBLE.inboxSettings)}
          </p>
        ) : null}
      </div>
    </form>
  );
}
