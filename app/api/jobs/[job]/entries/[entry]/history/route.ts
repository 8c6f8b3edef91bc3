import { z } from "zod";
import { listEntryRevisions } from "@/db/queries/journal";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";

/** GET /api/jobs/:job/entries/:entry/history — earlier versions of an entry, newest first (staff only). */
export const GET = route(
  { params: z.object({ job: ids.job, entry: ids.row }), resource: "job", permission: "journal:view-shop-only" },
  async ({ params, found }) => ({ revisions: await listEntryRevisions({ shopId: found.job.shopId, entryId: params.entry }) }),
);
