import { route } from "@/lib/route";
import { readWebhookBody } from "@/lib/server/body-limit";
import { receiveMailWebhook } from "@/lib/server/mail-inbound";

/**
 * POST /api/webhooks/mail — events from the mail service: `email.received`, an owner's reply to
 * mail about a job, filed as a question on the job its reply-to address names. No session: the
 * Standard Webhooks signature (svix-id, svix-timestamp, svix-signature) on the raw body is the
 * proof; a bad, altered or stale one answers 401. The body is capped at 1 MB before the check.
 * A delivery seen before answers 200 and changes nothing; so does a signed one we can't use.
 */
export const POST = route({ body: "raw", permission: "public", crossSite: "allow" }, async ({ req }) => receiveMailWebhook(await readWebhookBody(req), req.headers));
