import "server-only";
import { cache } from "react";
import type { Action } from "@/lib/permissions";
import { loadPage } from "@/lib/server/page-access";

/**
 * For every page under /shop/[shop]: the signed-in actor and the shop, or the forbidden
 * page (an unknown slug looks the same as someone else's shop).
 */
export const shopPageAccess = cache((slug: string, action: Action, returnTo: string) => loadPage("shop", { shop: slug }, action, returnTo));
