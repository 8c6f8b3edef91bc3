"use client";
import { useActionState } from "react";
import { Save } from "lucide-react";
import { Alert, Button, Field, Input, Select } from "@/components/ui";
import { CONTACT_PREFERENCES, CONTACT_PREFERENCE_LABEL, type ContactPreference } from "@/lib/customers";
import { FORM_FIELDS } from "@/lib/schemas/form-fields";
import { saveContactAction } from "../actions";
import { bannerText } from "./banner";

const VISIBLE: readonly string[] = FORM_FIELDS.customerContact.visible;

type Contact = {
  name: string;
  email: string | null;
  phone: string | null;
  contactPreference: ContactPreference | null;
};

/** The customer's contact details; each refusal shows beside its field, and a refused form keeps what was typed. */
export function ContactForm({ shopSlug, customerId, contact }: { shopSlug: string; customerId: number; contact: Contact }) {
  const [state, action, pending] = useActionState(saveContactAction, null);
  const sent = state && !state.ok ? state.values : undefined;
  const value = (key: keyof Contact) => sent?.[key] ?? contact[key] ?? "";
  const err = (key: string) => (state && !state.ok ? state.error.fields?.[key]?.[0] : undefined);
  // Remount after each answer so defaults show what was sent (refused) or saved.
  const round = state ? (state.ok ? "saved" : `refused-${JSON.stringify(sent)}`) : "first";
  return (
    <form action={action} className="space-y-4" key={round}>
      <input type="hidden" name="shop" value={shopSlug} />
      <input type="hidden" name="customer" value={customerId} />
      {state && !state.ok ? <Alert tone="error">{bannerText(state.error, VISIBLE)}</Alert> : null}
      <div className="grid gap-4 md:grid-cols-2">
        <Field id="contact-name" label="Name" required error={err("name")}>
          <Input name="name" maxLength={120} autoComplete="off" defaultValue={value("name")} />
        </Field>
        <Field id="contact-preference" label="Prefers to be reached by" error={err("contactPreference")}>
          <Select name="contactPreference" defaultValue={value("contactPreference")}>
            <option value="">Not asked yet</option>
            {CONTACT_PREFERENCES.map((p) => (
              <option key={p} value={p}>
                {CONTACT_PREFERENCE_LABEL[p]}
              </option>
            ))}
          </Select>
        </Field>
        <Field id="contact-email" label="E-mail" hint="Job updates and approval requests go here." error={err("email")}>
          <Input name="email" type="email" maxLength={254} autoComplete="off" defaultValue={value("email")} />
        </Field>
        <Field id="contact-phone" label="Phone" error={err("phone")}>
          <Input name="phone" type="tel" maxLength={40} autoComplete="off" defaultValue={value("phone")} />
        </Field>
      </div>
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" loading={pending} icon={<Save aria-hidden className="size-5" />}>
          Save contact details
        </Button>
        <p aria-live="polite" className="text-ink-muted">
          {state?.ok ? "Saved." : null}
        </p>
      </div>
    </form>
  );
}
