"use client";
import { useState } from "react";
import { UserRound } from "lucide-react";
import { Alert, Button, Field, Input } from "@/components/ui";
import type { ActionState } from "@/lib/action";
import type { CustomerSearchResult } from "@/lib/schemas/check-in";
import { ChoiceCard, ChoiceGroup, FieldMessage, FormSection, fieldError } from "./form-bits";
import { useCustomerSearch } from "./use-customer-search";

export type OwnerMode = "existing" | "new";

type Props = {
  shopSlug: string;
  state: ActionState;
  mode: OwnerMode;
  onModeChange: (mode: OwnerMode) => void;
  customer: CustomerSearchResult | null;
  onCustomerChange: (customer: CustomerSearchResult | null) => void;
};

const contact = (c: { email: string | null; phone: string | null }) => [c.email, c.phone].filter(Boolean).join(" · ");

/** Step 1: an owner on file (searched by name, e-mail or phone) or a new one. */
export function OwnerSection({ shopSlug, state, mode, onModeChange, customer, onCustomerChange }: Props) {
  const [search, setSearch] = useState("");
  const values = state && !state.ok ? state.values : undefined;
  return (
    <FormSection id="owner-heading" title="Owner">
      <input type="hidden" name="customerMode" value={mode} />
      <ChoiceGroup id="owner-mode" legend="Whose machine is it?" error={fieldError(state, "customerMode")}>
        <ChoiceCard name="ownerChoice" value="existing" checked={mode === "existing"} onChange={() => onModeChange("existing")} title="Owner on file" detail="Search by name, e-mail or phone" />
        <ChoiceCard name="ownerChoice" value="new" checked={mode === "new"} onChange={() => onModeChange("new")} title="New owner" detail="First visit to this shop" />
      </ChoiceGroup>

      {mode === "existing" ? (
        customer ? (
          <div className="space-y-1.5">
            <div className="flex flex-wrap items-center justify-between gap-3 rounded-lg border-2 border-oil bg-oil-soft p-3">
              <input type="hidden" name="customerId" value={customer.id} />
              <div className="flex min-w-0 items-start gap-3">
                <UserRound aria-hidden className="mt-0.5 size-5 shrink-0 text-oil" />
                <div className="min-w-0">
                  <p className="font-semibold text-ink">{customer.name}</p>
                  <p className="break-words text-sm text-ink">{contact(customer) || "No e-mail or phone on file"}</p>
                </div>
              </div>
              <Button variant="secondary" onClick={() => onCustomerChange(null)}>
                Choose someone else
              </Button>
            </div>
            <FieldMessage id="customer-chosen-error" message={fieldError(state, "customerId")} />
          </div>
        ) : (
          <CustomerSearch shopSlug={shopSlug} search={search} onSearch={setSearch} error={fieldError(state, "customerId")} onPick={onCustomerChange} onNew={() => onModeChange("new")} />
        )
      ) : (
        <div className="space-y-4">
          {/* The owner's details, not the writer's: browser autofill would offer the wrong person. */}
          <Field id="customer-name" label="Owner's name" required error={fieldError(state, "customerName")}>
            <Input name="customerName" autoComplete="off" autoCapitalize="words" defaultValue={values?.customerName ?? search} maxLength={120} />
          </Field>
          <Field id="customer-email" label="E-mail" hint="They sign in with it to follow the job. Give an e-mail or a phone." error={fieldError(state, "customerEmail")}>
            <Input name="customerEmail" type="email" inputMode="email" autoComplete="off" autoCapitalize="none" spellCheck={false} defaultValue={values?.customerEmail} maxLength={254} />
          </Field>
          <Field id="customer-phone" label="Phone" error={fieldError(state, "customerPhone")}>
            <Input name="customerPhone" type="tel" inputMode="tel" autoComplete="off" defaultValue={values?.customerPhone} maxLength={40} />
          </Field>
        </div>
      )}
      <div className="space-y-1">
        <label className="flex min-h-tap cursor-pointer items-start gap-3 rounded-md px-1 py-2 hover:bg-sunken">
          <input type="checkbox" name="textConsent" value="yes" defaultChecked={values?.textConsent === "yes"} className="mt-0.5 size-6 shrink-0 accent-oil" aria-describedby={fieldError(state, "textConsent") ? "text-consent-error" : undefined} />
          <span>The owner agrees to texts about their machine at the phone number on file (approval requests, ready to collect, invoices, answers). Ask them; they can reply STOP at any time.</span>
        </label>
        <FieldMessage id="text-consent-error" message={fieldError(state, "textConsent")} />
      </div>
    </FormSection>
  );
}

function CustomerSearch(props: {
  shopSlug: string;
  search: string;
  onSearch: (text: string) => void;
  error?: string;
  onPick: (customer: CustomerSearchResult) => void;
  onNew: () => void;
}) {
  const { data, error, isLoading, settled } = useCustomerSearch(props.shopSlug, props.search);
  const found = data?.customers ?? [];
  const status = isLoading || !settled ? "Searching…" : found.length ? `${found.length} ${found.length === 1 ? "owner" : "owners"} shown` : "";
  return (
    <div className="space-y-3">
      <Field id="customer-search" label="Find the owner" hint="Name, e-mail or phone number" error={props.error}>
        <Input
          type="search"
          inputMode="search"
          autoComplete="off"
          value={props.search}
          onChange={(e) => props.onSearch(e.target.value)}
          // Enter here looks up the owner; it must not post the whole form.
          onKeyDown={(e) => e.key === "Enter" && e.preventDefault()}
          placeholder="e.g. Calloway or 555 013"
        />
      </Field>
      <p role="status" className="min-h-5 text-sm text-ink-muted">
        {status}
      </p>
      {error ? <Alert tone="error">{error.message}</Alert> : null}
      {found.length ? (
        <ul className="space-y-2" aria-label="Owners found">
          {found.map((c) => (
            <li key={c.id}>
              <button
                type="button"
                onClick={() => props.onPick(c)}
                className="flex min-h-tap w-full items-start gap-3 rounded-lg border border-line-strong bg-surface p-3 text-left hover:bg-sunken"
              >
                <UserRound aria-hidden className="mt-0.5 size-5 shrink-0 text-oil" />
                <span className="min-w-0">
                  <span className="block font-semibold text-ink">{c.name}</span>
                  <span className="block break-words text-sm text-ink-muted">
                    {[contact(c), `${c.machines.length} ${c.machines.length === 1 ? "machine" : "machines"}`].filter(Boolean).join(" · ")}
                  </span>
                </span>
              </button>
            </li>
          ))}
        </ul>
      ) : settled && !isLoading && !error ? (
        <Alert tone="info" title="No owner on file matches" action={<Button variant="secondary" onClick={props.onNew}>Add a new owner</Button>}>
          Check the spelling, or add them as a new owner.
        </Alert>
      ) : null}
    </div>
  );
}
