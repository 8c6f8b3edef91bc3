import { z } from "zod";
import { NextResponse } from "next/server";
import { AppError } from "@/lib/errors";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { bookingTicketFor } from "@/lib/server/booking";

/**
 * GET /api/public/shops/:shop/booking-ticket — {ticket}: the booking form's signed ticket, made
 * now. The shop's public page is cached for everyone, so its form asks for this when it opens
 * (the "too quick to be a person" check counts from here). Never cached; writes nothing.
 */
export const GET = route({ params: z.object({ shop: ids.shop }), permission: "public" }, async ({ params }) => {
  const ticket = await bookingTicketFor(params.shop);
  if (!ticket) throw new AppError("not_found", "There's no shop at this address.");
  return NextResponse.json({ ticket }, { headers: { "cache-control": "no-store" } });
});
