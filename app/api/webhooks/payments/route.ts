import { route } from "@/lib/route";
import { readWebhookBody } from "@/lib/server/body-limit";
import { receivePaymentWebhook } from "@/lib/server/payment-webhook";

/**
 * POST /api/webhooks/payments — events from the payments service. No session: the signature on
 * the raw body (stripe-signature, timestamped HMAC) is the proof; a bad, altered or stale one
 * answers 401. The body is capped at 1 MB while it is read, before the signature is checked (413).
 * A redelivered event answers 200 and changes nothing; so does a signed one we can't use (logged).
 */
export const POST = route({ body: "raw", permission: "public", crossSite: "allow" }, async ({ req }) =>
  receivePaymentWebhook(await readWebhookBody(req), req.headers.get("stripe-signature")),
);
