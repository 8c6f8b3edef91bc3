import "server-only";
import { type LinePart, type LinePartPrice, getMarkupRule, partCosts, partsOfFindingLines, saveMarkupRule, syncLineParts } from "@/db/queries/parts-pricing";
import { getShopRowSettings } from "@/db/queries/shop-settings";
import type { AfterLines, StoredLine } from "@/db/queries/findings";
import type { DraftLine } from "@/lib/approvals";
import { AppError } from "@/lib/errors";
import { formatMoney, parseMoney } from "@/lib/money";
import { type MarkupBand, type MarkupRule, NO_MARKUP, checkMarkupRule, sellFromCost } from "@/lib/parts-pricing";
import type { Actor } from "@/lib/permissions";
import type { LineInput } from "@/lib/schemas/approvals";
import type { MarkupSettingsInput } from "@/lib/schemas/parts-pricing";
import type { Resolved } from "@/lib/server/access";
import { onField } from "@/lib/server/bench";
import { saveSection } from "@/lib/server/shop-settings";
import { minorToInput } from "@/lib/shop-settings";

// Issue 19: a priced part line's cost, sell price and part. The desk types the cost; the shop's
// markup rule gives the sell price unless the desk types another, which then needs a reason (kept
// on the part). Only the sell price goes on the line, so the estimate, the request and the invoice
// never carry the cost. A part line with no cost still makes (or picks) its part: its price
// is the one typed, with no markup.

type PartFields = Omit<LinePart, "lineId">;

/**
 * Fills each part line's price from the markup rule when none was typed, checks overrides have a
 * reason, and returns what each line's part should hold (null for labour and fees).
 */
export async function priceLineParts(
  job: { shopId: number; id: number },
  input: LineInput[],
  lines: (DraftLine & { id?: number })[],
  existing: StoredLine[],
  opts: { currency: string; mayPrice: boolean },
): Promise<{ lines: (DraftLine & { id?: number })[]; parts: (PartFields | null)[] }> {
  const shopId = job.shopId;
  const rule = await getMarkupRule({ shopId });
  const before = await partsOfFindingLines({ shopId, lineIds: existing.map((l) => l.id) });
  const picked = await partCosts({ shopId, jobId: job.id, ids: input.flatMap((l) => (l.partId ? [l.partId] : [])) });
  const parts: (PartFields | null)[] = [];
  const priced = lines.map((line, i) => {
    const typed = input[i]!;
    if (line.kind !== "part") {
      parts.push(null);
      return line;
    }
    const linkedTo: LinePartPrice | undefined = typed.id ? before.get(typed.id) : undefined;
    // A saved line re-pointed to another job part (or a new one) prices from that part, not the old one.
    const repoint = !!linkedTo && (!!typed.newPart || (!!typed.partId && typed.partId !== linkedTo.partId));
    const was = repoint ? undefined : linkedTo;
    if (repoint && !opts.mayPrice) throw new AppError("forbidden", "Only the service writer or the shop owner changes which part a line stands for.", { [`lines.${i}.partId`]: ["Leave this to the desk."] });
    const field = (name: string, message: string) => new AppError("invalid", message, { [`lines.${i}.${name}`]: [message] });
    if (!opts.mayPrice && (typed.cost !== undefined || typed.priceReason)) throw new AppError("forbidden", "Only the service writer or the shop owner sets costs and prices.", { [`lines.${i}.cost`]: ["Leave costs to the desk."] });
    // Untyped, the cost is the one already stored: the line's part, or the part it picks (an empty
    // cost on a line that newly picks a part keeps that part's cost, as the picker leaves it empty).
    const pickedCost = typed.partId && !was && !typed.newPart ? (picked.get(typed.partId) ?? null) : null;
    let costMinor = was ? was.costMinor : pickedCost;
    if (opts.mayPrice && typed.cost !== undefined && !(typed.cost === "" && pickedCost !== null)) {
      try {
        costMinor = typed.cost === "" ? null : parseMoney(typed.cost, opts.currency);
      } catch (error) {
        throw error instanceof AppError ? field("cost", error.message) : error;
      }
    }
    // Every part line stands for one job part, costed or not, so the owner's answer, ordering and
    // the invoice treat it alike. Without a cost the typed price is the sell price: no markup.
    const ruled = costMinor === null ? null : sellFromCost(costMinor, rule);
    const sellMinor = line.unitPriceMinor ?? ruled;
    let priceReason = opts.mayPrice ? (typed.priceReason || null) : (was?.priceReason ?? null);
    if (opts.mayPrice && ruled !== null && sellMinor !== ruled) {
      // Unchanged cost and price keep the reason given before.
      if (!priceReason && was && was.costMinor === costMinor && was.sellMinor === sellMinor) priceReason = was.priceReason;
      if (!priceReason) throw field("priceReason", `The markup rule gives ${formatMoney(ruled, opts.currency)} for this cost. Say why this price differs, or clear the price to use the rule.`);
    } else if (ruled !== null) {
      priceReason = null;
    }
    parts.push({ description: line.description, partNumber: line.partNumber, qtyThousandths: line.qtyThousandths ?? 1000, costMinor, sellMinor, priceReason, pickPartId: typed.newPart ? null : (typed.partId ?? null), newPart: !!typed.newPart, position: i });
    return { ...line, unitPriceMinor: sellMinor };
  });
  return { lines: priced, parts };
}

