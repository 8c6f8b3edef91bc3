"use server";
import { redirect } from "next/navigation";
import { revalidatePath } from "next/cache";
import { checkInJob } from "@/db/queries/check-in";
import { getShopBySlug } from "@/db/queries/shops";
import { formAction } from "@/lib/action";
import { AppError } from "@/lib/errors";
import { checkInFormSchema } from "@/lib/schemas/check-in";
import { authorize } from "@/lib/server/authorize";

/** Checks a machine in, then opens the new job with the intake-photo composer (`?intake=1`). */
export const checkInMachine = formAction({
  input: checkInFormSchema,
  run: async ({ input: { shop: slug, input }, actor }) => {
    const shop = await getShopBySlug({ slug });
    // Unknown shop and someone else's shop answer alike, so slugs can't be probed.
    if (!shop) throw new AppError("forbidden", "You don't have access to this shop.");
    authorize(actor, "job:check-in", { shopId: shop.id });
    const job = await checkInJob({ shopId: shop.id, userId: actor.userId, input });
    revalidatePath(`/shop/${shop.slug}`);
    redirect(`/shop/${shop.slug}/jobs/${job.number}?intake=1`);
  },
});
