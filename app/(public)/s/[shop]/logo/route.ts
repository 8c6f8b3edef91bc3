import { z } from "zod";
import { getPublicShop } from "@/db/queries/portfolio-public";
import { AppError } from "@/lib/errors";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { storage } from "@/lib/server/storage";

/** GET /s/:shop/logo — the logo the shop put on its public profile (re-encoded, no metadata), or 404. */
export const GET = route({ params: z.object({ shop: ids.shop }), permission: "public" }, async ({ params, req }) => {
  const notFound = new AppError("not_found", "This shop has no logo.");
  const shop = await getPublicShop({ shopSlug: params.shop });
  if (!shop?.logoKey) throw notFound;
  // A new logo gets a new key, so the key is the version.
  const etag = `"${Buffer.from(shop.logoKey).toString("base64url")}"`;
  const headers = { "cache-control": "public, max-age=300, must-revalidate", etag, "x-content-type-options": "nosniff" };
  if (req.headers.get("if-none-match") === etag) return new Response(null, { status: 304, headers });
  const object = await storage().get(shop.logoKey);
  if (!object) throw notFound;
  return new Response(new Uint8Array(object.body), { headers: { ...headers, "content-type": object.contentType, "content-length": String(object.size) } });
});
