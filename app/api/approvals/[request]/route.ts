import { route } from "@/lib/route";
import { requestView } from "@/lib/server/approval-views";

/** GET /api/approvals/:request — the request as sent, its state and its decision (the job's staff and owner only). */
export const GET = route<never, { request: string }>({
  run: ({ params, actor }) => requestView(actor, null, params.request),
});
