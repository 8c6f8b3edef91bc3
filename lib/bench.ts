// Bench records as the timeline and the bench page read them: statuses, the snapshot bodies
// kept in journal entries and display helpers (the waiting-on-parts rule is in job-workflow.ts).
// Pure: no I/O, safe in the browser and on the server.
import type { ReadingVerdict } from "@/lib/readings";
import { type ChecklistItem, reassemblyChecklist } from "@/lib/reassembly";
import { formatFixed } from "@/lib/rounding";
import { DEFAULT_PASS_PERCENTS } from "@/lib/tightening-passes";
import { TORQUE_UNIT_IDS, type TorqueUnit, convertTorque, isTorqueUnit, torqueUnitLabel } from "@/lib/torque";
import { DEFAULT_WRENCH_CLASS, WRENCH_CLASSES, type WrenchClass, outcomeText, passesText } from "@/lib/torque-check";
import { type Lubrication, type SpecialFields, type WrenchMax, anglePiece, fastenerPieces } from "@/lib/torque-special";

export const PART_STATUSES = ["needed", "ordered", "back_ordered", "received", "fitted", "returned"] as const;
export type PartStatus = (typeof PART_STATUSES)[number];
export const PART_STATUS_LABEL: Record<PartStatus, string> = {
  needed: "Needed",
  ordered: "On order",
  back_ordered: "Back-ordered",
  received: "Arrived",
  fitted: "Fitted",
  returned: "Returned to owner",
};
/** What a part usually does next, offered first when its status is changed. */
export const USUAL_NEXT_PART_STATUS: Record<PartStatus, PartStatus> = {
  needed: "ordered",
  ordered: "received",
  back_ordered: "received",
  received: "fitted",
  fitted: "returned",
  returned: "needed",
};
/** Parts the job is still waiting for. */
export const OUTSTANDING_PART_STATUSES: readonly PartStatus[] = ["needed", "ordered", "back_ordered"];
export const isOutstanding = (s: PartStatus) => OUTSTANDING_PART_STATUSES.includes(s);

export const SPEC_KINDS = ["torque", "limit", "capacity", "note"] as const;
export type SpecKind = (typeof SPEC_KINDS)[number];
export const SPEC_KIND_LABEL: Record<SpecKind, string> = { torque: "Torque", limit: "Service limit", capacity: "Capacity", note: "Note" };

/** wrenchClass: the wrench the shop usually tightens with; its ISO 6789-1 class gives a record's default tolerance. */
export type BenchSettings = { torqueUnit: TorqueUnit; passPercents: number[]; chainLimitPct: number; wrenchClass: WrenchClass };
export const DEFAULT_BENCH_SETTINGS: BenchSettings = { torqueUnit: "nm", passPercents: [...DEFAULT_PASS_PERCENTS], chainLimitPct: 3, wrenchClass: DEFAULT_WRENCH_CLASS };

// ---- what a timeline entry of each bench kind holds (a snapshot at the time of recording) ----

export type TorqueBody = {
  fastener: string;
  specValue: number;
  unit: TorqueUnit;
  appliedValue: number | null;
  tool: string | null;
  passPercents: number[];
  boltCount: number | null;
  /** "cross" when a bolt count had a tightening pattern drawn for it. */
  pattern: "cross" | null;
  note: string | null;
  /** The shop's preferred unit when recorded, shown beside the unit entered. */
  displayUnit: TorqueUnit;
  // Issue 18: absent on entries written before; read as "not recorded" (tolerance: the default wrench's).
  /** ± % of spec applied may be off and still be "within tolerance". */
  tolerancePct?: number;
  wrenchClass?: WrenchClass | null;
  passesDone?: boolean | null;
  checkPass?: boolean | null;
  /** The plausibility warning the technician confirmed when recording (lib/torque-check.ts). */
  warning?: string | null;
  // Issue 18 §3–4 (lib/torque-special.ts): absent on entries written before; nothing is said then.
  toolSerial?: string | null;
  /** "YYYY-MM-DD" */
  calibratedOn?: string | null;
  /** The wrench's maximum: passes below 20 % of it are flagged where the record is read (wrenchRangeFlags). */
  wrenchMax?: WrenchMax | null;
} & SpecialFields;

/** A record's tolerance: its own, or its wrench's, or the usual click wrench's. */
export function toleranceOf(b: Pick<TorqueBody, "tolerancePct" | "wrenchClass">): number {
  return b.tolerancePct ?? WRENCH_CLASSES[b.wrenchClass ?? DEFAULT_WRENCH_CLASS].tolerancePct;
}

/**
 * limitPct: the limit the chain was judged by. Issue 18: with a large sprocket's tooth count, the
 * smaller of the shop's limit and 200/N % (lib/chain-wear.ts); absent on older entries.
 */
export type ChainSnapshot = { pitchMm: number; pitches: number; measuredMm: number; limitPct: number; sprocketTeeth?: number | null; shopLimitPct?: number };
/** Decimals typed for each number (the instrument's resolution: "0.20" → 2); null when not known. */
export type ReadingDecimals = { value: number | null; min: number | null; max: number | null };
export type ReadingBody = {
  label: string;
  value: number;
  unit: string | null;
  min: number | null;
  max: number | null;
  source: string | null;
  verdict: ReadingVerdict;
  marginText: string | null;
  chain: ChainSnapshot | null;
  /** Issue 18: absent on entries written before; those show their numbers as before. */
  decimals?: ReadingDecimals;
};

