import { z } from "zod";
import { NextResponse } from "next/server";
import { AppError } from "@/lib/errors";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { getPublicStory } from "@/lib/server/portfolio-public";

/**
 * GET /api/public/stories/:shop/:story — a published story as JSON, exactly what its page shows
 * (lib/portfolio.ts PublicStory): no entry ids, names, serials or prices. 404 once it isn't
 * published any more (withdrawn by the owner, or taken down by the shop).
 */
export const GET = route({ params: z.object({ shop: ids.shop, story: ids.story }), permission: "public" }, async ({ params }) => {
  const story = await getPublicStory(params.shop, params.story);
  if (!story) throw new AppError("not_found", "No such story.");
  return NextResponse.json(story, { headers: { "cache-control": "public, no-cache" } });
});
