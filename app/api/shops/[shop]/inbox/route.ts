import { z } from "zod";
import type { InboxPage } from "@/lib/inbox";
import { route } from "@/lib/route";
import { inboxQuerySchema } from "@/lib/schemas/inbox";
import { ids } from "@/lib/server/access";
import { inboxPageFor } from "@/lib/server/inbox-view";

/** GET /api/shops/:shop/inbox?kind=&job=&unread=&before= — one page of the desk inbox, with the reader's unread count. */
export const GET = route(
  { params: z.object({ shop: ids.shop }), query: inboxQuerySchema, resource: "shop", permission: "shop:view-board" },
  ({ actor, query, found }): Promise<InboxPage> => inboxPageFor(actor, found, query),
);
