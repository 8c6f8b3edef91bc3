// Which safety cautions (lib/cautions.ts) a reassembly checklist item carries. The rule is simple
// on purpose, so a technician can predict it:
// - torque: the item has a torque spec;
// - brakes: what came off, or its notes, names brake parts (brake, caliper, master cylinder);
// - fuel: they name fuel parts (fuel, petrol, gasoline, carburettor / carb, injector, float bowl, petcock).
// Teardown steps carry no category, so this reads their words: a step worded otherwise gets no
// brake or fuel caution here, and the bench page's general cautions still apply to it.
// Pure: no I/O, safe in the browser and on the server.
import type { CautionKey } from "@/lib/cautions";

const BRAKE_WORDS = /\b(brakes?|calipers?|callipers?|master[ -]cylinders?)\b/i;
const FUEL_WORDS = /\b(fuel|petrol|gasoline|carb|carbs|carburett?ors?|carburet(?:t)?ers?|injectors?|float[ -]bowls?|petcocks?)\b/i;

export type CautionSubject = { removed: string; notes: string | null; torque: unknown | null };

export function checklistCautions(item: CautionSubject): CautionKey[] {
  const words = [item.removed, item.notes ?? ""].join("\n");
  const out: CautionKey[] = [];
  if (item.torque != null) out.push("torque");
  if (BRAKE_WORDS.test(words)) out.push("brakes");
  if (FUEL_WORDS.test(words)) out.push("fuel");
  return out;
}
