import { z } from "zod";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { jobApprovals } from "@/lib/server/approval-views";

/**
 * GET /api/jobs/:job/approvals — the staff panel: findings, requests, decisions, totals and warnings.
 * A technician gets it without amounts or warnings (the wrapper strips money for those without `money:view`).
 */
export const GET = route({ params: z.object({ job: ids.job }), resource: "job", permission: "journal:view-shop-only" }, ({ found }) => jobApprovals(found.job));
