import { z } from "zod";
import { shopRef } from "./bench";

// The shop's parts markup form (FormData, all text): no rule, one percent, or up to three bands
// by unit cost (two closed bands and an open top band). lib/server/part-pricing.ts reads the
// amounts in the shop's currency and checks the bands rise.
const typed = z.string({ error: "Enter a number." }).trim().max(20, "That number is too long.").default("");

export const markupSettingsSchema = shopRef.extend({
  markupKind: z.enum(["none", "percent", "bands"], { error: "Choose no markup, one percent, or bands by cost." }),
  markupPercent: typed,
  band1UpTo: typed,
  band1Percent: typed,
  band2UpTo: typed,
  band2Percent: typed,
  topPercent: typed,
});
export type MarkupSettingsInput = z.output<typeof markupSettingsSchema>;