/** The save's hook: the finding's part lines create, pick or update their parts (aligned by position). */
export function linePartsHook(job: { shopId: number; id: number }, userId: number, parts: (PartFields | null)[]): AfterLines {
  return (tx, findingId, lineIds) =>
    syncLineParts(tx, {
      shopId: job.shopId,
      jobId: job.id,
      findingId,
      userId,
      lines: parts.flatMap((p, i) => (p ? [{ ...p, lineId: lineIds[i]! }] : [])),
    });
}

// ---- the shop's markup setting ----------------------------------------------------------------

const FORM_FIELD: Record<string, string> = { percent: "markupPercent", "bands.0.upTo": "band1UpTo", "bands.0.percent": "band1Percent", "bands.1.upTo": "band2UpTo", "bands.1.percent": "band2Percent" };

/** The form's rule; a bad value is refused beside its field (the last band's percent is topPercent). */
export function readMarkupForm(input: MarkupSettingsInput, currency: string): MarkupRule {
  const need = (key: string, text: string) => {
    if (!text) throw new AppError("invalid", "Enter a percent.", { [key]: ["Enter a percent, e.g. 35."] });
    return text.replace(/\s*%$/, "");
  };
  const amount = (key: string, text: string) => onField(key, () => parseMoney(text, currency));
  let rule: MarkupRule = NO_MARKUP;
  if (input.markupKind === "percent") rule = { kind: "percent", percent: need("markupPercent", input.markupPercent) };
  if (input.markupKind === "bands") {
    const bands: MarkupBand[] = [{ upToMinor: amount("band1UpTo", input.band1UpTo), percent: need("band1Percent", input.band1Percent) }];
    if (input.band2UpTo || input.band2Percent) bands.push({ upToMinor: amount("band2UpTo", input.band2UpTo), percent: need("band2Percent", input.band2Percent) });
    bands.push({ upToMinor: null, percent: need("topPercent", input.topPercent) });
    rule = { kind: "bands", bands };
  }
  try {
    return checkMarkupRule(rule);
  } catch (error) {
    if (!(error instanceof AppError) || !error.fields) throw error;
    const [key, messages] = Object.entries(error.fields)[0]!;
    const last = rule.kind === "bands" ? `bands.${rule.bands.length - 1}.percent` : "";
    throw new AppError("invalid", error.message, { [key === last ? "topPercent" : (FORM_FIELD[key] ?? "markupKind")]: messages });
  }
}

/** Saves the rule with the shop row locked, recorded in the shop's settings changes. */
export async function saveMarkup(actor: Actor, found: Resolved<"shop">, input: MarkupSettingsInput) {
  return saveSection(actor, found, "markup", async (tx, shopId) => {
    const { currency } = await getShopRowSettings({ shopId }, tx);
    const after = readMarkupForm(input, currency);
    const before = await getMarkupRule({ shopId }, tx);
    await saveMarkupRule({ shopId, rule: after }, tx);
    return { before, after };
  });
}

/** The stored rule as the settings form's text (amounts in the shop's currency). */
export function markupFormValues(rule: MarkupRule, currency: string) {
  const band = (i: number) => (rule.kind === "bands" && i < rule.bands.length - 1 ? rule.bands[i]! : null);
  return {
    kind: rule.kind,
    percent: rule.kind === "percent" ? rule.percent : "",
    band1UpTo: minorToInput(band(0)?.upToMinor, currency),
    band1Percent: band(0)?.percent ?? "",
    band2UpTo: minorToInput(band(1)?.upToMinor, currency),
    band2Percent: band(1)?.percent ?? "",
    topPercent: rule.kind === "bands" ? rule.bands.at(-1)!.percent : "",
  };
}
