import { z } from "zod";
import { route } from "@/lib/route";
import { withdrawSchema } from "@/lib/schemas/approvals";
import { ids } from "@/lib/server/access";
import { withRefusal } from "@/lib/server/approval-route";
import { withdrawRequest } from "@/lib/server/approvals";

/** POST /api/approvals/:request/withdraw {reason?} — the desk takes an unanswered request back. */
export const POST = route(
  { params: z.object({ request: ids.request }), body: withdrawSchema, resource: "request", permission: "approvals:send" },
  ({ body, actor, found }) =>
    withRefusal(async () => {
      await withdrawRequest(actor, found, body);
      return { withdrawn: true };
    }),
);
