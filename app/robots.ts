import type { MetadataRoute } from "next";
import { appUrl } from "@/lib/server/config";

// /robots.txt: crawl the public portfolio (/s/…), not the signed-in areas, the API or mail links.
// Per request, so the sitemap address follows APP_URL where the app runs, not where it was built.
export const dynamic = "force-dynamic";

export default function robots(): MetadataRoute.Robots {
  return {
    rules: { userAgent: "*", allow: ["/s/", "/$"], disallow: ["/shop", "/my", "/api", "/sign-in", "/u/", "/unsubscribe"] },
    sitemap: `${appUrl()}/sitemap.xml`,
  };
}
