import { describe, expect, it } from "vitest";
import { groupTrends, sparkline } from "@/lib/measurement-trends";
import { type MeasurementSetBody, findingFromSet, itemLimitText, judgeItem, suggestShim, targetClearance, typedText } from "@/lib/measurements";

// Structured measurement sets (issue 18 §5). The shim rule and the "aim for the middle of the
// range" target are common trade practice with no published source; the verdicts follow the
// reading rule of lib/readings.ts (limits inclusive).
const t = (value: number, decimals: number) => ({ value, decimals });

describe("shim arithmetic: new shim = old shim + measured − specified clearance", () => {
  it("a tight valve gets a thinner shim: 2.50 + 0.08 − 0.15 = 2.43 mm", () => {
    // common trade practice, no published source (worked example, invented numbers)
    const s = suggestShim(t(2.5, 2), t(0.08, 2), t(0.15, 2));
    expect(s.newShim).toEqual({ value: 2.43, decimals: 2 });
    expect(s.arithmetic).toBe("2.50 + 0.08 − 0.15 = 2.43 mm");
    expect(s.problem).toBeNull();
  });

  it("a loose valve gets a thicker shim: 2.50 + 0.34 − 0.25 = 2.59 mm", () => {
    // common trade practice, no published source
    const s = suggestShim(t(2.5, 2), t(0.34, 2), t(0.25, 2));
    expect(typedText(s.newShim)).toBe("2.59");
  });

  it("keeps the finest resolution typed and has no float noise: 2.475 + 0.10 − 0.15 = 2.425 mm", () => {
    // common trade practice, no published source; 2.475 − 0.05 in binary floats is 2.4250000000000003
    const s = suggestShim(t(2.475, 3), t(0.1, 2), t(0.15, 2));
    expect(s.arithmetic).toBe("2.475 + 0.100 − 0.150 = 2.425 mm");
  });

  it("the specified clearance is the middle of the maker's range, with the decimals it needs", () => {
    // common trade practice, no published source: aim for the middle of the range
    expect(targetClearance(t(0.1, 2), t(0.2, 2))).toEqual({ value: 0.15, decimals: 2 });
    expect(targetClearance(t(0.1, 2), t(0.15, 2))).toEqual({ value: 0.125, decimals: 3 });
  });

  it("says so when no shim could be thin enough", () => {
    // common trade practice, no published source: a valve that has sunk into its seat eats the clearance
    const s = suggestShim(t(0.05, 2), t(0.0, 2), t(0.15, 2));
    expect(s.newShim.value).toBeLessThanOrEqual(0);
    expect(s.problem).toMatch(/No shim is that thin/);
  });
});

describe("verdict per item (the reading rule: limits inclusive)", () => {
  const exhaust = { min: t(0.2, 2), max: t(0.3, 2) };

  it("an exhaust valve under its range is out of limit, with a suggested shim from its old one", () => {
    const item = judgeItem({ label: "", value: t(0.12, 2), limit: exhaust, unit: "mm", valve: { cylinder: 1, side: "exhaust", position: "left", oldShim: t(2.5, 2) } });
    expect(item.verdict).toBe("below");
    expect(item.label).toBe("Exhaust, cyl 1, left");
    expect(item.key).toBe("exhaust:1:left");
    expect(item.marginText).toBe("0.08 mm under the minimum");
    // common trade practice, no published source: 2.50 + 0.12 − 0.25 (middle of 0.20–0.30) = 2.37
    expect(item.shim?.arithmetic).toBe("2.50 + 0.12 − 0.25 = 2.37 mm");
  });

  it("a valve within its range gets no shim, and a valve with no old shim typed gets none either", () => {
    expect(judgeItem({ label: "", value: t(0.25, 2), limit: exhaust, unit: "mm", valve: { cylinder: 2, side: "exhaust", position: null, oldShim: t(2.5, 2) } })).toMatchObject({ verdict: "within", shim: null });
    expect(judgeItem({ label: "", value: t(0.35, 2), limit: exhaust, unit: "mm", valve: { cylinder: 2, side: "exhaust", position: null, oldShim: null } })).toMatchObject({ verdict: "above", shim: null });
  });

  it("a reading exactly at the limit is within it, and keeps its typed resolution (0.20 stays 0.20)", () => {
    const item = judgeItem({ label: "", value: t(0.2, 2), limit: exhaust, unit: "mm", valve: { cylinder: 1, side: "exhaust", position: null, oldShim: null } });
    expect(item.verdict).toBe("within");
    expect(typedText(item.value)).toBe("0.20");
    expect(item.marginText).toBe("at the minimum");
  });

  it("other kinds: a disc under its minimum thickness, a leak-down over its maximum", () => {
    expect(judgeItem({ label: "Front disc", value: t(4.4, 2), limit: { min: t(4.5, 1), max: null }, unit: "mm", valve: null })).toMatchObject({ verdict: "below", marginText: "0.10 mm under the minimum" });
    expect(judgeItem({ label: "Cylinder 1", value: t(12, 0), limit: { min: null, max: t(10, 0) }, unit: "%", valve: null })).toMatchObject({ verdict: "above", key: "cylinder 1" });
    expect(itemLimitText({ min: t(4.5, 1), max: null }, "mm")).toBe("at least 4.5 mm");
    expect(itemLimitText({ min: t(0.1, 2), max: t(0.2, 2) }, "mm")).toBe("0.10–0.20 mm");
  });
});

