import { z } from "zod";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { resumePoint, streamQuerySchema, streamResponse } from "@/lib/server/event-stream";

// A stream is never cached or prerendered, and needs Node (the poller, the database pool).
export const dynamic = "force-dynamic";
export const runtime = "nodejs";

/**
 * GET /api/jobs/:job/events?lastEventId= — Server-Sent Events for one job's page. The shop's staff
 * hear every event of the job; the owner and followers only those marked for the owner.
 */
export const GET = route(
  { params: z.object({ job: ids.job }), query: streamQuerySchema, resource: "job", permission: "job:view" },
  ({ req, query, found }) =>
    streamResponse(req, { kind: "job", jobId: found.job.id, ownerVisibleOnly: found.audience !== "shop" }, resumePoint(req, query)),
);
