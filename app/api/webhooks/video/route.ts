import { route } from "@/lib/route";
import { receiveVideoWebhook } from "@/lib/server/clips";

/**
 * POST /api/webhooks/video — events from the video service. No session: the signature on the
 * raw body (mux-signature, timestamped HMAC) is the proof; a bad or stale one answers 401.
 */
export const POST = route({
  public: true,
  run: async ({ req }) => receiveVideoWebhook(await req.text(), req.headers),
});
