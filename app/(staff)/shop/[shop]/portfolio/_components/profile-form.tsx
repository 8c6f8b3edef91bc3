"use client";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { Button, Field, Input, Textarea } from "@/components/ui";
import type { PublicShopRow } from "@/db/queries/portfolio-public";
import { saveProfileAction } from "../actions";
import { FORM_VISIBLE } from "@/lib/form-visible";

/** What the public page says about the shop: its name as shown, a few words, where, how to reach it, a logo. */
export function ProfileForm({ shopSlug, profile, logoUrl }: { shopSlug: string; profile: PublicShopRow; logoUrl: string | null }) {
  const form = useBenchForm(saveProfileAction, { visible: FORM_VISIBLE.shopProfile });
  const v = form.values;
  return (
    <form action={form.formAction} className="space-y-4">
      <input type="hidden" name="shop" value={shopSlug} />
      <FormError message={form.formError} />
      <Field id="profile-name" label="Name on the public page" hint={`Leave empty to use “${profile.name}”.`} error={form.fieldError("displayName")}>
        <Input name="displayName" defaultValue={v?.displayName ?? profile.displayName ?? ""} maxLength={120} />
      </Field>
      <Field id="profile-about" label="About the shop" hint="A few sentences: what you work on, how you like to work." error={form.fieldError("about")}>
        <Textarea name="about" defaultValue={v?.about ?? profile.about ?? ""} maxLength={2000} rows={5} />
      </Field>
      <Field id="profile-takes-in" label="What you take in" hint="Kinds of machines and work, e.g. “ATVs, dirt bikes and sleds; engine and suspension work, no bodywork”." error={form.fieldError("takesIn")}>
        <Textarea name="takesIn" defaultValue={v?.takesIn ?? profile.takesIn ?? ""} maxLength={600} rows={3} />
      </Field>
      <Field id="profile-location" label="Location, as you want it shown" hint="A town, a neighbourhood or a full address: your choice." error={form.fieldError("locationText")}>
        <Input name="locationText" defaultValue={v?.locationText ?? profile.locationText ?? ""} maxLength={200} />
      </Field>
      <label className="flex min-h-tap cursor-pointer items-center gap-3 font-semibold text-ink">
        <input type="checkbox" name="showLocation" className="size-6 accent-oil" defaultChecked={v ? v.showLocation === "on" : profile.showLocation} />
        Show the location on the public page
      </label>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id="profile-email" label="Public e-mail" error={form.fieldError("publicEmail")}>
          <Input name="publicEmail" type="email" autoComplete="off" defaultValue={v?.publicEmail ?? profile.publicEmail ?? ""} maxLength={254} />
        </Field>
        <Field id="profile-phone" label="Public phone" error={form.fieldError("publicPhone")}>
          <Input name="publicPhone" type="tel" autoComplete="off" defaultValue={v?.publicPhone ?? profile.publicPhone ?? ""} maxLength={40} />
        </Field>
      </div>
      <div className="space-y-2">
        {logoUrl ? (
          <div className="flex items-center gap-3">
            {/* eslint-disable-next-line @next/next/no-img-element -- the shop's public logo route */}
            <img src={logoUrl} alt="Current logo" width={64} height={64} className="size-16 rounded-lg border border-line object-contain" />
            <label className="flex min-h-tap cursor-pointer items-center gap-3">
              <input type="checkbox" name="removeLogo" className="size-6 accent-oil" />
              Remove the logo
            </label>
          </div>
        ) : null}
        <Field id="profile-logo" label={logoUrl ? "New logo (optional)" : "Logo (optional)"} hint="JPEG, PNG or WebP, under 5 MB. Saved without any photo metadata." error={form.fieldError("logo")}>
          <input name="logo" type="file" accept="image/jpeg,image/png,image/webp" className="block min-h-tap w-full text-base text-ink file:mr-3 file:min-h-tap file:rounded-lg file:border file:border-line-strong file:bg-surface file:px-4 file:font-semibold file:text-ink" />
        </Field>
      </div>
      <Button type="submit" loading={form.pending}>
        Save the profile
      </Button>
      {form.state?.ok ? <p role="status">Saved. The public page shows it now.</p> : null}
    </form>
  );
}
