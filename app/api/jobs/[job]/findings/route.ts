import { route } from "@/lib/route";
import { findingInputSchema } from "@/lib/schemas/approvals";
import { createFinding } from "@/lib/server/findings";

/** POST /api/jobs/:job/findings {title, found, whyItMatters, safety, evidence[], lines[]} — a new draft finding. */
export const POST = route<typeof findingInputSchema, { job: string }>({
  input: findingInputSchema,
  run: async ({ input, params, actor }) => {
    const made = await createFinding(actor, params.job, input);
    return { id: made.id, version: made.version };
  },
});
