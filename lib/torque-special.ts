// How a fastener is tightened beyond its torque value, and the wrench that tightened it (issue 18
// §3–4): angle stages after the torque ("20 N·m + 90°"), loosen-and-retorque, the thread
// lubrication, one-time (torque-to-yield) fasteners; the wrench's serial, calibration date and
// maximum. Pure: no I/O, used by the server, the forms and every view of a record.
import { type NumberStyle, parseNumberInput } from "@/lib/number-input";
import { formatFixed } from "@/lib/rounding";
import { type TorqueUnit, convertTorque, torqueUnitLabel } from "@/lib/torque";
import { fastenerFacts, plausibilityWarning, plausibleRangeNm } from "@/lib/torque-check";

// ---- how it is tightened ---------------------------------------------------------------------

export const LUBRICATIONS = ["dry", "oiled", "thread_locker", "other"] as const;
export type Lubrication = (typeof LUBRICATIONS)[number];
export const LUBRICATION_LABEL: Record<Lubrication, string> = { dry: "Dry", oiled: "Oiled", thread_locker: "Thread-locker", other: "Other (say what)" };
export const isLubrication = (v: unknown): v is Lubrication => typeof v === "string" && (LUBRICATIONS as readonly string[]).includes(v);

/** Said on the record and on the reassembly checklist item of a one-time fastener. */
export const ONE_TIME_TEXT = "one-time (torque-to-yield) fasteners: replace with new, never re-use";
export const REPLACE_WITH_NEW = "Replace with new: one-time (torque-to-yield) fasteners, never re-use them";

export const MAX_ANGLE_STAGES = 4;

/**
 * "90", "90°", "+ 90° + 90°", "90; 45" → degrees per stage, each read by the one number reader in
 * the shop's style (so "22,5" is read as the shop writes it). Stages are split on "+" or ";" only:
 * a comma may be the shop's decimal mark. Blank → no stages.
 */
export function parseAngleStages(text: string | null | undefined, style: NumberStyle): { ok: true; stages: number[] } | { ok: false; message: string } {
  const typed = (text ?? "").trim().replace(/^\+\s*/, "");
  if (typed === "") return { ok: true, stages: [] };
  const pieces = typed.split(/\s*[+;]\s*/).map((p) => p.replace(/\s*(?:°|º|deg|degrees)$/i, "").trim());
  const shape = `Write the angle in degrees after the torque, e.g. “90” or “90 + 90”.`;
  if (pieces.some((p) => p === "")) return { ok: false, message: shape };
  if (pieces.length > MAX_ANGLE_STAGES) return { ok: false, message: `At most ${MAX_ANGLE_STAGES} angle stages.` };
  const stages: number[] = [];
  for (const [i, piece] of pieces.entries()) {
    const what = pieces.length === 1 ? "The angle (degrees)" : `Angle stage ${i + 1} (degrees)`;
    // A whole turn at most per stage; tenths of a degree are more than any protractor reads.
    const r = parseNumberInput(piece, style, { what, min: 1, max: 360, maxDecimals: 1 });
    if (!r.ok) return { ok: false, message: r.readings.length || /at (least|most)|decimal/.test(r.message) ? r.message : shape };
    stages.push(r.value);
  }
  return { ok: true, stages };
}

/** [90, 90] → "+ 90° + 90°". */
export const angleText = (stages: readonly number[]) => stages.map((d) => `+ ${String(Number(d.toFixed(1)))}°`).join(" ");

export function lubricationText(l: Lubrication, other?: string | null): string {
  if (l === "dry") return "threads dry";
  if (l === "oiled") return "threads oiled";
  if (l === "thread_locker") return "thread-locker on the threads";
  return other ? `threads: ${other}` : "threads lubricated (other)";
}

