import { listJobs } from "@/db/queries/jobs";
import { getShopBySlug } from "@/db/queries/shops";
import { AppError } from "@/lib/errors";
import { type JobBoardPage, shopToday, toBoardRow } from "@/lib/jobs-view";
import { route } from "@/lib/route";
import { jobListQuerySchema } from "@/lib/schemas/jobs";
import { authorize } from "@/lib/server/authorize";

/** GET /api/shops/:shop/jobs?q=&status=&attention=&technician=&sort=&dir=&page=&pageSize= — one page of the job board. */
export const GET = route<typeof jobListQuerySchema, { shop: string }>({
  input: jobListQuerySchema,
  run: async ({ input, params, actor }): Promise<JobBoardPage> => {
    const shop = await getShopBySlug({ slug: params.shop });
    // Unknown shop and someone else's shop answer alike, so slugs can't be probed.
    if (!shop || !actor.memberships.some((m) => m.shopId === shop.id)) throw new AppError("forbidden", "You don't have access to this shop.");
    authorize(actor, "shop:view-board", { shopId: shop.id });
    // Overdue is judged by the date on the shop's own wall calendar.
    const page = await listJobs({ shopId: shop.id, query: input, today: shopToday(shop.timezone) });
    return { ...page, rows: page.rows.map(toBoardRow) };
  },
});
