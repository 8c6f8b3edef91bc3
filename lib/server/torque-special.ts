import "server-only";
import type { StepTorque, TorqueBody } from "@/lib/bench";
import { AppError } from "@/lib/errors";
import type { NumberStyle } from "@/lib/number-input";
import type { TorqueRecordInput } from "@/lib/schemas/bench";
import { type NumberInput, readNumberField } from "@/lib/schemas/number";
import { type TorqueUnit, convertTorque, torqueUnitLabel } from "@/lib/torque";
import { type Lubrication, calibrationRefusal, parseAngleStages, todayIn } from "@/lib/torque-special";

// Issue 18 §3–4 on the record path: the wrench's serial, calibration date and maximum, and how the
// fastener is tightened (angle stages, loosen-and-retorque, lubrication, one-time), read from the
// form's text once the shop is known. Every refusal names its field; nothing is written then.

const say = (field: string, message: string) => new AppError("invalid", message, { [field]: [message] });

/** The extra fields as recordTorque takes them: all optional (records from code may leave them out). */
export type TorqueExtrasInput = Partial<
  Pick<TorqueRecordInput, "toolSerial" | "calibratedOn" | "wrenchMaxUnit" | "angleStages" | "angleDone" | "lubrication" | "lubricationOther" | "loosenRetorque" | "retorqueSequence" | "oneTime">
> & { wrenchMax?: NumberInput | null };

type Extras = Required<Pick<TorqueBody, "toolSerial" | "calibratedOn" | "wrenchMax" | "angleStages" | "angleDone" | "loosenRetorque" | "retorqueSequence" | "lubrication" | "lubricationOther" | "oneTime">>;

/**
 * A wrench over 5,000 N·m is no hand tool a small-engine shop holds (common trade practice, no
 * published source): a typing slip or the wrong unit.
 */
const MAX_WRENCH_NM = 5000;

export function readAngleStages(field: string, text: string | null | undefined, style: NumberStyle): number[] {
  const r = parseAngleStages(text, style);
  if (!r.ok) throw say(field, r.message);
  return r.stages;
}

export function readLubrication(l: Lubrication | null | undefined, other: string | null | undefined): { lubrication: Lubrication | null; lubricationOther: string | null } {
  if (l === "other" && !other) throw say("lubricationOther", "Say what was on the threads, e.g. “molybdenum paste”.");
  return { lubrication: l ?? null, lubricationOther: l === "other" ? (other ?? null) : null };
}

/** Typing the sequence says the fastener is loosened and retorqued, ticked or not; a tick needs the sequence. */
export function readRetorque(input: { loosenRetorque?: boolean | null; retorqueSequence?: string | null }): { loosenRetorque: boolean; retorqueSequence: string | null } {
  const loosenRetorque = input.loosenRetorque === true || !!input.retorqueSequence;
  if (loosenRetorque && !input.retorqueSequence) throw say("retorqueSequence", "Say how it is loosened and retorqued, e.g. “loosen 180°, retorque to 20 N·m, then + 90°”.");
  return { loosenRetorque, retorqueSequence: loosenRetorque ? (input.retorqueSequence ?? null) : null };
}

export function readTorqueExtras(input: TorqueExtrasInput, recordUnit: TorqueUnit, style: NumberStyle, timeZone: string, now = new Date()): Extras {
  const calibratedOn = input.calibratedOn ?? null;
  if (calibratedOn) {
    const refusal = calibrationRefusal(calibratedOn, todayIn(timeZone, now));
    if (refusal) throw say("calibratedOn", refusal);
  }
  let wrenchMax: Extras["wrenchMax"] = null;
  if (input.wrenchMax != null && input.wrenchMax !== "") {
    const unit = input.wrenchMaxUnit ?? recordUnit;
    const value = readNumberField("wrenchMax", input.wrenchMax, style, { what: "The wrench's maximum", min: 0.001, max: 1_000_000, maxDecimals: 3 });
    if (convertTorque(value, unit, "nm") > MAX_WRENCH_NM) {
      throw say("wrenchMax", `A wrench of ${value} ${torqueUnitLabel(unit)} is over ${MAX_WRENCH_NM} N·m, more than any hand torque wrench: check the number and the unit.`);
    }
    wrenchMax = { value, unit };
  }
  const angleStages = readAngleStages("angleStages", input.angleStages, style);
  const { loosenRetorque, retorqueSequence } = readRetorque(input);
  return {
    toolSerial: input.toolSerial ?? null,
    calibratedOn,
    wrenchMax,
    angleStages,
    angleDone: angleStages.length > 0 && input.angleDone === true,
    loosenRetorque,
    retorqueSequence,
    ...readLubrication(input.lubrication, input.lubricationOther),
    oneTime: input.oneTime === true,
  };
}

/** What a step's torque takes beyond its value (all optional: steps from code may leave them out). */
export type StepExtrasInput = {
  angleStages?: string | null;
  lubrication?: Lubrication | null;
  lubricationOther?: string | null;
  loosenRetorque?: boolean | null;
  retorqueSequence?: string | null;
  oneTime?: boolean;
};

/** A teardown step's torque with its angle stages, lubrication ("other" says what), loosen-and-retorque and one-time flag, read as a record's. */
export function readStepTorqueExtras(
  input: StepExtrasInput,
  style: NumberStyle,
): Pick<StepTorque, "angleStages" | "lubrication" | "lubricationOther" | "loosenRetorque" | "retorqueSequence" | "oneTime"> {
  return {
    angleStages: readAngleStages("angleStages", input.angleStages, style),
    ...readLubrication(input.lubrication, input.lubricationOther),
    ...readRetorque(input),
    oneTime: input.oneTime === true,
  };
}
