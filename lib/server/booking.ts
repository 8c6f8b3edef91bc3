import "server-only";
import { getPublicFace } from "@/db/queries/public-face";
import { getShopBySlug } from "@/db/queries/shops";
import { reserveAttempt, settleAttempt } from "@/db/queries/sign-in";
import { transaction } from "@/db/transaction";
import { AppError } from "@/lib/errors";
import type { BookingRequestInput } from "@/lib/schemas/booking";
import { recordInboxEvent } from "@/lib/server/inbox";
import { envCount } from "@/lib/server/sign-in";
import { bookingTicket, readBookingTicket } from "@/lib/server/signed-token";

// A booking request from the shop's public page lands in the desk inbox (issue 16 §6). Spam is
// kept down without a third-party service: a honeypot field, a minimum time between the page
// being rendered and the form being sent (a signed ticket, so it can't be back-dated), and
// limits per network address and per e-mail address.

export const BOOKING_LIMITS = {
  perIp: { max: envCount("BOOKING_REQUESTS_PER_IP", 5), minutes: 60 },
  perEmail: { max: 3, minutes: 60 },
  /** Nobody reads a form and types a machine and its trouble in less. */
  minFillMs: 3_000,
  /** An older page is reloaded first (its ticket would let one page be replayed for days). */
  maxAgeMs: 24 * 60 * 60_000,
};

export const BOOKING_REFUSALS = {
  ticket: "This form is out of date. Reload the page and send it again.",
  tooFast: "That was sent quicker than a person can type. Check the form and send it again.",
  tooMany: `Several requests were sent from here already. Wait an hour, or call or e-mail the shop.`,
  noShop: "There's no shop at this address.",
};

/** What the form answers after a request is taken (and, word for word, after a bot's). */
export const BOOKING_THANKS = "Thanks: your request is with the shop. They will answer by e-mail or phone.";

/**
 * Records the request as one inbox item of kind `booking_request` (mailed at once to the staff
 * who want those now). A filled honeypot is answered like a success and writes nothing, so a
 * bot learns nothing from the answer.
 */
export async function requestBooking({ input, ip, now = Date.now() }: { input: BookingRequestInput; ip: string; now?: number }): Promise<{ recorded: boolean }> {
  const shop = await getShopBySlug({ slug: input.shop });
  if (!shop) throw new AppError("not_found", BOOKING_REFUSALS.noShop);
  const ticket = readBookingTicket(input.ticket);
  if (!ticket || ticket.shopId !== shop.id || now - ticket.issuedAt > BOOKING_LIMITS.maxAgeMs || ticket.issuedAt > now + 60_000) {
    throw new AppError("invalid", BOOKING_REFUSALS.ticket);
  }
  if (input.website.trim() !== "") return { recorded: false };
  if (now - ticket.issuedAt < BOOKING_LIMITS.minFillMs) throw new AppError("invalid", BOOKING_REFUSALS.tooFast);

  const byIp = await reserveAttempt({ kind: "booking_request", subject: `ip:${ip}`, limit: BOOKING_LIMITS.perIp, counting: "accepted" });
  if (!byIp.allowed) throw new AppError("rate_limited", BOOKING_REFUSALS.tooMany);
  const byEmail = await reserveAttempt({ kind: "booking_request", subject: input.email, limit: BOOKING_LIMITS.perEmail, counting: "accepted" });
  if (!byEmail.allowed) {
    await settleAttempt({ id: byIp.id, succeeded: false });
    throw new AppError("rate_limited", BOOKING_REFUSALS.tooMany, { email: [BOOKING_REFUSALS.tooMany] });
  }

  const contact = [input.email, input.phone].filter(Boolean).join(", ");
  await transaction((tx) =>
    recordInboxEvent(tx, {
      shopId: shop.id,
      jobId: null,
      kind: "booking_request",
      actorUserId: null,
      summary: `${input.name} asks to book in: ${input.machine}`,
      detail: `${input.work}${input.when ? ` · When: ${input.when}` : ""} · Reach them: ${contact}`,
      extra: { name: input.name, email: input.email, phone: input.phone || null, machine: input.machine, work: input.work, when: input.when || null },
    }),
  );
  return { recorded: true };
}

/**
 * A fresh booking ticket for the shop's form (GET /api/public/shops/:shop/booking-ticket), or
 * null for an unknown shop. Fetched by the form when it opens: the page itself is cached for
 * every visitor, so a ticket baked into it would be as old as the page.
 */
export async function bookingTicketFor(slug: string, issuedAt = new Date()): Promise<string | null> {
  const face = await getPublicFace({ slug });
  return face ? bookingTicket(face.shopId, issuedAt) : null;
}
