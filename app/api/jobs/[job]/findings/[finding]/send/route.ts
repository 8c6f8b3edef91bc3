import { route } from "@/lib/route";
import { sendRequestSchema } from "@/lib/schemas/approvals";
import { findingIdParam } from "@/lib/server/approval-route";
import { sendRequest } from "@/lib/server/approvals";

/** POST /api/jobs/:job/findings/:finding/send {findingVersion} — price, freeze and send to the owner (or send a revision). */
export const POST = route<typeof sendRequestSchema, { job: string; finding: string }>({
  input: sendRequestSchema,
  run: async ({ input, params, actor }) => {
    const sent = await sendRequest(actor, params.job, findingIdParam(params.finding), input);
    return { request: sent.publicId, hash: sent.hash, mailed: sent.mailed };
  },
});
