// Structured measurement sets (issue 18 §5): valve clearances with the shim arithmetic, clutch
// plates, brake discs, springs, ring gaps, compression and leak-down. Each item is judged by the one
// reading rule (lib/readings.ts evaluateReading) against the limit the shop typed, with its source.
// Pure: no I/O, safe in the browser (no zod).
import type { SafetyCategory } from "@/lib/approvals";
import { type ReadingVerdict, evaluateReading } from "@/lib/readings";
import { formatFixed, roundHalfUp } from "@/lib/rounding";

export const MEASUREMENT_KINDS = ["valve_clearance", "clutch_friction", "clutch_steel", "disc_thickness", "disc_runout", "spring_length", "ring_gap", "compression", "leak_down"] as const;
export type MeasurementKind = (typeof MEASUREMENT_KINDS)[number];
export const isMeasurementKind = (v: unknown): v is MeasurementKind => (MEASUREMENT_KINDS as readonly unknown[]).includes(v);

/** At most this many items (valves, plates, cylinders) in one set: four cylinders × four valves. */
export const MAX_SET_ITEMS = 16;
export const VALVE_SIDES = ["intake", "exhaust"] as const;
export type ValveSide = (typeof VALVE_SIDES)[number];
export const VALVE_SIDE_LABEL: Record<ValveSide, string> = { intake: "Intake", exhaust: "Exhaust" };

/** The set form's numbered row fields (`value0`, `cyl0` …): one row per item. */
export const MEASUREMENT_ROW_FIELDS = ["label", "value", "cyl", "side", "shim"] as const;
export const rowField = (name: (typeof MEASUREMENT_ROW_FIELDS)[number], i: number) => `${name}${i}`;
/** The fields the set form shows beside their inputs (lib/schemas/form-fields.ts); "job" goes in its banner. */
export const MEASUREMENT_SET_VISIBLE: readonly string[] = [
  "kind",
  "unit",
  "min",
  "max",
  "exhaustMin",
  "exhaustMax",
  "source",
  "note",
  ...Array.from({ length: MAX_SET_ITEMS }, (_, i) => MEASUREMENT_ROW_FIELDS.map((f) => rowField(f, i))).flat(),
];

type KindInfo = {
  title: string;
  /** Units offered; the first is the default. */
  units: readonly string[];
  /** The default name of item n (1-based), filled into the form. */
  item: (n: number) => string;
  /** Which limit the maker usually gives; both fields stay available. */
  limitHint: string;
  safety: SafetyCategory;
  /** Why an out-of-limit item matters, for the owner. Our own words: common trade practice, no published source. */
  why: string;
};

export const MEASUREMENT_KIND_INFO: Record<MeasurementKind, KindInfo> = {
  valve_clearance: {
    title: "Valve clearance",
    units: ["mm"],
    item: () => "",
    limitHint: "Type the range for intake and for exhaust.",
    safety: "none",
    why: "A valve with too little clearance may not close fully, lose compression and burn; too much clearance makes noise and wears the valve train.",
  },
  clutch_friction: {
    title: "Clutch friction-plate thickness",
    units: ["mm"],
    item: (n) => `Friction plate ${n}`,
    limitHint: "Usually a service limit (minimum).",
    safety: "none",
    why: "Friction plates worn below their limit let the clutch slip, so the machine loses drive under load and the clutch overheats.",
  },
  clutch_steel: {
    title: "Clutch steel-plate warpage",
    units: ["mm"],
    item: (n) => `Steel plate ${n}`,
    limitHint: "Usually a maximum.",
    safety: "none",
    why: "Warped steel plates make the clutch drag or grab, so the machine creeps in gear and shifts badly.",
  },
  disc_thickness: {
    title: "Brake disc thickness",
    units: ["mm"],
    item: (n) => (n === 1 ? "Front disc" : n === 2 ? "Rear disc" : `Disc ${n}`),
    limitHint: "Usually a minimum (often stamped on the disc).",
    safety: "brakes",
    why: "A disc below its minimum thickness holds less heat and can crack or fade, so the machine takes longer to stop.",
  },
  disc_runout: {
    title: "Brake disc run-out",
    units: ["mm"],
    item: (n) => (n === 1 ? "Front disc" : n === 2 ? "Rear disc" : `Disc ${n}`),
    limitHint: "Usually a maximum.",
    safety: "brakes",
    why: "A disc running out of true pulses at the lever and wears the pads unevenly, which weakens braking.",
  },
  spring_length: {
    title: "Spring free length",
    units: ["mm"],
    item: (n) => `Spring ${n}`,
    limitHint: "Usually a service limit (minimum).",
    safety: "none",
    why: "A spring shorter than its limit has lost its strength: a clutch spring lets the clutch slip, a valve spring lets the valve float.",
  },
  ring_gap: {
    title: "Piston-ring end gap",
    units: ["mm"],
    item: (n) => `Cylinder ${n}, top ring`,
    limitHint: "Usually a maximum; some manuals give a range.",
    safety: "none",
    why: "A ring gap over its limit lets combustion gas past the piston: less power, more oil burnt and blow-by.",
  },
  compression: {
    title: "Compression",
    units: ["kPa", "psi", "bar"],
    item: (n) => `Cylinder ${n}`,
    limitHint: "Usually a minimum, sometimes a range.",
    safety: "none",
    why: "Compression under the limit points to wear or a leak at the rings, valves or head gasket: hard starting and less power.",
  },
  leak_down: {
    title: "Leak-down",
    units: ["%"],
    item: (n) => `Cylinder ${n}`,
    limitHint: "Usually a maximum percentage.",
    safety: "none",
    why: "Leak-down over the limit means the cylinder doesn't hold pressure: worn rings, valves not sealing or a head gasket leak.",
  },
};

