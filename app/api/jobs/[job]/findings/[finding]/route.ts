import { route } from "@/lib/route";
import { findingInputSchema } from "@/lib/schemas/approvals";
import { findingIdParam } from "@/lib/server/approval-route";
import { saveFinding } from "@/lib/server/findings";

/** PATCH /api/jobs/:job/findings/:finding {version, …the whole finding} — save the draft (prices from the desk only). */
export const PATCH = route<typeof findingInputSchema, { job: string; finding: string }>({
  input: findingInputSchema,
  run: async ({ input, params, actor }) => {
    const saved = await saveFinding(actor, params.job, findingIdParam(params.finding), input);
    return { id: saved.id, version: saved.version };
  },
});
