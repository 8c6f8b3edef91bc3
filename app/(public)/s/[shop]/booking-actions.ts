"use server";
import { headers } from "next/headers";
import { formAction } from "@/lib/action";
import { bookingRequestSchema } from "@/lib/schemas/booking";
import { BOOKING_THANKS, requestBooking } from "@/lib/server/booking";
import { clientIp } from "@/lib/server/client-ip";

// Public: anyone reading the shop's page may ask for a booking. The spam checks and limits are
// in lib/server/booking.ts; the request becomes one item in the shop's desk inbox.
export const requestBookingAction = formAction({ input: bookingRequestSchema, permission: "public" }, async ({ input }) => {
  await requestBooking({ input, ip: clientIp(await headers()) });
  return { message: BOOKING_THANKS };
});
