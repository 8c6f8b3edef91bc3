import { TriangleExclamationPoint } from "lucide-react";
import type { TorqueBody } from "@/lib/bench";
import { toolLine, wrenchRangeFlags } from "@/lib/torque-special";

// The wrench behind a torque record (issue 18 §3): tool, serial, calibration date (said when over
// a year old on the day it was used) and maximum, then any pass outside the wrench's calibrated
// range. Staff and owner views alike; no hooks. Records before issue 18 show their tool as before.

type Record = Pick<TorqueBody, "tool" | "toolSerial" | "calibratedOn" | "wrenchMax" | "specValue" | "unit" | "passPercents">;

export function TorqueToolFacts({ record, at }: { record: Record; /** When the record was made (ISO); its day is the day the wrench was used. */ at: string }) {
  const line = toolLine(record, at.slice(0, 10));
  const flags = wrenchRangeFlags({ specValue: record.specValue, unit: record.unit, passPercents: record.passPercents, wrenchMax: record.wrenchMax });
  if (!line && !flags.length) return null;
  return (
    <>
      {line ? <p className="text-sm text-ink-muted">{line}</p> : null}
      {flags.map((f) => (
        <p key={f} className="flex gap-2 text-sm">
          <TriangleExclamationPoint aria-hidden className="mt-0.5 size-4 shrink-0" />
          <span>
            <strong>Outside the wrench&apos;s range:</strong> {f}.
          </span>
        </p>
      ))}
    </>
  );
}
