import "server-only";
import { getShopTextSettings, updateShopTexts } from "@/db/queries/texts";
import type { Actor } from "@/lib/permissions";
import type { TextSettingsInput } from "@/lib/schemas/texts";
import type { Resolved } from "@/lib/server/access";
import { saveSection } from "@/lib/server/shop-settings";
import { EXTRA_LANGUAGES, type Language, clockText, parseClock, shopLanguages } from "@/lib/texts";

// Apart from lib/server/texts.ts, which the status and check-in writers (db/queries) use: the
// settings code reaches those writers, so keeping this here keeps the imports one-way.

/**
 * The shop's texts section of its settings: its own sender number, its quiet hours and the languages it
 * texts in (English always; Spanish, French), recorded like every section.
 */
export async function saveTextSettings(actor: Actor, found: Resolved<"shop">, input: TextSettingsInput) {
  return saveSection(actor, found, "texts", async (tx, shopId) => {
    const shop = (await getShopTextSettings(tx, shopId))!;
    const before = { smsFrom: shop.sms_from, quietStart: clockText(shop.sms_quiet_start), quietEnd: clockText(shop.sms_quiet_end), languages: shopLanguages(shop) };
    const start = parseClock(input.quietStart)!;
    const end = parseClock(input.quietEnd)!;
    const ticked = { es: input.languageEs, fr: input.languageFr };
    const languages: Language[] = ["en", ...EXTRA_LANGUAGES.filter((l) => ticked[l])];
    const after = { smsFrom: input.smsFrom || null, quietStart: clockText(start), quietEnd: clockText(end), languages };
    await updateShopTexts(tx, { shopId, smsFrom: after.smsFrom, quietStart: start, quietEnd: end, languages });
    return { before, after };
  });
}
