import type { MetadataRoute } from "next";
import { listPublicShops, listSitemapStories } from "@/db/queries/portfolio-public";
import { storyPath } from "@/lib/portfolio";
import { appUrl } from "@/lib/server/config";

// /sitemap.xml: the public portfolio only (shop pages and published stories). Built per request
// from the database, so a withdrawn story leaves it at once and no build needs a database.
export const dynamic = "force-dynamic";

export default async function sitemap(): Promise<MetadataRoute.Sitemap> {
  const base = appUrl();
  const [shops, stories] = await Promise.all([listPublicShops(), listSitemapStories()]);
  const latest = new Map<string, Date>();
  for (const s of stories) if (!latest.has(s.shop) || latest.get(s.shop)! < s.updatedAt) latest.set(s.shop, s.updatedAt);
  return [
    ...shops.map((s) => {
      const at = [s.updatedAt, latest.get(s.shop)].filter((d): d is Date => d instanceof Date).sort((a, b) => b.getTime() - a.getTime())[0];
      return { url: `${base}/s/${s.shop}`, ...(at ? { lastModified: at } : {}), changeFrequency: "weekly" as const, priority: 0.8 };
    }),
    ...stories.map((s) => ({ url: `${base}${storyPath(s.shop, s.slug)}`, lastModified: s.updatedAt, changeFrequency: "monthly" as const, priority: 0.6 })),
  ];
}
