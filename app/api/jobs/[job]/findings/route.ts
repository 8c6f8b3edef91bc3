import { z } from "zod";
import { route } from "@/lib/route";
import { findingInputSchema } from "@/lib/schemas/approvals";
import { ids } from "@/lib/server/access";
import { createFinding } from "@/lib/server/findings";

/** POST /api/jobs/:job/findings {title, found, whyItMatters, safety, evidence[], lines[]} — a new draft finding. */
export const POST = route(
  { params: z.object({ job: ids.job }), body: findingInputSchema, resource: "job", permission: "approvals:draft" },
  async ({ body, actor, found }) => {
    const made = await createFinding(actor, found, body);
    return { id: made.id, version: made.version };
  },
);
