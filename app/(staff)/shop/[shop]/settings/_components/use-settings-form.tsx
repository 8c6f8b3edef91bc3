"use client";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { Button } from "@/components/ui";
import type { ActionState } from "@/lib/action";
import { FORM_FIELDS } from "@/lib/schemas/form-fields";

// What every settings section's form shares: the action state with its visible fields (so a
// message about anything else lands in the banner), the shop's hidden field, and the save row.

type Action = (prev: ActionState<{ saved: boolean }>, formData: FormData) => Promise<ActionState<{ saved: boolean }>>;

export function useSettingsForm(action: Action, form: keyof typeof FORM_FIELDS) {
  return useBenchForm(action, { visible: FORM_FIELDS[form].visible });
}

type Form = ReturnType<typeof useSettingsForm>;

export function SettingsFormTop({ form, shopSlug }: { form: Form; shopSlug: string }) {
  return (
    <>
      <input type="hidden" name="shop" value={shopSlug} />
      <FormError message={form.formError} />
    </>
  );
}

export function SaveRow({ form, label }: { form: Form; label: string }) {
  return (
    <div className="flex flex-wrap items-center gap-3">
      <Button type="submit" loading={form.pending}>
        {label}
      </Button>
      {form.state?.ok ? <p role="status">Saved. New estimates and invoices use it; issued ones keep what they were issued with.</p> : null}
    </div>
  );
}

export function Checkbox({ name, label, defaultChecked, error }: { name: string; label: string; defaultChecked: boolean; error?: string }) {
  const errorId = `${name}-error`;
  return (
    <div>
      <label className="flex min-h-tap items-center gap-2">
        <input type="checkbox" name={name} defaultChecked={defaultChecked} className="size-5" aria-describedby={error ? errorId : undefined} aria-invalid={error ? true : undefined} />
        {label}
      </label>
      {error ? (
        <p id={errorId} className="text-sm font-medium text-rust">
          {error}
        </p>
      ) : null}
    </div>
  );
}
