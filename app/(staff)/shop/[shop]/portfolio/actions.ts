"use server";
import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { z } from "zod";
import { formAction } from "@/lib/action";
import { ids } from "@/lib/server/access";
import { shopProfileSchema, storyCurationSchema, storyPath } from "@/lib/portfolio";
import type { StoryRow } from "@/db/queries/portfolio";
import { dropPublicPages } from "@/lib/server/portfolio-cache";
import { askOwner, proposeStory, publishStory, reaskIfChanged, unpublishStory } from "@/lib/server/portfolio";
import { curateStory, saveProfile } from "@/lib/server/portfolio-curation";

// The staff's portfolio forms: zod and the shop/story/job each names, authorised by the declaration → lib/server/portfolio* → refresh the
// staff pages and drop the shop's cached public pages (they are static: lib/server/portfolio-cache.ts),
// so the next visit shows the change.

const storyRef = z.object({ shop: ids.shop, story: z.coerce.number().int().positive() });

function refresh(shopSlug: string, story: Pick<StoryRow, "id" | "shopId" | "slug">, oldSlug?: string) {
  dropPublicPages(shopSlug);
  revalidatePath(`/shop/${shopSlug}/portfolio`, "layout");
  revalidatePath(`/s/${shopSlug}`);
  revalidatePath(storyPath(shopSlug, story.slug));
  if (oldSlug && oldSlug !== story.slug) revalidatePath(storyPath(shopSlug, oldSlug));
}

/** From the job page: propose a collected job and open the story to write it (the owner is asked about the write-up). */
export const proposeAction = formAction(
  { input: z.object({ shop: ids.shop, job: ids.job }), resource: "job", permission: "portfolio:propose" },
  async ({ actor, found }) => {
    const { story } = await proposeStory(actor, found);
    revalidatePath(`/shop/${found.job.shopSlug}/jobs/${story.jobNumber}`);
    revalidatePath(`/shop/${found.job.shopSlug}/portfolio`);
    redirect(`/shop/${found.job.shopSlug}/portfolio/${story.id}`);
  },
);

export const curateAction = formAction(
  { input: storyCurationSchema.extend({ shop: ids.shop }), resource: "story", permission: "portfolio:curate" },
  async ({ input, found }) => {
    const story = await curateStory(found, input);
    // Other words than the owner agreed to: back to them (and off the public site until they agree).
    const reasked = await reaskIfChanged(story);
    refresh(input.shop, story, story.previousSlug);
    return { version: story.version, reasked };
  },
);

export const publishAction = formAction({ input: storyRef, resource: "story", permission: "portfolio:publish" }, async ({ input, actor, found }) => {
  const story = await publishStory(actor, found);
  refresh(input.shop, story);
  return { status: story.status };
});

export const unpublishAction = formAction({ input: storyRef, resource: "story", permission: "portfolio:curate" }, async ({ input, found }) => {
  const story = await unpublishStory(found);
  refresh(input.shop, story);
  return { status: story.status };
});

export const askOwnerAction = formAction({ input: storyRef, resource: "story", permission: "portfolio:curate" }, async ({ input, found }) => {
  const story = await askOwner(found);
  revalidatePath(`/shop/${input.shop}/portfolio`, "layout");
  return { status: story.status };
});

export const saveProfileAction = formAction(
  { input: shopProfileSchema.extend({ logo: z.instanceof(File).optional() }), resource: "shop", permission: "shop:manage-settings" },
  async ({ input, found }) => {
    const { shop } = await saveProfile(found, input, input.logo ?? null);
    dropPublicPages(shop.slug);
    revalidatePath(`/s/${shop.slug}`, "layout");
    revalidatePath(`/shop/${shop.slug}/portfolio`, "layout");
    return { saved: true };
  },
);
