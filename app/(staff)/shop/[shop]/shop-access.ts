import "server-only";
import { cache } from "react";
import { forbidden } from "next/navigation";
import { getShopBySlug } from "@/db/queries/shops";
import type { Action } from "@/lib/permissions";
import { authorizePage, requirePageActor } from "@/lib/server/authorize";

/**
 * For every page under /shop/[shop]: the signed-in actor and the shop, or the forbidden
 * page (an unknown slug looks the same as someone else's shop).
 */
export const shopPageAccess = cache(async (slug: string, action: Action, returnTo: string) => {
  const actor = await requirePageActor(returnTo);
  const shop = await getShopBySlug({ slug });
  if (!shop) forbidden();
  authorizePage(actor, action, { shopId: shop.id });
  return { actor, shop, role: actor.memberships.find((m) => m.shopId === shop.id)!.role };
});
