import "server-only";
import { getClipLimits, saveClipLimits } from "@/db/queries/clips";
import { getBenchSettings, saveBenchSettings } from "@/db/queries/bench";
import { getShopRowSettings } from "@/db/queries/shop-settings";
import { transaction } from "@/db/transaction";
import { addPart, changePartStatus } from "@/db/queries/bench-parts";
import { deleteSpec, insertSpec } from "@/db/queries/bench-specs";
import { getShopBySlug, saveOwnerWaitDays } from "@/db/queries/shops";
import { AppError } from "@/lib/errors";
import { parseMoney, parseQuantity } from "@/lib/money";
import type { Actor } from "@/lib/permissions";
import type { PartInput, SpecInput } from "@/lib/schemas/bench";
import type { JobAccess, Resolved } from "@/lib/server/access";
import { onField, shopNumberStyle } from "@/lib/server/bench";
import { type NumberInput, readNumberField, readOptMeasuredField } from "@/lib/schemas/number";
import { assertPassPercents } from "@/lib/tightening-passes";
import type { BenchSettings, PartStatus } from "@/lib/bench";
import { type Save, saveSection } from "@/lib/server/shop-settings";
import type { TorqueUnit } from "@/lib/torque";
import { DEFAULT_WRENCH_CLASS, type WrenchClass } from "@/lib/torque-check";

// Parts on a job (with the waiting-on-parts rule), the shop's spec library and its bench settings.
//
// Not done here on purpose: the e-mail to the owner when the last part arrives. It needs the
// mail outbox (issue 7); the shared status entry the move writes is what the owner sees today.

export async function addJobPart(actor: Actor, { job }: JobAccess, input: PartInput) {
  const shop = await getShopBySlug({ slug: job.shopSlug });
  const qtyThousandths = onField("qty", () => parseQuantity(input.qty, shop?.currency ?? "USD"));
  if (qtyThousandths === 0) throw new AppError("invalid", "The quantity must be above zero.", { qty: ["The quantity must be above zero."] });
  const costMinor = input.cost == null ? null : onField("cost", () => parseMoney(input.cost!, shop?.currency ?? "USD"));
  const made = await addPart({
    shopId: job.shopId,
    jobId: job.id,
    userId: actor.userId,
    part: { partNumber: input.partNumber, description: input.description, supplier: input.supplier, qtyThousandths, costMinor, status: input.status, expectedOn: input.expectedOn, ...input.forWork },
  });
  return { ...made, job };
}

export async function changeJobPartStatus(actor: Actor, { job }: JobAccess, input: { part: number; from: PartStatus; to: PartStatus; expectedOn: string | null }) {
  // A blank date on a status change leaves the expected date as it was.
  const made = await changePartStatus({
    shopId: job.shopId,
    jobId: job.id,
    userId: actor.userId,
    partId: input.part,
    from: input.from,
    to: input.to,
    expectedOn: input.expectedOn ?? undefined,
  });
  return { ...made, job };
}

export async function addSpec(actor: Actor, { shop }: Resolved<"shop">, input: SpecInput) {
  const { shop: _slug, ...typed } = input;
  const style = await shopNumberStyle(shop.slug);
  // Six decimals: what the columns keep (DECIMAL(16,6)).
  const rules = (what: string) => ({ what, min: -1_000_000, max: 1_000_000, allowNegative: true, maxDecimals: 6 });
  // Each number keeps the decimals typed ("0.10" → 2): a limit's resolution, as a reading's.
  const value = readOptMeasuredField("value", typed.value, style, { what: "The value", min: 0, max: 100_000, maxDecimals: 6 });
  const min = readOptMeasuredField("min", typed.min, style, rules("The minimum"));
  const max = readOptMeasuredField("max", typed.max, style, rules("The maximum"));
  const spec = {
    ...typed,
    value: value?.value ?? null,
    min: min?.value ?? null,
    max: max?.value ?? null,
    decimals: { value: value?.decimals ?? null, min: min?.decimals ?? null, max: max?.decimals ?? null },
  };
  if (spec.min != null && spec.max != null && spec.min > spec.max) throw new AppError("invalid", "The minimum can't be above the maximum.", { min: ["The minimum can't be above the maximum."] });
  // A torque spec stores its unit id (nm, lbf_ft…) so the torque form can pre-fill from it.
  const id = await insertSpec({ shopId: shop.id, userId: actor.userId, spec });
  return { id, shop };
}

export async function removeSpec({ shop }: Resolved<"shop">, input: { spec: number }) {
  if (!(await deleteSpec({ shopId: shop.id, id: input.spec }))) throw new AppError("not_found", "That spec is already gone.");
  return { shop };
}

/** Saved in one transaction; with the actor given (the settings page), recorded in the shop's settings changes. */
export async function updateBenchSettings(
  found: Resolved<"shop">,
  typed: { torqueUnit: TorqueUnit; passes: number[]; wrenchClass?: WrenchClass; chainLimitPct: NumberInput; clipMaxMinutes: NumberInput; clipMaxGb: NumberInput; ownerWaitDays: number },
  actor: Actor | null = null,
) {
  onField("passes", () => assertPassPercents(typed.passes));
  const style = await shopNumberStyle(found.shop.slug);
  const input = {
    ...typed,
    chainLimitPct: readNumberField("chainLimitPct", typed.chainLimitPct, style, { what: "The chain wear limit (%)", min: 0.1, max: 50, maxDecimals: 2 }),
    clipMaxMinutes: readNumberField("clipMaxMinutes", typed.clipMaxMinutes, style, { what: "The longest clip (minutes)", min: 1, max: 60 }),
    clipMaxGb: readNumberField("clipMaxGb", typed.clipMaxGb, style, { what: "The largest clip (GB)", min: 0.1, max: 10 }),
  };
  const save: Save<{ bench: BenchSettings; clips: { maxSeconds: number; maxBytes: number }; ownerWaitDays: number }> = async (tx, shopId) => {
    const before = { bench: await getBenchSettings({ shopId }, tx), clips: await getClipLimits({ shopId }, tx), ownerWaitDays: (await getShopRowSettings({ shopId }, tx)).ownerWaitDays };
    const after = {
      bench: { torqueUnit: input.torqueUnit, passPercents: input.passes, chainLimitPct: input.chainLimitPct, wrenchClass: input.wrenchClass ?? DEFAULT_WRENCH_CLASS },
      clips: { maxSeconds: Math.round(input.clipMaxMinutes * 60), maxBytes: Math.round(input.clipMaxGb * 1024 ** 3) },
      ownerWaitDays: input.ownerWaitDays,
    };
    await saveBenchSettings({ shopId, settings: after.bench }, tx);
    await saveClipLimits({ shopId, ...after.clips }, tx);
    await saveOwnerWaitDays({ shopId, days: after.ownerWaitDays }, tx);
    return { before, after };
  };
  if (actor) await saveSection(actor, found, "bench", save);
  else await transaction((tx) => save(tx, found.shop.id));
  return { shop: found.shop };
}