describe("the finding drafted from a set", () => {
  it("carries each item with its value, verdict, limit and source, and the shim arithmetic marked as trade practice", () => {
    const limit = { min: t(0.2, 2), max: t(0.3, 2) };
    const body: MeasurementSetBody = {
      measurementSet: { kind: "valve_clearance", title: "Valve clearance", unit: "mm", source: "maker's manual p. 3-14", note: null },
      items: [
        judgeItem({ label: "", value: t(0.12, 2), limit, unit: "mm", valve: { cylinder: 1, side: "exhaust", position: "left", oldShim: t(2.5, 2) } }),
        judgeItem({ label: "", value: t(0.25, 2), limit, unit: "mm", valve: { cylinder: 1, side: "exhaust", position: "right", oldShim: null } }),
      ],
    };
    const f = findingFromSet(body);
    expect(f.title).toBe("Valve clearance: 1 of 2 out of limit");
    expect(f.found).toContain("- Exhaust, cyl 1, left: 0.12 mm — OUT OF LIMIT (under); limit 0.20–0.30 mm (maker's manual p. 3-14); 0.08 mm under the minimum; suggested shim 2.37 mm");
    expect(f.found).toContain("common trade practice, no published source");
    expect(f.found).toContain("- Exhaust, cyl 1, right: 0.25 mm — within limit; limit 0.20–0.30 mm (maker's manual p. 3-14).");
    expect(f.found.indexOf("Out of limit:")).toBeLessThan(f.found.indexOf("Also measured:"));
    expect(f.safety).toBe("none");
  });

  it("sixteen valves out of limit with a long source still fit the finding, every valve named with its limit", () => {
    const limit = { min: t(0.1, 3), max: t(0.2, 3) };
    const source = `maker's manual ${"x".repeat(180)}`;
    const items = Array.from({ length: 16 }, (_, n) =>
      judgeItem({ label: "", value: t(0.305, 3), limit, unit: "mm", valve: { cylinder: (n % 4) + 1, side: n < 8 ? "intake" : "exhaust", position: `position ${n} ${"y".repeat(40)}`, oldShim: t(2.525, 3) } }),
    );
    const f = findingFromSet({ measurementSet: { kind: "valve_clearance", title: "Valve clearance", unit: "mm", source, note: null }, items });
    expect(f.found.length).toBeLessThanOrEqual(4000); // lib/schemas/approvals.ts: "found" up to 4000 characters
    for (const item of items) expect(f.found).toContain(`${item.label}: 0.305 mm — OUT OF LIMIT (over); limit 0.100–0.200 mm`);
    // The source is named once in the heading when it no longer fits on every line.
    expect(f.found.split(source).length - 1).toBe(1);
    // common trade practice, no published source: 2.525 + 0.305 − 0.150 = 2.680
    expect(f.found).toContain("suggested shim 2.680 mm (2.525 + 0.305 − 0.150 = 2.680 mm)");
  });

  it("a brake disc set is drafted as a brakes finding (its caution goes to the owner)", () => {
    const body: MeasurementSetBody = {
      measurementSet: { kind: "disc_thickness", title: "Brake disc thickness", unit: "mm", source: "stamped on the disc", note: null },
      items: [judgeItem({ label: "Front disc", value: t(4.3, 1), limit: { min: t(4.5, 1), max: null }, unit: "mm", valve: null })],
    };
    expect(findingFromSet(body).safety).toBe("brakes");
  });
});

describe("trends across jobs", () => {
  const point = (jobNumber: number, at: string, value: number, key = "exhaust:1:left") => ({
    kind: "valve_clearance" as const,
    key,
    label: "Exhaust, cyl 1, left",
    unit: "mm",
    jobNumber,
    at,
    value: t(value, 2),
    verdict: "within" as const,
    limit: { min: t(0.2, 2), max: t(0.3, 2) },
  });

  it("groups one item across jobs, oldest first; an item seen on one job only draws no line", () => {
    const trends = groupTrends([point(12, "2026-11-02T10:00:00Z", 0.22), point(7, "2026-03-01T10:00:00Z", 0.27), point(12, "2026-11-02T10:00:00Z", 0.25, "intake:1:left")]);
    expect(trends).toHaveLength(1);
    expect(trends[0]!.label).toBe("Valve clearance: Exhaust, cyl 1, left");
    expect(trends[0]!.points.map((p) => [p.jobNumber, typedText(p.value)])).toEqual([
      [7, "0.27"],
      [12, "0.22"],
    ]);
  });

  it("sparkline: values spread across the width, the highest at the top", () => {
    const { points, y } = sparkline([1, 2, 3], [], 100, 20, 0);
    expect(points).toBe("0,20 50,10 100,0");
    expect(y(3)).toBe(0);
    // A limit outside the values widens the range so its line can be drawn.
    expect(sparkline([1, 2], [4], 100, 30, 0).y(4)).toBe(0);
  });
});
