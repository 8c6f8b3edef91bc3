"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/action";
import { benchSettingsSchema, specDeleteSchema, specSchema } from "@/lib/schemas/bench";
import { addSpec, removeSpec, updateBenchSettings } from "@/lib/server/bench-parts";

// The spec library page's forms: zod → lib/server/bench-parts (authorises on the shop) → refresh.

export const addSpecAction = formAction({
  input: specSchema,
  run: async ({ input, actor }) => {
    const { id, shop } = await addSpec(actor, input);
    revalidatePath(`/shop/${shop.slug}/specs`);
    return { id };
  },
});

export const deleteSpecAction = formAction({
  input: specDeleteSchema,
  run: async ({ input, actor }) => {
    const { shop } = await removeSpec(actor, input);
    revalidatePath(`/shop/${shop.slug}/specs`);
    return { id: input.spec };
  },
});

export const saveBenchSettingsAction = formAction({
  input: benchSettingsSchema,
  run: async ({ input, actor }) => {
    const { shop } = await updateBenchSettings(actor, input);
    revalidatePath(`/shop/${shop.slug}/specs`);
    return { saved: true };
  },
});