/** Absent on records written before issue 18 §4: then nothing is said. */
export type SpecialFields = {
  angleStages?: number[] | null;
  angleDone?: boolean | null;
  loosenRetorque?: boolean | null;
  retorqueSequence?: string | null;
  lubrication?: Lubrication | null;
  lubricationOther?: string | null;
  oneTime?: boolean | null;
};

/**
 * The plausibility warning (lib/torque-check.ts) for a torque followed by angle stages: there the
 * torque only seats the fastener and the angle brings the load, so a torque under the size's band
 * is expected and not questioned; one over it still is (common trade practice, no published source).
 */
export function torqueAngleWarning(value: number, unit: TorqueUnit, fastener: string, angleStages: readonly number[]): string | null {
  const warning = plausibilityWarning(value, unit, fastener);
  if (!warning || !angleStages.length) return warning;
  const { diameterMm, propertyClass } = fastenerFacts(fastener);
  const range = diameterMm == null ? null : plausibleRangeNm(diameterMm, propertyClass);
  return range && convertTorque(value, unit, "nm") < range.low ? null : warning;
}

/** What a teardown step's fasteners are, as the plausibility check reads them ("8 × M6 clutch cover bolts"). */
export const stepFastener = (s: { removed: string; count?: number | null; size?: string | null }) => [s.count ? `${s.count} ×` : null, s.size, s.removed].filter(Boolean).join(" ");

/** The angle piece of the proof line: recorded as done, or said not to be. */
export function anglePiece(b: Pick<SpecialFields, "angleStages" | "angleDone">): string | null {
  if (!b.angleStages?.length) return null;
  return `then ${angleText(b.angleStages)} by angle, ${b.angleDone ? "done" : "not recorded as done"}`;
}

/** Lubrication, loosen-and-retorque and one-time, as proof-line pieces (none for old records). */
export function fastenerPieces(b: Pick<SpecialFields, "lubrication" | "lubricationOther" | "loosenRetorque" | "retorqueSequence" | "oneTime">): string[] {
  return [
    b.lubrication ? lubricationText(b.lubrication, b.lubricationOther) : null,
    b.loosenRetorque ? `loosened and retorqued${b.retorqueSequence ? ` (${b.retorqueSequence})` : ""}` : null,
    b.oneTime ? ONE_TIME_TEXT : null,
  ].filter((p): p is string => p != null);
}

/**
 * A teardown step's torque beyond its value: "then + 90° by angle; threads oiled; loosened and
 * retorqued (…); one-time …", or null (steps before issue 18 §4). The same pieces as a record's.
 */
export function stepTorqueNote(t: { angleStages?: readonly number[] | null } & Pick<SpecialFields, "lubrication" | "lubricationOther" | "loosenRetorque" | "retorqueSequence" | "oneTime">): string | null {
  const pieces = [...(t.angleStages?.length ? [`then ${angleText(t.angleStages)} by angle`] : []), ...fastenerPieces(t)];
  return pieces.length ? pieces.join("; ") : null;
}

// ---- the wrench --------------------------------------------------------------------------------

export type WrenchMax = { value: number; unit: TorqueUnit };
const DECIMALS: Record<TorqueUnit, number> = { nm: 1, lbf_ft: 1, lbf_in: 1, kgf_m: 2 };
const t = (value: number, unit: TorqueUnit) => `${formatFixed(value, DECIMALS[unit])} ${torqueUnitLabel(unit)}`;

/**
 * ISO 6789-2:2017 calibrates a hand torque tool at 20 %, 60 % and 100 % of its maximum, so its
 * usable range is 20–100 % (REFERENCES.md §9, from memory; calibration labs' summaries agree).
 * Every pass of the schedule below 20 % of the wrench's maximum is flagged, and a spec above the
 * maximum. Flags, never refusals: the pass may have been done with another wrench.
 */