/** The caveat the shim suggestion always carries (UI, finding text, tests). */
export const SHIM_SOURCE_NOTE = "common trade practice, no published source — check against the maker's manual";

// ---- numbers as typed: value + the decimals typed (0.20 keeps 2: the instrument's resolution) ----

export type Typed = { value: number; decimals: number };
export const typedText = (t: Typed) => formatFixed(t.value, t.decimals);

/** Decimals a computed number needs (0.125 → 3), at most 6 (what the columns keep). */
function decimalsNeeded(n: number): number {
  const frac = String(Number(n.toPrecision(12))).split(".")[1] ?? "";
  return Math.min(6, frac.length);
}

// ---- shim arithmetic ---------------------------------------------------------------------------

/** The clearance to aim for: the middle of the maker's range (common trade practice, no published source). */
export function targetClearance(min: Typed, max: Typed): Typed {
  const value = roundHalfUp((min.value + max.value) / 2, 6);
  return { value, decimals: Math.max(min.decimals, max.decimals, decimalsNeeded(value)) };
}

export type ShimSuggestion = {
  newShim: Typed;
  /** "2.50 + 0.08 − 0.15 = 2.43 mm" */
  arithmetic: string;
  /** Set when no shim could be that thin: the measurement or the valve seat needs a look. */
  problem: string | null;
};

/**
 * New shim = old shim + measured clearance − specified clearance (common trade practice, no
 * published source). A tight valve (measured under spec) gets a thinner shim, a loose one a thicker.
 * Worked to the finest resolution typed, half-up, so 2.50 + 0.08 − 0.15 is 2.43, not 2.4300000000000006.
 */
export function suggestShim(oldShim: Typed, measured: Typed, specified: Typed, unit = "mm"): ShimSuggestion {
  const decimals = Math.max(oldShim.decimals, measured.decimals, specified.decimals);
  const value = roundHalfUp(oldShim.value + measured.value - specified.value, decimals);
  const t = (n: number) => formatFixed(n, decimals);
  const arithmetic = `${t(oldShim.value)} + ${t(measured.value)} − ${t(specified.value)} = ${t(value)} ${unit}`;
  return {
    newShim: { value, decimals },
    arithmetic,
    problem: value <= 0 ? "No shim is that thin: re-measure, and check the valve and its seat for wear." : null,
  };
}

// ---- one item judged -------------------------------------------------------------------------------

export type ValveDetail = { cylinder: number; side: ValveSide; position: string | null; oldShim: Typed | null };
export type ItemLimit = { min: Typed | null; max: Typed | null };

export type JudgedItem = {
  key: string;
  label: string;
  value: Typed;
  limit: ItemLimit;
  verdict: ReadingVerdict;
  marginText: string | null;
  valve: ValveDetail | null;
  shim: ShimSuggestion | null;
};

export const isOut = (v: ReadingVerdict) => v === "above" || v === "below";

/** "exhaust:1:left": the same valve across jobs; "friction plate 3" for the other kinds. */
export function itemKey(label: string, valve: ValveDetail | null): string {
  const slug = (s: string) => s.trim().toLowerCase().replace(/\s+/g, " ").slice(0, 60);
  return valve ? `${valve.side}:${valve.cylinder}:${slug(valve.position ?? "")}` : slug(label);
}

export function valveLabel(v: Pick<ValveDetail, "cylinder" | "side" | "position">): string {
  return `${VALVE_SIDE_LABEL[v.side]}, cyl ${v.cylinder}${v.position ? `, ${v.position}` : ""}`;
}

/** Judges one item with the reading rule; an out-of-limit valve with its old shim gets a suggested shim. */
export function judgeItem(input: { label: string; value: Typed; limit: ItemLimit; unit: string; valve: ValveDetail | null }): JudgedItem {
  const { value, limit, unit, valve } = input;
  const decimals = Math.max(value.decimals, limit.min?.decimals ?? 0, limit.max?.decimals ?? 0);
  const result = evaluateReading({ value: value.value, min: limit.min?.value ?? null, max: limit.max?.value ?? null, unit, decimals });
  const label = valve ? valveLabel(valve) : input.label;
  const shim = valve && valve.oldShim && isOut(result.verdict) && limit.min && limit.max ? suggestShim(valve.oldShim, value, targetClearance(limit.min, limit.max), unit) : null;
  return { key: itemKey(label, valve), label, value, limit, verdict: result.verdict, marginText: result.marginText ?? null, valve, shim };
}

