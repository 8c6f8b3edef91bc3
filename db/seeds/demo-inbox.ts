// Copper Gulch's desk inbox in the demo: what the seeded history would have put there. Ruth
// Calloway invited Noor to follow J-0004 (db/seeds/demo.ts) the day after check-in. Invented
// people, as everywhere in the seed.
import type { Knex } from "knex";
import { daysFromNow } from "./demo-time";

export async function seedInboxDemo(tx: Knex.Transaction, slug: string, shopId: number): Promise<void> {
  if (slug !== "copper-gulch") return;
  const job = await tx("jobs").where({ shop_id: shopId, number: 4 }).first("id");
  if (!job) return;
  await tx("shop_events").insert({
    shop_id: shopId,
    job_id: job.id,
    kind: "follower_added",
    inbox: true,
    owner_visible: false,
    payload: JSON.stringify({ summary: "Ruth Calloway invited noor.calloway@mail.test to follow the job", name: "Ruth Calloway" }),
    // Demo customers have no account until they first sign in.
    actor_user_id: null,
    created_at: daysFromNow(-1, 17),
  });
}