export const CALIBRATED_FROM_PCT = 20;
export function wrenchRangeFlags(r: { specValue: number; unit: TorqueUnit; passPercents: readonly number[]; wrenchMax?: WrenchMax | null }): string[] {
  const max = r.wrenchMax;
  if (!max || !(max.value > 0)) return [];
  const maxNm = convertTorque(max.value, max.unit, "nm");
  const lowNm = (maxNm * CALIBRATED_FROM_PCT) / 100;
  const flags: string[] = [];
  const below = r.passPercents
    .map((percent, i) => ({ pass: i + 1, percent, value: (r.specValue * percent) / 100 }))
    // 1e-9: a pass at exactly 20 % is inside the range, whatever float division makes of it.
    .filter((p) => convertTorque(p.value, r.unit, "nm") < lowNm * (1 - 1e-9));
  if (below.length) {
    const list = below.map((p) => `${p.pass} (${p.percent} %, ${t(p.value, r.unit)})`);
    const named = list.length === 1 ? `Pass ${list[0]} is` : `Passes ${list.slice(0, -1).join(", ")} and ${list.at(-1)} are`;
    flags.push(
      `${named} below 20 % of the wrench's ${t(max.value, max.unit)} maximum (${t((max.value * CALIBRATED_FROM_PCT) / 100, max.unit)}): ISO 6789-1/-2 calibrates at 20 %, 60 % and 100 % of the maximum; below 20 % the wrench is outside its calibrated range`,
    );
  }
  if (convertTorque(r.specValue, r.unit, "nm") > maxNm * (1 + 1e-9)) {
    flags.push(`The spec (${t(r.specValue, r.unit)}) is above the wrench's ${t(max.value, max.unit)} maximum: this wrench can't reach it`);
  }
  return flags;
}

/** Today's date where the shop is, "YYYY-MM-DD". */
export function todayIn(timeZone: string, now: Date = new Date()): string {
  const parts = new Intl.DateTimeFormat("en-US", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" }).formatToParts(now);
  const part = (type: string) => parts.find((p) => p.type === type)!.value;
  return `${part("year")}-${part("month")}-${part("day")}`;
}

/** A calibration date after today can't be on a certificate yet; one before 1950 is a typing slip. */
export function calibrationRefusal(calibratedOn: string, today: string): string | null {
  if (calibratedOn > today) return `The calibration date can’t be after today (${today}): use the date on the wrench’s calibration certificate.`;
  return calibratedOn < "1950-01-01" ? "Use the date on the wrench’s calibration certificate, e.g. 2026-03-14." : null;
}

/**
 * More than a year between the calibration and the day the wrench was used. ISO 6789 (2003 on)
 * gives 12 months or 5,000 cycles as the default interval where the user has set none — secondary
 * sources summarising the standard [C], its text not seen; the shop's own procedure takes
 * precedence. Dates compare as "YYYY-MM-DD" text; 29 February + 1 year is "…-02-29", after the 28th.
 */
export function calibrationOverAYear(calibratedOn: string, usedOn: string): boolean {
  const yearLater = `${String(Number(calibratedOn.slice(0, 4)) + 1).padStart(4, "0")}${calibratedOn.slice(4)}`;
  return usedOn > yearLater;
}

/** "Tool: 3/8 click wrench · serial TW-042 · calibrated 2025-01-10 (calibration over a year old) · maximum 100.0 N·m", or null. */
export function toolLine(b: { tool: string | null; toolSerial?: string | null; calibratedOn?: string | null; wrenchMax?: WrenchMax | null }, usedOn: string): string | null {
  const parts = [
    b.tool,
    b.toolSerial ? `serial ${b.toolSerial}` : null,
    b.calibratedOn ? `calibrated ${b.calibratedOn}${calibrationOverAYear(b.calibratedOn, usedOn) ? " (calibration over a year old)" : ""}` : null,
    b.wrenchMax ? `maximum ${t(b.wrenchMax.value, b.wrenchMax.unit)}` : null,
  ].filter(Boolean);
  return parts.length ? `Tool: ${parts.join(" · ")}` : null;
}
