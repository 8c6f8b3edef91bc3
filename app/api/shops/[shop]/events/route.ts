import { z } from "zod";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { resumePoint, streamQuerySchema, streamResponse } from "@/lib/server/event-stream";

// A stream is never cached or prerendered, and needs Node (the poller, the database pool).
export const dynamic = "force-dynamic";
export const runtime = "nodejs";

/**
 * GET /api/shops/:shop/events?lastEventId= — Server-Sent Events for the shop's staff: every event
 * of the shop (id, kind, job public id, time; no payload), live. Last-Event-ID resumes.
 */
export const GET = route(
  { params: z.object({ shop: ids.shop }), query: streamQuerySchema, resource: "shop", permission: "shop:view-board" },
  ({ req, query, found: { shop } }) => streamResponse(req, { kind: "shop", shopId: shop.id }, resumePoint(req, query)),
);
