"use client";
import { useEffect, useState } from "react";
import { FormError, useBenchForm } from "@/components/bench/action-form";
import { Alert, Button, Field, Input, Textarea } from "@/components/ui";
import { BOOKING_VISIBLE } from "@/lib/booking";
import { requestBookingAction } from "../booking-actions";

/**
 * The public page's booking request: a few fields, sent to the shop's desk inbox. The page is
 * cached for everyone, so the form's ticket (signed with the time this visitor opened it, for the
 * "too quick to be a person" check) is fetched once the form is on screen, not baked into the page.
 */
export function BookingForm({ shop }: { shop: string }) {
  const { state, formAction, pending, values, fieldError: err, formError } = useBenchForm(requestBookingAction, { visible: BOOKING_VISIBLE });
  const ticket = useBookingTicket(shop);
  if (state?.ok) return <Alert tone="success">{state.data.message}</Alert>;
  return (
    <form action={formAction} className="space-y-4" noValidate>
      <input type="hidden" name="shop" value={shop} />
      <input type="hidden" name="ticket" value={ticket} />
      <noscript>
        <p className="text-ink-muted">This form needs JavaScript. You can also reach the shop by phone or e-mail, above.</p>
      </noscript>
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

/** A fresh ticket for this visitor; empty until it arrives (a form sent without one is told to reload). */
function useBookingTicket(shop: string): string {
  const [ticket, setTicket] = useState("");
  useEffect(() => {
    const ask = new AbortController();
    fetch(`/api/public/shops/${encodeURIComponent(shop)}/booking-ticket`, { signal: ask.signal, cache: "no-store" })
      .then((res) => (res.ok ? (res.json() as Promise<{ ticket: string }>) : null))
      .then((body) => {
        if (body) setTicket(body.ticket);
      })
      .catch(() => {
        // Offline or aborted: the form still sends, and the answer says to reload.
      });
    return () => ask.abort();
  }, [shop]);
  return ticket;
}
