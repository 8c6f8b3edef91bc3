import { route } from "@/lib/route";
import { readWebhookBody } from "@/lib/server/body-limit";
import { receiveInboundText } from "@/lib/server/text-webhooks";

/**
 * POST /api/webhooks/sms/inbound — a text an owner sent to a shop's number (the number's incoming-message
 * webhook). Signed like the status callbacks (401 when not). STOP / START / HELP and their synonyms are
 * answered; anything else becomes a question on the owner's newest open job. Answers are queued texts,
 * so the reply body is empty TwiML.
 */
export const POST = route({ body: "raw", permission: "public", crossSite: "allow" }, async ({ req }) => {
  await receiveInboundText(req, await readWebhookBody(req));
  return new Response("<?xml version=\"1.0\" encoding=\"UTF-8\"?><Response></Response>", { status: 200, headers: { "content-type": "text/xml; charset=utf-8", "cache-control": "no-store" } });
});
