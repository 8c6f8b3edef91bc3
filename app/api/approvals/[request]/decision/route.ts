import { z } from "zod";
import { route } from "@/lib/route";
import { answerSchema } from "@/lib/schemas/approvals";
import { ids } from "@/lib/server/access";
import { withRefusal } from "@/lib/server/approval-route";
import { answerRequest } from "@/lib/server/approvals";
import { clientIp } from "@/lib/server/client-ip";

/**
 * POST /api/approvals/:request/decision {shownHash, lines[{no, answer}], signature, wantsPartsBack, confirmed}
 * — the machine's owner answers. 409 with `refusal` when it was answered, withdrawn, replaced or changed.
 */
export const POST = route(
  { params: z.object({ request: ids.request }), body: answerSchema, resource: "request", permission: "approvals:answer" },
  ({ body, actor, found, req }) =>
    withRefusal(async () => {
      const { decision } = await answerRequest(actor, found, body, { ip: clientIp(req.headers), userAgent: req.headers.get("user-agent") });
      return { decision };
    }),
);
