import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { MeasurementSetEntry } from "@/components/bench/measurement-set";
import { MeasurementTrends } from "@/app/(staff)/shop/[shop]/machines/[machine]/_components/measurement-trends";
import { groupTrends } from "@/lib/measurement-trends";
import { judgeItem } from "@/lib/measurements";

// The set as staff read it (timeline and bench page) and the trend on the machine's page: every
// value with its resolution, limit, source and verdict as words; the chart is decorative, the table carries the values.
const t = (value: number, decimals: number) => ({ value, decimals });
const limit = { min: t(0.2, 2), max: t(0.3, 2) };

describe("measurement views", () => {
  it("a set's entry shows each valve with its limit and source, and the shim arithmetic marked as trade practice", () => {
    const html = renderToStaticMarkup(
      createElement(MeasurementSetEntry, {
        body: {
          measurementSet: { kind: "valve_clearance", title: "Valve clearance", unit: "mm", source: "maker's manual p. 3-14", note: null },
          items: [
            judgeItem({ label: "", value: t(0.12, 2), limit, unit: "mm", valve: { cylinder: 1, side: "exhaust", position: "left", oldShim: t(2.5, 2) } }),
            judgeItem({ label: "", value: t(0.2, 2), limit, unit: "mm", valve: { cylinder: 1, side: "exhaust", position: "right", oldShim: null } }),
            judgeItem({ label: "", value: t(0.35, 2), limit, unit: "mm", valve: { cylinder: 2, side: "exhaust", position: null, oldShim: null } }),
          ],
        },
      }),
    );
    expect(html).toContain("Valve clearance: 2 of 3 out of limit");
    expect(html).toContain("Exhaust, cyl 1, right: 0.20 mm");
    expect(html).toContain("Limit 0.20–0.30 mm (maker&#x27;s manual p. 3-14)");
    expect(html).toContain("Out of limit: under");
    // common trade practice, no published source: 2.50 + 0.12 − 0.25 = 2.37
    expect(html).toContain("2.50 + 0.12 − 0.25 = 2.37 mm");
    expect(html).toContain("common trade practice, no published source");
    expect(html).toContain("No old shim was typed");
  });

  it("a trend draws a hidden line and lists every value, oldest first", () => {
    const row = (jobNumber: number, at: string, value: number) => ({ kind: "valve_clearance" as const, key: "exhaust:1:left", label: "Exhaust, cyl 1, left", unit: "mm", jobNumber, at, value: t(value, 2), verdict: value < 0.2 ? ("below" as const) : ("within" as const), limit });
    const trends = groupTrends([row(9, "2026-10-01T10:00:00Z", 0.18), row(4, "2026-02-01T10:00:00Z", 0.24)]);
    const html = renderToStaticMarkup(createElement(MeasurementTrends, { trends, shopSlug: "cedar-flats", timeZone: "UTC" }));
    expect(html).toMatch(/<svg aria-hidden="true"/);
    expect(html.indexOf("0.24 mm")).toBeLessThan(html.indexOf("0.18 mm"));
    expect(html).toContain("Valve clearance: Exhaust, cyl 1, left (mm) across jobs, oldest first");
    expect(html).toContain("Out of limit: under");
  });
});
