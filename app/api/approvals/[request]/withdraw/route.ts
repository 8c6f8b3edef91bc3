import { route } from "@/lib/route";
import { withdrawSchema } from "@/lib/schemas/approvals";
import { withRefusal } from "@/lib/server/approval-route";
import { withdrawRequest } from "@/lib/server/approvals";

/** POST /api/approvals/:request/withdraw {reason?} — the desk takes an unanswered request back. */
export const POST = route<typeof withdrawSchema, { request: string }>({
  input: withdrawSchema,
  run: ({ input, params, actor }) =>
    withRefusal(async () => {
      await withdrawRequest(actor, params.request, input);
      return { withdrawn: true };
    }),
});
