import { route } from "@/lib/route";
import { readWebhookBody } from "@/lib/server/body-limit";
import { receiveVideoWebhook } from "@/lib/server/clips";

/**
 * POST /api/webhooks/video — events from the video service. No session: the signature on the
 * raw body (mux-signature, timestamped HMAC) is the proof; a bad or stale one answers 401. The
 * body is capped at 1 MB while it is read, before the signature is checked (413). A signed event
 * we can't use is logged and acknowledged (200), never retried by the service forever.
 */
export const POST = route({ body: "raw", permission: "public", crossSite: "allow" }, async ({ req }) =>
  receiveVideoWebhook(await readWebhookBody(req), req.headers),
);
