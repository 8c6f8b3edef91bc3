import "server-only";
import { publicPageIsShown } from "@/db/queries/portfolio-public";
import { type PublicPageAddress, possiblePublicPage } from "@/lib/public-pages";

/**
 * Whether the public page at this address is shown (lib/public-pages.ts says why the proxy asks).
 * Straight from the database, no memo: a story published or withdrawn a moment ago is answered
 * as it now stands. A failed look lets the request through: the page answers for itself.
 */
export async function publicPageShown(address: PublicPageAddress): Promise<boolean> {
  if (!possiblePublicPage(address)) return false;
  try {
    return await publicPageIsShown({ shopSlug: address.shop, storySlug: address.story });
  } catch {
    return true;
  }
}
