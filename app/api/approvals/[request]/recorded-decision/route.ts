import { route } from "@/lib/route";
import { recordDecisionSchema } from "@/lib/schemas/approvals";
import { withRefusal } from "@/lib/server/approval-route";
import { recordDecision } from "@/lib/server/approvals";

/**
 * POST /api/approvals/:request/recorded-decision {shownHash, lines[], method: phone|in_person, personName,
 * phoneCalled, decidedAt, note?, wantsPartsBack} — the desk notes an answer given by phone or in person.
 */
export const POST = route<typeof recordDecisionSchema, { request: string }>({
  input: recordDecisionSchema,
  run: ({ input, params, actor }) =>
    withRefusal(async () => {
      const { decision } = await recordDecision(actor, params.request, input);
      return { decision };
    }),
});
