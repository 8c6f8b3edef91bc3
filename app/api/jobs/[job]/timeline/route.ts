import { z } from "zod";
import { timelineQuerySchema } from "@/lib/schemas/journal";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { readTimeline } from "@/lib/server/journal";

/**
 * GET /api/jobs/:job/timeline?order=asc|desc&after=<entry id>&limit= — one page of the job's
 * timeline: everything (not deleted) for the shop's staff, shared entries only for the owner.
 */
export const GET = route({ params: z.object({ job: ids.job }), query: timelineQuerySchema, resource: "job", permission: "job:view" }, ({ query, found, actor }) =>
  readTimeline(actor, found, query),
);
