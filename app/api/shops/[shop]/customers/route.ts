import { z } from "zod";
import { searchCustomers } from "@/db/queries/check-in";
import { route } from "@/lib/route";
import { type CustomerSearchResult, customerSearchQuerySchema } from "@/lib/schemas/check-in";
import { ids } from "@/lib/server/access";

/** GET /api/shops/:shop/customers?q= — up to 10 of the shop's owners with their machines (check-in search). */
export const GET = route(
  { params: z.object({ shop: ids.shop }), query: customerSearchQuerySchema, resource: "shop", permission: "customer:view" },
  async ({ query, found: { shop } }): Promise<{ customers: CustomerSearchResult[] }> => ({ customers: await searchCustomers({ shopId: shop.id, q: query.q }) }),
);
