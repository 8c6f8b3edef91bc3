import { route } from "@/lib/route";
import { jobApprovals } from "@/lib/server/approval-views";

/** GET /api/jobs/:job/approvals — the staff panel: findings, requests, decisions, totals and warnings. */
export const GET = route<never, { job: string }>({
  run: ({ params, actor }) => jobApprovals(actor, params.job),
});
