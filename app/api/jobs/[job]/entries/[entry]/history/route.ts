import { listEntryRevisions } from "@/db/queries/journal";
import { route } from "@/lib/route";
import { entryIdParam, journalAccess } from "@/lib/server/journal";

/** GET /api/jobs/:job/entries/:entry/history — earlier versions of an entry, newest first (staff only). */
export const GET = route<never, { job: string; entry: string }>({
  run: async ({ params, actor }) => {
    const { job } = await journalAccess(actor, params.job, "journal:view-shop-only");
    return { revisions: await listEntryRevisions({ shopId: job.shopId, entryId: entryIdParam(params.entry) }) };
  },
});
