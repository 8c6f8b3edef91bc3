import { publicPhotoKeys } from "@/db/queries/portfolio-public";
import { loadPublicStoryPage } from "@/lib/server/portfolio-cache";
import { OG_SIZE, notFoundImage, portfolioCard } from "@/lib/server/og-image";
import { storage } from "@/lib/server/storage";

// A story's social card: the shop, the title, the machine, and the cover photo. Static like the
// page (ISR, every story at runtime) and read through the same tagged loader, so a withdrawal
// drops the card with the page: the next request for it is a 404 too.
export const size = OG_SIZE;
export const contentType = "image/png";
export const alt = "A finished job's title, the machine and the shop that did the work";
export const dynamicParams = true;
export const revalidate = 300;
export function generateStaticParams(): { shop: string; story: string }[] {
  return [];
}

export default async function Image({ params }: { params: Promise<{ shop: string; story: string }> }) {
  const { shop, story: slug } = await params;
  const story = await loadPublicStoryPage(shop, slug);
  if (!story) return notFoundImage();
  const keys = story.cover ? await publicPhotoKeys({ shopSlug: shop, storySlug: slug, photoPublicId: story.cover.id }) : null;
  const stored = keys ? await storage().get(keys.displayKey) : null;
  return portfolioCard({ shopName: story.shop.name, title: story.title, line: story.machine.label, photo: stored && { data: stored.body, contentType: stored.contentType } });
}
