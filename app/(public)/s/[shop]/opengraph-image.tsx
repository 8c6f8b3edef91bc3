import { connection } from "next/server";
import { getPublicShopPage } from "@/lib/server/portfolio-public";
import { OG_SIZE, notFoundImage, portfolioCard } from "@/lib/server/og-image";

// The shop page's social card: its public name and how many finished jobs it shows.
export const size = OG_SIZE;
export const contentType = "image/png";
export const alt = "The shop's name and its finished jobs on Benchside";

export default async function Image({ params }: { params: Promise<{ shop: string }> }) {
  await connection();
  const page = await getPublicShopPage((await params).shop, null);
  if (!page) return notFoundImage();
  const n = page.stories.length;
  return portfolioCard({ shopName: page.shop.name, title: page.shop.name, line: n ? `${n} finished job${n === 1 ? "" : "s"}, photos and clips from the bench` : "Finished jobs from the bench" });
}
