import { z } from "zod";
import { listJobs } from "@/db/queries/jobs";
import { type JobBoardPage, shopToday, toBoardRow } from "@/lib/jobs-view";
import { route } from "@/lib/route";
import { jobListQuerySchema } from "@/lib/schemas/jobs";
import { ids } from "@/lib/server/access";

/** GET /api/shops/:shop/jobs?q=&status=&attention=&technician=&sort=&dir=&page=&pageSize= — one page of the job board. */
export const GET = route(
  { params: z.object({ shop: ids.shop }), query: jobListQuerySchema, resource: "shop", permission: "shop:view-board" },
  async ({ query, found: { shop } }): Promise<JobBoardPage> => {
    // Overdue is judged by the date on the shop's own wall calendar.
    const page = await listJobs({ shopId: shop.id, query, today: shopToday(shop.timezone) });
    return { ...page, rows: page.rows.map(toBoardRow) };
  },
);
