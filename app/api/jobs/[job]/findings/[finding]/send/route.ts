import { z } from "zod";
import { route } from "@/lib/route";
import { sendRequestSchema } from "@/lib/schemas/approvals";
import { ids } from "@/lib/server/access";
import { sendRequest } from "@/lib/server/approvals";

/** POST /api/jobs/:job/findings/:finding/send {findingVersion} — price, freeze and send to the owner (or send a revision). */
export const POST = route(
  { params: z.object({ job: ids.job, finding: ids.row }), body: sendRequestSchema, resource: "job", permission: "approvals:send" },
  async ({ body, params, actor, found }) => {
    const sent = await sendRequest(actor, found, params.finding, body);
    return { request: sent.publicId, hash: sent.hash, mailed: sent.mailed, texted: sent.texted };
  },
);
