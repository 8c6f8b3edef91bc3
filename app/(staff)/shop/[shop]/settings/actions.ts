"use server";
import { revalidatePath } from "next/cache";
import { formAction } from "@/lib/action";
import {
  digestSettingsSchema,
  dropoffSettingsSchema,
  hoursSettingsSchema,
  labourSettingsSchema,
  profileSettingsSchema,
  regionSettingsSchema,
  suppliesSettingsSchema,
  taxSettingsSchema,
  toleranceSettingsSchema,
} from "@/lib/schemas/shop-settings";
import { dropPublicPages } from "@/lib/server/portfolio-cache";
import { markupSettingsSchema } from "@/lib/schemas/parts-pricing";
import { saveMarkup } from "@/lib/server/part-pricing";
import { textSettingsSchema } from "@/lib/schemas/texts";
import { saveTextSettings } from "@/lib/server/text-settings";
import { saveDigest, saveDropoffTerms, saveHours, saveLabour, saveProfile, saveRegion, saveSupplies, saveTax, saveTolerance } from "@/lib/server/shop-settings";

// The shop settings page's forms, one per section: zod → lib/server/shop-settings (the shop named
// by the form; the shop owner only, by the declaration) → refresh the shop's pages.

const owner = { resource: "shop", permission: "shop:manage-settings" } as const;
const refresh = (slug: string) => revalidatePath(`/shop/${slug}`, "layout");
// The shop's name, opening hours and time zone show on its public page too (cached: lib/server/portfolio-cache.ts).
const refreshPublic = (slug: string) => {
  refresh(slug);
  dropPublicPages(slug);
};

export const saveProfileAction = formAction({ input: profileSettingsSchema, ...owner }, async ({ input, actor, found }) => {
  refreshPublic((await saveProfile(actor, found, input)).shop.slug);
  return { saved: true };
});

export const saveHoursAction = formAction({ input: hoursSettingsSchema, ...owner }, async ({ input, actor, found }) => {
  refreshPublic((await saveHours(actor, found, input)).shop.slug);
  return { saved: true };
});

export const saveRegionAction = formAction({ input: regionSettingsSchema, ...owner }, async ({ input, actor, found }) => {
  refreshPublic((await saveRegion(actor, found, input)).shop.slug);
  return { saved: true };
});

export const saveLabourAction = formAction({ input: labourSettingsSchema, ...owner }, async ({ input, actor, found }) => {
  refresh((await saveLabour(actor, found, input)).shop.slug);
  return { saved: true };
});

export const saveTaxAction = formAction({ input: taxSettingsSchema, ...owner }, async ({ input, actor, found }) => {
  refresh((await saveTax(actor, found, input)).shop.slug);
  return { saved: true };
});

export const saveSuppliesAction = formAction({ input: suppliesSettingsSchema, ...owner }, async ({ input, actor, found }) => {
  refresh((await saveSupplies(actor, found, input)).shop.slug);
  return { saved: true };
});

export const saveToleranceAction = formAction({ input: toleranceSettingsSchema, ...owner }, async ({ input, actor, found }) => {
  refresh((await saveTolerance(actor, found, input)).shop.slug);
  return { saved: true };
});

export const saveDropoffTermsAction = formAction({ input: dropoffSettingsSchema, ...owner }, async ({ input, actor, found }) => {
  refresh((await saveDropoffTerms(actor, found, input)).shop.slug);
  return { saved: true };
});

export const saveDigestAction = formAction({ input: digestSettingsSchema, ...owner }, async ({ input, actor, found }) => {
  refresh((await saveDigest(actor, found, input)).shop.slug);
  return { saved: true };
});

export const saveMarkupAction = formAction({ input: markupSettingsSchema, ...owner }, async ({ input, actor, found }) => {
  refresh((await saveMarkup(actor, found, input)).shop.slug);
  return { saved: true };
});

// Texts (issue 21): the shop's sender number, quiet hours and the languages it texts in.
export const saveTextsAction = formAction({ input: textSettingsSchema, ...owner }, async ({ input, actor, found }) => {
  refresh((await saveTextSettings(actor, found, input)).shop.slug);
  return { saved: true };
});
