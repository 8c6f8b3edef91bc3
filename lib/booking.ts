// The booking request form's fields the person sees (issue 16 §6). Pure and free of zod, so the
// public page's form can import it; lib/schemas/form-fields.ts lists it for the §7 check.
export const BOOKING_VISIBLE = ["name", "email", "phone", "when", "machine", "work"] as const;
/** Filled by the page (shop, ticket) or by bots only (website, the honeypot): their messages go in the banner. */
export const BOOKING_BANNER = ["shop", "ticket", "website"] as const;
