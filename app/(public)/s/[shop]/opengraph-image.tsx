import { loadPublicShopPage } from "@/lib/server/portfolio-cache";
import { OG_SIZE, notFoundImage, portfolioCard } from "@/lib/server/og-image";

// The shop page's social card: its public name and how many finished jobs it shows. Static like
// the page (ISR, every shop at runtime) and read through the same tagged loader, so a change that
// drops the shop's public pages drops this card too.
export const size = OG_SIZE;
export const contentType = "image/png";
export const alt = "The shop's name and its finished jobs on Benchside";
export const dynamicParams = true;
export const revalidate = 300;
export function generateStaticParams(): { shop: string }[] {
  return [];
}

export default async function Image({ params }: { params: Promise<{ shop: string }> }) {
  const page = await loadPublicShopPage((await params).shop);
  if (!page) return notFoundImage();
  const n = page.stories.length;
  return portfolioCard({ shopName: page.shop.name, title: page.shop.name, line: n ? `${n} finished job${n === 1 ? "" : "s"}, photos and clips from the bench` : "Finished jobs from the bench" });
}
