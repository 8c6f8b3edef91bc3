"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/action";
import { orderShopPartsSchema, receiveOrderSchema } from "@/lib/schemas/part-orders";
import { orderParts, receiveOrder } from "@/lib/server/part-orders";

// The shop's parts page (issue 19): needed parts of several jobs go on one supplier order, and an
// order that came in marks its parts in.

/** One order for parts of any of the shop's jobs, in one transaction; each job's wait follows. */
export const orderShopPartsAction = formAction({ input: orderShopPartsSchema, resource: "shop", permission: "parts:manage" }, async ({ input, actor, found }) => {
  const made = await orderParts(actor, { shopId: found.shop.id, jobId: null }, input);
  // Every job on the order changed: refresh the shop's pages (board, job and bench pages, this list).
  revalidatePath(`/shop/${found.shop.slug}`, "layout");
  return { order: made.id, parts: input.parts.length };
});

export const receiveOrderAction = formAction({ input: receiveOrderSchema, resource: "shop", permission: "parts:manage" }, async ({ input, actor, found }) => {
  const made = await receiveOrder(actor, found, input);
  revalidatePath(`/shop/${made.shop.slug}/parts`);
  return { received: made.received, stillAwaited: made.stillAwaited };
});
