"use server";
import { redirect } from "next/navigation";
import { revalidatePath } from "next/cache";
import { checkInJob } from "@/db/queries/check-in";
import { formAction } from "@/lib/action";
import { checkInFormSchema } from "@/lib/schemas/check-in";

/** Checks a machine in, then opens the new job with the intake-photo composer (`?intake=1`). */
export const checkInMachine = formAction(
  { input: checkInFormSchema, resource: "shop", permission: "job:check-in" },
  async ({ input: { input }, actor, found: { shop } }) => {
    const job = await checkInJob({ shopId: shop.id, userId: actor.userId, input });
    revalidatePath(`/shop/${shop.slug}`);
    redirect(`/shop/${shop.slug}/jobs/${job.number}?intake=1`);
  },
);
