import { route } from "@/lib/route";
import { receivePaymentWebhook } from "@/lib/server/payment-webhook";

/**
 * POST /api/webhooks/payments — events from the payments service. No session: the signature on
 * the raw body (stripe-signature, timestamped HMAC) is the proof; a bad, altered or stale one
 * answers 401. A redelivered event answers 200 and changes nothing.
 */
export const POST = route({
  public: true,
  run: async ({ req }) => receivePaymentWebhook(await req.text(), req.headers.get("stripe-signature")),
});
