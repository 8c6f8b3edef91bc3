"use client";
import { useEffect, useRef, useState } from "react";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { Button, Field, Input, PlainOptions, Select } from "@/components/ui";
import { PASSWORD_MIN_LENGTH } from "@/lib/password-rules";
import { SHOP_SIGNUP_VISIBLE, suggestSlug } from "@/lib/shop-signup";
import { startShopAction } from "../actions";

type Props = { zones: string[]; currencies: readonly string[]; appOrigin: string };

export function StartShopForm({ zones, currencies, appOrigin }: Props) {
  const { formAction, pending, values, fieldError: err, formError } = useBenchForm(startShopAction, { visible: SHOP_SIGNUP_VISIBLE });
  const [name, setName] = useState(values?.shopName ?? "");
  const [slug, setSlug] = useState(values?.slug ?? "");
  const slugEdited = useRef(!!values?.slug);
  const zoneRef = useRef<HTMLSelectElement>(null);

  // The browser's own zone as the default, unless the form came back with one chosen.
  useEffect(() => {
    const zone = Intl.DateTimeFormat().resolvedOptions().timeZone;
    if (!values?.timezone && zoneRef.current && zones.includes(zone)) zoneRef.current.value = zone;
  }, [values?.timezone, zones]);

  return (
    <form action={formAction} className="space-y-5" noValidate>
      <FormError message={formError} />
      <fieldset className="space-y-4">
        <legend className="mb-2 text-lg font-bold">The shop</legend>
        <Field id="start-shop-name" label="Shop name" error={err("shopName")} required>
          <Input
            name="shopName"
            autoComplete="organization"
            maxLength={120}
            value={name}
            onChange={(e) => {
              setName(e.target.value);
              if (!slugEdited.current) setSlug(suggestSlug(e.target.value));
            }}
          />
        </Field>
        <Field
          id="start-slug"
          label="Address for links"
          hint={`Lowercase letters, digits and hyphens. Your public page: ${appOrigin}/s/${slug || "your-shop"}`}
          error={err("slug")}
          required
        >
          <Input
            name="slug"
            autoCapitalize="none"
            spellCheck={false}
            maxLength={40}
            value={slug}
            onChange={(e) => {
              slugEdited.current = true;
              setSlug(e.target.value.toLowerCase());
            }}
          />
        </Field>
        <div className="grid gap-4 sm:grid-cols-2">
          <Field id="start-timezone" label="Time zone" hint="The shop's clock: dates on invoices, morning mail" error={err("timezone")} required>
            <Select name="timezone" ref={zoneRef} defaultValue={values?.timezone ?? "UTC"}>
              <PlainOptions values={zones} />
            </Select>
          </Field>
          <Field id="start-currency" label="Currency" hint="Prices and invoices; change it before the first estimate" error={err("currency")} required>
            <Select name="currency" defaultValue={values?.currency ?? "USD"}>
              <PlainOptions values={currencies} />
            </Select>
          </Field>
        </div>
      </fieldset>
      <fieldset className="space-y-4">
        <legend className="mb-2 text-lg font-bold">You, the owner</legend>
        <Field id="start-owner-name" label="Your name" error={err("ownerName")} required>
          <Input name="ownerName" autoComplete="name" maxLength={120} defaultValue={values?.ownerName} />
        </Field>
        <Field id="start-email" label="E-mail" hint="We send a link here to confirm it is yours." error={err("email")} required>
          <Input name="email" type="email" autoComplete="email" inputMode="email" defaultValue={values?.email} />
        </Field>
        <Field
          id="start-password"
          label="Password"
          hint={`At least ${PASSWORD_MIN_LENGTH} characters; a few ordinary words in a row work well. Commonly used passwords are refused.`}
          error={err("password")}
          required
        >
          <Input name="password" type="password" autoComplete="new-password" />
        </Field>
      </fieldset>
      <Button type="submit" size="lg" loading={pending} fullWidth>
        Start the shop
      </Button>
    </form>
  );
}
