import { searchCustomers } from "@/db/queries/check-in";
import { getShopBySlug } from "@/db/queries/shops";
import { AppError } from "@/lib/errors";
import { route } from "@/lib/route";
import { type CustomerSearchResult, customerSearchQuerySchema } from "@/lib/schemas/check-in";
import { authorize } from "@/lib/server/authorize";

/** GET /api/shops/:shop/customers?q= — up to 10 of the shop's owners with their machines (check-in search). */
export const GET = route<typeof customerSearchQuerySchema, { shop: string }>({
  input: customerSearchQuerySchema,
  run: async ({ input, params, actor }): Promise<{ customers: CustomerSearchResult[] }> => {
    const shop = await getShopBySlug({ slug: params.shop });
    // Unknown shop and someone else's shop answer alike, so slugs can't be probed.
    if (!shop) throw new AppError("forbidden", "You don't have access to this shop.");
    authorize(actor, "customer:view", { shopId: shop.id });
    return { customers: await searchCustomers({ shopId: shop.id, q: input.q }) };
  },
});
