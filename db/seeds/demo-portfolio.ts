// Copper Gulch's public profile for the portfolio (/s/copper-gulch). Invented words, place and
// contact details. No stories are seeded: a story needs the machine owner's consent, which the
// demo gets the way a real shop does (staff propose a collected job, the owner answers).
import type { Knex } from "knex";

const PROFILES: Record<string, Record<string, unknown>> = {
  "copper-gulch": {
    display_name: "Copper Gulch Powersports",
    about:
      "A two-bay shop for ATVs, side-by-sides, dirt bikes and sleds. We film and photograph the work as we go, so you see what came apart, what we found and how it went back together.",
    takes_in: "ATVs, side-by-sides, dirt bikes and snowmobiles. Engine, clutch, brake, suspension and electrical work; no bodywork or paint.",
    location_text: "Copper Gulch, off the old mill road",
    show_location: true,
    public_email: "desk@coppergulch.test",
    public_phone: "+1 555 010 4471",
  },
};

export async function seedPortfolioDemo(tx: Knex.Transaction, slug: string, shopId: number): Promise<void> {
  const profile = PROFILES[slug];
  if (profile) await tx("shop_profiles").insert({ shop_id: shopId, ...profile });
}
