"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/action";
import { benchSettingsSchema, specDeleteSchema, specSchema } from "@/lib/schemas/bench";
import { addSpec, removeSpec, updateBenchSettings } from "@/lib/server/bench-parts";

// The spec library page's forms: zod → lib/server/bench-parts (the shop named by the form, authorised by the declaration) → refresh.

export const addSpecAction = formAction({ input: specSchema, resource: "shop", permission: "specs:manage" }, async ({ input, actor, found }) => {
  const { id, shop } = await addSpec(actor, found, input);
  revalidatePath(`/shop/${shop.slug}/specs`);
  return { id };
});

export const deleteSpecAction = formAction({ input: specDeleteSchema, resource: "shop", permission: "specs:manage" }, async ({ input, found }) => {
  const { shop } = await removeSpec(found, input);
  revalidatePath(`/shop/${shop.slug}/specs`);
  return { id: input.spec };
});

export const saveBenchSettingsAction = formAction(
  { input: benchSettingsSchema, resource: "shop", permission: "shop:manage-settings" },
  async ({ input, actor, found }) => {
    const { shop } = await updateBenchSettings(found, input, actor);
    // The form is on the settings page; the specs page shows values in the chosen unit.
    revalidatePath(`/shop/${shop.slug}/settings`);
    revalidatePath(`/shop/${shop.slug}/specs`);
    return { saved: true };
  },
);
