"use client";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { Alert, Button, Field, Input, Textarea } from "@/components/ui";
import { BOOKING_VISIBLE } from "@/lib/booking";
import { requestBookingAction } from "../booking-actions";

/** The public page's booking request: a few fields, sent to the shop's desk inbox. */
export function BookingForm({ shop, ticket }: { shop: string; ticket: string }) {
  const { state, formAction, pending, values, fieldError: err, formError } = useBenchForm(requestBookingAction, { visible: BOOKING_VISIBLE });
  if (state?.ok) return <Alert tone="success">{state.data.message}</Alert>;
  return (
    <form action={formAction} className="space-y-4" noValidate>
      <input type="hidden" name="shop" value={shop} />
      <input type="hidden" name="ticket" value={ticket} />
      {/* The honeypot: off-screen, out of the tab order and hidden from screen readers; people leave it empty. */}
      <div aria-hidden className="absolute -left-[9999px] h-px w-px overflow-hidden">
        <label>
          Website
          <input type="text" name="website" tabIndex={-1} autoComplete="off" defaultValue="" />
        </label>
      </div>
      <FormError message={formError} />
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id="booking-name" label="Your name" error={err("name")} required>
          <Input name="name" autoComplete="name" maxLength={120} defaultValue={values?.name} />
        </Field>
        <Field id="booking-email" label="E-mail" error={err("email")} required>
          <Input name="email" type="email" inputMode="email" autoComplete="email" defaultValue={values?.email} />
        </Field>
        <Field id="booking-phone" label="Phone" hint="If you'd rather be called" error={err("phone")}>
          <Input name="phone" type="tel" autoComplete="tel" maxLength={40} defaultValue={values?.phone} />
        </Field>
        <Field id="booking-when" label="When suits you" hint="e.g. any weekday morning" error={err("when")}>
          <Input name="when" maxLength={120} defaultValue={values?.when} />
        </Field>
      </div>
      <Field id="booking-machine" label="Machine" hint="Make, model and year if you know them" error={err("machine")} required>
        <Input name="machine" maxLength={160} defaultValue={values?.machine} />
      </Field>
      <Field id="booking-work" label="What it needs" error={err("work")} required>
        <Textarea name="work" maxLength={1000} rows={4} defaultValue={values?.work} />
      </Field>
      <Button type="submit" loading={pending}>
        Ask for a booking
      </Button>
    </form>
  );
}
