import { connection } from "next/server";
import { publicPhotoKeys } from "@/db/queries/portfolio-public";
import { loadPublicStoryPage } from "@/lib/server/portfolio-cache";
import { OG_SIZE, notFoundImage, portfolioCard } from "@/lib/server/og-image";
import { storage } from "@/lib/server/storage";

// A story's social card: the shop, the title, the machine, and the cover photo. Checked like the
// page itself, so a withdrawn story's card is gone at once too.
export const size = OG_SIZE;
export const contentType = "image/png";
export const alt = "A finished job's title, the machine and the shop that did the work";

export default async function Image({ params }: { params: Promise<{ shop: string; story: string }> }) {
  await connection();
  const { shop, story: slug } = await params;
  const story = await loadPublicStoryPage(shop, slug);
  if (!story) return notFoundImage();
  const keys = story.cover ? await publicPhotoKeys({ shopSlug: shop, storySlug: slug, photoPublicId: story.cover.id }) : null;
  const stored = keys ? await storage().get(keys.displayKey) : null;
  return portfolioCard({ shopName: story.shop.name, title: story.title, line: story.machine.label, photo: stored && { data: stored.body, contentType: stored.contentType } });
}
