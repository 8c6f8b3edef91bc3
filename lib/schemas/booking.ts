import { z } from "zod";
import { SHOP_SLUG_PATTERN } from "@/lib/portfolio";

// The booking request form on the shop's public page (issue 16 §6). FormData, so all text.
// `website` is the honeypot: hidden from people (and from assistive technology), filled by bots.
// `ticket` is signed by the server when the form opens (GET /api/public/shops/:shop/booking-ticket,
// lib/server/signed-token.ts) and carries when: the page itself is cached for everyone.

const line = (max: number, what: string) => z.string({ error: `Enter ${what}.` }).trim().max(max, `Keep ${what} under ${max} characters.`);

export const bookingRequestSchema = z.object({
  shop: z.string().regex(SHOP_SLUG_PATTERN, "No such shop."),
  ticket: z.string({ error: "Reload the page and send the form again." }).regex(/^[A-Za-z0-9_-]{24,200}$/, "Reload the page and send the form again."),
  name: line(120, "your name").min(1, "Enter your name."),
  email: z
    .string({ error: "Enter your e-mail address." })
    .trim()
    .toLowerCase()
    .max(254, "That e-mail address is too long.")
    .pipe(z.email({ error: "Enter an e-mail address the shop can answer, like you@mail.test." })),
  phone: line(40, "the phone number")
    .default("")
    .refine((s) => s === "" || /^[+\d][\d ()./-]{4,}$/.test(s), "Enter a phone number: digits, spaces and + ( ) - only, or leave it empty."),
  machine: line(160, "the machine").min(2, "Say which machine: make, model and year if you know them."),
  work: line(1000, "what it needs").min(5, "Say what it needs, in a few words."),
  when: line(120, "when suits you").default(""),
  website: z.string().max(500, "Leave the website field empty.").default(""),
});
export type BookingRequestInput = z.output<typeof bookingRequestSchema>;
