"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/action";
import { receiveOrderSchema } from "@/lib/schemas/part-orders";
import { receiveOrder } from "@/lib/server/part-orders";

// The shop's parts-on-order page: an order that came in marks its parts in (issue 19).

export const receiveOrderAction = formAction({ input: receiveOrderSchema, resource: "shop", permission: "parts:manage" }, async ({ input, actor, found }) => {
  const made = await receiveOrder(actor, found, input);
  revalidatePath(`/shop/${made.shop.slug}/parts`);
  return { received: made.received, stillAwaited: made.stillAwaited };
});
