"use server";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { retryOutboxMail } from "@/db/queries/outbox";
import { formAction } from "@/lib/action";
import { AppError } from "@/lib/errors";

/** Sends a failed or given-up e-mail again now (the worker picks it up within seconds). */
export const retryMailAction = formAction(
  { input: z.object({ shop: z.string().max(60), id: z.coerce.number().int().positive("No such e-mail.") }), resource: "shop", permission: "outbox:manage" },
  async ({ input, found: { shop } }) => {
    if (!(await retryOutboxMail({ shopId: shop.id, id: input.id }))) throw new AppError("conflict", "That e-mail has been sent already, or isn't this shop's.");
    revalidatePath(`/shop/${shop.slug}/outbox`);
    return { id: input.id };
  },
);
