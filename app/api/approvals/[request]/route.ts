import { z } from "zod";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { requestView } from "@/lib/server/approval-views";

/** GET /api/approvals/:request — the request as sent, its state and its decision (the job's staff and owner only; amounts only for those who see money). */
export const GET = route({ params: z.object({ request: ids.request }), resource: "request", permission: "job:view" }, ({ actor, found }) => requestView(actor, found, null));
