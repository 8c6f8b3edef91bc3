import { z } from "zod";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { unreadCountFor } from "@/lib/server/inbox-view";

/** GET /api/shops/:shop/inbox/unread — the reader's unread count, for the header badge. */
export const GET = route({ params: z.object({ shop: ids.shop }), resource: "shop", permission: "shop:view-board" }, async ({ actor, found }) => ({
  unread: await unreadCountFor(actor, found),
}));
