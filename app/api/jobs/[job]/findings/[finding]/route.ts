import { z } from "zod";
import { route } from "@/lib/route";
import { findingInputSchema } from "@/lib/schemas/approvals";
import { ids } from "@/lib/server/access";
import { saveFinding } from "@/lib/server/findings";

/** PATCH /api/jobs/:job/findings/:finding {version, …the whole finding} — save the draft (prices from the desk only). */
export const PATCH = route(
  { params: z.object({ job: ids.job, finding: ids.row }), body: findingInputSchema, resource: "job", permission: "approvals:draft" },
  async ({ body, params, actor, found }) => {
    const saved = await saveFinding(actor, found, params.finding, body);
    return { id: saved.id, version: saved.version };
  },
);
