import "server-only";
import type { TorqueBody } from "@/lib/bench";
import type { TorqueRecordsTable } from "@/db/tables";
import { isLubrication } from "@/lib/torque-special";

// Migration 27's columns of torque_records (issue 18 §3–4: the wrench, torque-angle, special
// fasteners), written and read for db/queries/bench.ts.

const str = (v: unknown) => (v == null ? null : String(v));
const flag = (v: unknown) => (v == null ? null : Boolean(v));

export function torqueExtraColumns(b: TorqueBody) {
  return {
    tool_serial: b.toolSerial ?? null,
    calibrated_on: b.calibratedOn ?? null,
    wrench_max_value: b.wrenchMax?.value ?? null,
    wrench_max_unit: b.wrenchMax?.unit ?? null,
    angle_stages: b.angleStages?.length ? JSON.stringify(b.angleStages) : null,
    angle_done: b.angleStages?.length ? (b.angleDone ?? false) : null,
    loosen_retorque: b.loosenRetorque ?? null,
    retorque_sequence: b.retorqueSequence ?? null,
    lubrication: b.lubrication ?? null,
    lubrication_other: b.lubricationOther ?? null,
    one_time: b.oneTime ?? null,
  };
}

/** The record's fields from those columns; null on rows written before migration 27. */
export function torqueExtrasOf(r: TorqueRecordsTable) {
  return {
    toolSerial: str(r.tool_serial),
    calibratedOn: str(r.calibrated_on),
    wrenchMax: r.wrench_max_value == null || r.wrench_max_unit == null ? null : { value: Number(r.wrench_max_value), unit: r.wrench_max_unit },
    angleStages: r.angle_stages == null ? null : (JSON.parse(r.angle_stages) as number[]),
    angleDone: flag(r.angle_done),
    loosenRetorque: flag(r.loosen_retorque),
    retorqueSequence: str(r.retorque_sequence),
    lubrication: isLubrication(r.lubrication) ? r.lubrication : null,
    lubricationOther: str(r.lubrication_other),
    oneTime: flag(r.one_time),
  };
}
