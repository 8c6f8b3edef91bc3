import { describe, expect, it } from "vitest";
import type { TorqueBody } from "@/lib/bench";
import { summarizeEntry } from "@/lib/server/emails/entry-summary";
import { toolLine, wrenchRangeFlags } from "@/lib/torque-special";

// Issue 18 §3 in the progress e-mail: a torque entry says the wrench facts the staff and owner
// views show (components/bench/torque-tool-facts.tsx), built by the same helpers.
const base: TorqueBody = {
  fastener: "Cylinder head bolts, 4 × M10 10.9",
  specValue: 20,
  unit: "nm",
  appliedValue: 20,
  tool: "3/8 click wrench",
  passPercents: [30, 60, 100],
  boltCount: null,
  pattern: null,
  note: null,
  displayUnit: "nm",
  passesDone: true,
};
const withWrench: TorqueBody = { ...base, toolSerial: "TW-0427", calibratedOn: "2025-10-01", wrenchMax: { value: 100, unit: "nm" } };
const mail = (body: TorqueBody, usedOn?: string) => summarizeEntry({ kind: "torque", body, caption: null, photoCount: 0, usedOn }).text!.split("\n");

describe("the progress e-mail's torque summary", () => {
  it("names the tool, its serial and calibration, and flags passes below 20 % of the wrench's maximum", () => {
    const lines = mail({ ...withWrench, calibratedOn: "2025-10-01" }, "2026-12-05");
    // 2025-10-01 + 1 year = 2026-10-01, before 2026-12-05: over a year (ISO 6789 default interval of 12 months, from memory, unverified).
    // Passes of 20 N·m at 30 / 60 / 100 % are 6, 12 and 20 N·m; 20 % of a 100 N·m wrench is 20 N·m
    // (ISO 6789-2 calibration points, REFERENCES.md §9, from memory): passes 1 and 2 are flagged.
    expect(lines).toEqual([
      "Cylinder head bolts, 4 × M10 10.9: Torqued to 20.0 N·m, within ±4 % of the 20.0 N·m spec",
      "Tool: 3/8 click wrench · serial TW-0427 · calibrated 2025-10-01 (calibration over a year old) · maximum 100.0 N·m",
      "Outside the wrench's range: Passes 1 (30 %, 6.0 N·m) and 2 (60 %, 12.0 N·m) are below 20 % of the wrench's 100.0 N·m maximum (20.0 N·m): ISO 6789-1/-2 calibrates at 20 %, 60 % and 100 % of the maximum; below 20 % the wrench is outside its calibrated range.",
    ]);
    // The same words as the views: the helpers, not a copy.
    expect(lines.slice(1)).toEqual([toolLine(withWrench, "2026-12-05"), ...wrenchRangeFlags(withWrench).map((f) => `Outside the wrench's range: ${f}.`)]);
  });

  it("says nothing about the calibration's age within a year, nor without the day the entry was made", () => {
    expect(mail(withWrench, "2026-09-30")[1]).toBe("Tool: 3/8 click wrench · serial TW-0427 · calibrated 2025-10-01 · maximum 100.0 N·m");
    expect(mail(withWrench)[1]).toBe("Tool: 3/8 click wrench · serial TW-0427 · calibrated 2025-10-01 · maximum 100.0 N·m");
  });

  it("a wrench whose range covers every pass raises no flag; a record before issue 18 §3 names only its tool", () => {
    // 30 % of 80 N·m is 24 N·m, at or above 20 % of a 100 N·m wrench (20 N·m).
    expect(mail({ ...withWrench, specValue: 80, appliedValue: 80 }, "2026-09-30")).toHaveLength(2);
    const { passesDone: _p, ...old } = base;
    expect(mail({ ...old, tool: "beam wrench" }, "2026-12-05").slice(1)).toEqual(["Tool: beam wrench"]);
    expect(mail({ ...old, tool: null }, "2026-12-05")).toHaveLength(1);
  });
});