/** "0.10–0.20 mm", "at least 2.8 mm", "at most 10 %". */
export function itemLimitText(limit: ItemLimit, unit: string): string {
  const u = unit ? ` ${unit}` : "";
  if (limit.min && limit.max) return `${typedText(limit.min)}–${typedText(limit.max)}${u}`;
  if (limit.min) return `at least ${typedText(limit.min)}${u}`;
  if (limit.max) return `at most ${typedText(limit.max)}${u}`;
  return "no limit";
}

const VERDICT_WORDS: Record<ReadingVerdict, string> = { within: "within limit", above: "OUT OF LIMIT (over)", below: "OUT OF LIMIT (under)", no_limit: "no limit given" };
export const verdictWords = (v: ReadingVerdict) => VERDICT_WORDS[v];

// ---- the snapshot a set's timeline entry keeps, and the finding drafted from it ---------------------

export type MeasurementSetBody = {
  measurementSet: { kind: MeasurementKind; title: string; unit: string; source: string; note: string | null };
  items: JudgedItem[];
};
export function isMeasurementSetBody(b: unknown): b is MeasurementSetBody {
  const o = b as Partial<MeasurementSetBody> | null;
  return !!o && typeof o === "object" && !!o.measurementSet && isMeasurementKind(o.measurementSet.kind) && Array.isArray(o.items);
}

/** "Valve clearance: 1 of 4 out of limit" / "…: all 4 within limit". */
export function setHeadline(title: string, items: readonly Pick<JudgedItem, "verdict">[]): string {
  const out = items.filter((i) => isOut(i.verdict)).length;
  return `${title}: ${out ? `${out} of ${items.length} out of limit` : `all ${items.length} within limit`}`;
}

/** The headline and where the limit comes from, for a one-line summary (e-mail). */
export const measurementSetSummary = ({ measurementSet: set, items }: MeasurementSetBody) => `${setHeadline(set.title, items)} (limit from ${set.source})`;

/** One line of the finding per item: value, verdict, limit (and its source), the suggested shim with its arithmetic. */
export function itemLine(item: JudgedItem, unit: string, source: string | null): string {
  const parts = [`${item.label}: ${typedText(item.value)} ${unit} — ${verdictWords(item.verdict)}; limit ${itemLimitText(item.limit, unit)}${source ? ` (${source})` : ""}`];
  if (item.marginText && isOut(item.verdict)) parts.push(item.marginText);
  if (item.shim) parts.push(item.shim.problem ?? `suggested shim ${typedText(item.shim.newShim)} ${unit} (${item.shim.arithmetic})`);
  return `- ${parts.join("; ")}.`;
}

/** What a finding's text may hold (lib/schemas/approvals.ts: "found" up to 4000 characters). */
const FOUND_MAX = 4000;
const SHIM_LINE = `Suggested shims: old shim + measured − specified clearance (the middle of the maker's range) — ${SHIM_SOURCE_NOTE}. Fit the nearest shim to hand and measure again.`;

/** What a draft finding made from a set says: title, what was found (every item with its limit and source), why it matters. */
export function findingFromSet(body: MeasurementSetBody): { title: string; found: string; whyItMatters: string; safety: SafetyCategory } {
  const { measurementSet: set, items } = body;
  const out = items.filter((i) => isOut(i.verdict));
  const within = items.filter((i) => !isOut(i.verdict));
  const info = MEASUREMENT_KIND_INFO[set.kind];
  const head = `${set.title} measured on ${items.length} item${items.length === 1 ? "" : "s"}, against the limit from ${set.source}.`;
  const tail = [out.some((i) => i.shim && !i.shim.problem) ? SHIM_LINE : null, set.note ? `Note: ${set.note}` : null].filter((l): l is string => l != null);
  // Each line names the source; when that is too long for the finding, the heading names it once,
  // and only then are in-limit items left out (the out-of-limit ones always stay).
  const build = (perLine: boolean, kept: number) => {
    const line = (i: JudgedItem) => itemLine(i, set.unit, perLine ? set.source : null);
    const rest = within.slice(0, kept).map(line);
    const also = rest.length ? [kept < within.length ? "Also measured (some left out):" : "Also measured:", ...rest] : [];
    return [head, "Out of limit:", ...out.map(line), ...also, ...tail].join("\n");
  };
  let found = build(true, within.length);
  if (found.length > FOUND_MAX) found = build(false, within.length);
  for (let kept = within.length - 1; found.length > FOUND_MAX && kept >= 0; kept--) found = build(false, kept);
  return { title: setHeadline(set.title, items).slice(0, 200), found: found.slice(0, FOUND_MAX), whyItMatters: info.why, safety: info.safety };
}
