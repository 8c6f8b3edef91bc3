"use server";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { formAction } from "@/lib/action";
import { INBOX_KINDS } from "@/lib/shop-events";
import { inboxPreferencesSchema, inboxQuerySchema } from "@/lib/schemas/inbox";
import { ids } from "@/lib/server/access";
import { markAllItemsRead, markItemRead, saveInboxSettings } from "@/lib/server/inbox-view";

// Every member of the shop's staff works their own inbox: read flags and e-mail choices are theirs.

/** Marks one item read for the person pressing (again: no change). */
export const markReadAction = formAction(
  { input: z.object({ shop: z.string().max(60), item: ids.row }), resource: "shop", permission: "shop:view-board" },
  async ({ input, actor, found }) => {
    await markItemRead(actor, found, input.item);
    revalidatePath(`/shop/${found.shop.slug}/inbox`);
    return { item: input.item };
  },
);

/** Marks read what the list showed (its kind and job filter), up to the newest item it had. */
export const markAllReadAction = formAction(
  {
    input: inboxQuerySchema.pick({ kind: true, job: true }).extend({
      shop: z.string().max(60),
      through: z.coerce.number({ error: "No item to mark up to." }).int().min(0).max(Number.MAX_SAFE_INTEGER),
    }),
    resource: "shop",
    permission: "shop:view-board",
  },
  async ({ input, actor, found }) => {
    const marked = await markAllItemsRead(actor, found, { through: input.through, kinds: input.kind, jobNumber: input.job });
    revalidatePath(`/shop/${found.shop.slug}/inbox`);
    return { marked };
  },
);

/** Saves how this person hears of each kind by e-mail. */
export const saveInboxSettingsAction = formAction({ input: inboxPreferencesSchema, resource: "shop", permission: "shop:view-board" }, async ({ input, actor, found }) => {
  const choices = Object.fromEntries(INBOX_KINDS.map((k) => [k, input[k]])) as Record<(typeof INBOX_KINDS)[number], (typeof input)[(typeof INBOX_KINDS)[number]]>;
  await saveInboxSettings(actor, found, choices);
  revalidatePath(`/shop/${found.shop.slug}/inbox/settings`);
  return { saved: true };
});
