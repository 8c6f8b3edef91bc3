"use server";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { retryOutboxMail } from "@/db/queries/outbox";
import { getShopBySlug } from "@/db/queries/shops";
import { formAction } from "@/lib/action";
import { AppError } from "@/lib/errors";
import { authorize } from "@/lib/server/authorize";

/** Sends a failed or given-up e-mail again now (the worker picks it up within seconds). */
export const retryMailAction = formAction({
  input: z.object({ shop: z.string().max(60), id: z.coerce.number().int().positive("No such e-mail.") }),
  run: async ({ input, actor }) => {
    const shop = await getShopBySlug({ slug: input.shop });
    if (!shop) throw new AppError("forbidden", "You don't have access to this shop.");
    authorize(actor, "outbox:manage", { shopId: shop.id });
    if (!(await retryOutboxMail({ shopId: shop.id, id: input.id }))) throw new AppError("conflict", "That e-mail has been sent already, or isn't this shop's.");
    revalidatePath(`/shop/${shop.slug}/outbox`);
    return { id: input.id };
  },
});
