import { timelineQuerySchema } from "@/lib/journal";
import { route } from "@/lib/route";
import { readTimeline } from "@/lib/server/journal";

/**
 * GET /api/jobs/:job/timeline?order=asc|desc&after=<entry id>&limit= — one page of the job's
 * timeline: everything (not deleted) for the shop's staff, shared entries only for the owner.
 */
export const GET = route<typeof timelineQuerySchema, { job: string }>({
  input: timelineQuerySchema,
  run: ({ input, params, actor }) => readTimeline(actor, params.job, input),
});
