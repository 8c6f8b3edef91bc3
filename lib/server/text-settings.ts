import "server-only";
import { getShopTextSettings, updateShopTexts } from "@/db/queries/texts";
import type { Actor } from "@/lib/permissions";
import type { TextSettingsInput } from "@/lib/schemas/texts";
import type { Resolved } from "@/lib/server/access";
import { saveSection } from "@/lib/server/shop-settings";
import { clockText, parseClock } from "@/lib/texts";

// Apart from lib/server/texts.ts, which the status and check-in writers (db/queries) use: the
// settings code reaches those writers, so keeping this here keeps the imports one-way.

/** The shop's texts section of its settings: its own sender number and its quiet hours (recorded like every section). */
export async function saveTextSettings(actor: Actor, found: Resolved<"shop">, input: TextSettingsInput) {
  return saveSection(actor, found, "texts", async (tx, shopId) => {
    const shop = (await getShopTextSettings(tx, shopId))!;
    const before = { smsFrom: shop.sms_from, quietStart: clockText(shop.sms_quiet_start), quietEnd: clockText(shop.sms_quiet_end) };
    const start = parseClock(input.quietStart)!;
    const end = parseClock(input.quietEnd)!;
    const after = { smsFrom: input.smsFrom || null, quietStart: clockText(start), quietEnd: clockText(end) };
    await updateShopTexts(tx, { shopId, smsFrom: after.smsFrom, quietStart: start, quietEnd: end });
    return { before, after };
  });
}
