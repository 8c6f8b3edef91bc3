import { route } from "@/lib/route";
import { readWebhookBody } from "@/lib/server/body-limit";
import { receiveTextStatus } from "@/lib/server/text-webhooks";

/**
 * POST /api/webhooks/sms/status?ref=… — a text's delivery status from the SMS service. No session: the
 * X-Twilio-Signature over the URL and the form is the proof (401 otherwise, nothing changed). The body
 * is capped at 1 MB while it is read. A status already recorded answers 200 and changes nothing.
 */
export const POST = route({ body: "raw", permission: "public", crossSite: "allow" }, async ({ req }) => receiveTextStatus(req, await readWebhookBody(req)));