export type TeardownBody = {
  seq: number;
  removed: string;
  count: number | null;
  size: string | null;
  notes: string | null;
  storage: string | null;
  torque: StepTorque | null;
};

/**
 * A teardown step's torque; angle stages, lubrication and one-time from issue 18 §4 (absent before);
 * loosen-and-retorque and what "other" was on the threads from migration 32 (absent before that).
 */
export type StepTorque = {
  value: number;
  unit: TorqueUnit;
  boltCount: number | null;
  angleStages?: number[];
  lubrication?: Lubrication | null;
  oneTime?: boolean;
} & Pick<SpecialFields, "lubricationOther" | "loosenRetorque" | "retorqueSequence">;

/** Never carries cost or supplier: an entry can be shared with the owner. */
export type PartBody = {
  event: "added" | "status";
  description: string;
  partNumber: string | null;
  qty: string;
  from: PartStatus | null;
  to: PartStatus;
  expectedOn: string | null;
  /** Issue 19: a part that arrived and went to another job (job numbers as shown); absent otherwise. */
  movedTo?: string;
  movedFrom?: string;
};

const isObj = (v: unknown): v is Record<string, unknown> => !!v && typeof v === "object" && !Array.isArray(v);
const isNum = (v: unknown): v is number => typeof v === "number" && Number.isFinite(v);
const isStr = (v: unknown): v is string => typeof v === "string";
const isPartStatus = (v: unknown): v is PartStatus => (PART_STATUSES as readonly unknown[]).includes(v);

export function isTorqueBody(b: unknown): b is TorqueBody {
  return isObj(b) && isStr(b.fastener) && isNum(b.specValue) && isTorqueUnit(b.unit) && isTorqueUnit(b.displayUnit) && Array.isArray(b.passPercents) && b.passPercents.every(isNum);
}
export function isReadingBody(b: unknown): b is ReadingBody {
  return isObj(b) && isStr(b.label) && isNum(b.value) && ["within", "below", "above", "no_limit"].includes(b.verdict as string);
}
export function isTeardownBody(b: unknown): b is TeardownBody {
  return isObj(b) && isNum(b.seq) && isStr(b.removed);
}
export function isPartBody(b: unknown): b is PartBody {
  return isObj(b) && isStr(b.description) && isPartStatus(b.to) && (b.event === "added" || b.event === "status");
}

// ---- display ----

const DECIMALS: Record<TorqueUnit, number> = { nm: 1, lbf_ft: 1, lbf_in: 1, kgf_m: 2 };

/** "13.0 N·m" in `to`, rounded half-up like a printed table. */
export function torqueText(value: number, from: TorqueUnit, to: TorqueUnit = from): string {
  return `${formatFixed(convertTorque(value, from, to), DECIMALS[to])} ${torqueUnitLabel(to)}`;
}

/** The value in the unit it was entered in first, then every other unit (shown one tap away). */
export function torqueViews(value: number, unit: TorqueUnit, displayUnit: TorqueUnit): { primary: string; shop: string | null; others: string[] } {
  return {
    primary: torqueText(value, unit),
    shop: unit === displayUnit ? null : torqueText(value, unit, displayUnit),
    others: TORQUE_UNIT_IDS.filter((u) => u !== unit).map((u) => torqueText(value, unit, u)),
  };
}

type ProofFields = "specValue" | "appliedValue" | "unit" | "displayUnit" | "passPercents" | "pattern" | "tolerancePct" | "wrenchClass" | "passesDone" | "checkPass" | keyof SpecialFields;
/**
 * "torqued to 72.0 lbf·ft (97.6 N·m), within ±4 % of …; 3 passes (30 → 60 → 100 %) done; …" — the
 * proof line staff, the owner and e-mails read. Never "to spec" unless applied is within tolerance.
 * Angle stages, lubrication, loosen-and-retorque and one-time fasteners follow when recorded.
 */
export function torqueProof(b: Pick<TorqueBody, ProofFields>): string {
  const outcome = outcomeText({ specValue: b.specValue, appliedValue: b.appliedValue, unit: b.unit, tolerancePct: toleranceOf(b) }, b.displayUnit);
  return [outcome, passesText(b), anglePiece(b), b.pattern === "cross" ? "cross pattern" : null, ...fastenerPieces(b)].filter(Boolean).join("; ");
}

/** "torqued to spec, …" → "Torqued to spec, …" for the start of a sentence. */
export const sentenceCase = (text: string) => text.charAt(0).toUpperCase() + text.slice(1);

/** A number as typed back to a person: no float noise, no trailing zeros ("0.125", "322.3"). */
export function plainNumber(n: number): string {
  return String(Number(n.toPrecision(12)));
}

// A limit's words ("0.10–0.20 mm", at its typed resolution) are lib/reading-text.ts readingLimitText,
// for readings and the shop's spec library alike.

/** Stored teardown steps → the reassembly checklist, each torque with the shop's pass schedule. */
export function checklistFromSteps(
  steps: readonly { id: number; seq: number; removed: string; count: number | null; size: string | null; notes: string | null; storage: string | null; photoId: string | null; torque: StepTorque | null }[],
  passPercents: readonly number[],
): ChecklistItem[] {
  return reassemblyChecklist(
    steps.map((s) => ({ ...s, photoIds: s.photoId ? [s.photoId] : [], torqueSpec: s.torque ? { ...s.torque, passPercents } : null })),
  );
}

