// Kinds of machine a powersports / small-engine shop takes in. Keys are stored; labels shown.
export const MACHINE_KINDS = ["atv", "side_by_side", "dirt_bike", "street_bike", "snowmobile", "watercraft", "small_engine", "other"] as const;

export type MachineKind = (typeof MACHINE_KINDS)[number];

export const MACHINE_KIND_LABEL: Record<MachineKind, string> = {
  atv: "ATV",
  side_by_side: "Side-by-side",
  dirt_bike: "Dirt bike",
  street_bike: "Street bike",
  snowmobile: "Snowmobile",
  watercraft: "Personal watercraft",
  small_engine: "Small engine",
  other: "Other",
};

export function describeMachine(m: { year: number | null; make: string; model: string }): string {
  return [m.year, m.make, m.model].filter(Boolean).join(" ");
}
