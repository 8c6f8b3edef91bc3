import { z } from "zod";
import { route } from "@/lib/route";
import { recordDecisionSchema } from "@/lib/schemas/approvals";
import { ids } from "@/lib/server/access";
import { withRefusal } from "@/lib/server/approval-route";
import { recordDecision } from "@/lib/server/approvals";

/**
 * POST /api/approvals/:request/recorded-decision {shownHash, lines[], method: phone|in_person, personName,
 * phoneCalled, decidedAt, note?, wantsPartsBack} — the desk notes an answer given by phone or in person.
 */
export const POST = route(
  { params: z.object({ request: ids.request }), body: recordDecisionSchema, resource: "request", permission: "approvals:record-decision" },
  ({ body, actor, found }) =>
    withRefusal(async () => {
      const { decision } = await recordDecision(actor, found, body);
      return { decision };
    }),
);
