import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { BenchEntryBody } from "@/components/journal/bench-entry-body";
import type { ReadingBody } from "@/lib/bench";
import type { TimelineEntry } from "@/lib/journal";
import { readingLimitText, readingLine, readingMarginText, readingValueText } from "@/lib/reading-text";
import { summarizeEntry } from "@/lib/server/emails/entry-summary";

// The limits below are what a shop types from the maker's manual: invented for the test, not
// published values. The arithmetic is the reading rule (lib/readings.ts): the margin is the
// distance past the broken limit. Trailing zeros carry the instrument's resolution (0.20 read
// off a 0.01 mm gauge is not 0.2 read off a 0.1 mm one) — common trade practice, no published source.

const valve: ReadingBody = {
  label: "Intake valve clearance, left",
  value: 0.06,
  unit: "mm",
  min: 0.1,
  max: 0.2,
  source: "maker's manual",
  verdict: "below",
  marginText: "0.04 mm under the minimum",
  chain: null,
  decimals: { value: 2, min: 2, max: 2 },
};

describe("a reading's one line: value, limit, source, verdict", () => {
  it("the owner's line for an out-of-limit valve clearance", () => {
    // 0.10 − 0.06 = 0.04 mm under the minimum
    expect(readingLine(valve)).toBe("Intake valve clearance, left: 0.06 mm — limit 0.10–0.20 mm (maker's manual) — OUT OF LIMIT: 0.04 mm under the minimum");
  });

  it("keeps trailing zeros: 0.20 stays 0.20, in the value and the limits", () => {
    const at = { ...valve, value: 0.2, verdict: "within" as const, marginText: undefined };
    expect(readingValueText(at)).toBe("0.20 mm");
    expect(readingLimitText(at)).toBe("0.10–0.20 mm");
    // 0.20 is the maximum itself: inclusive limits (lib/readings.ts)
    expect(readingLine(at)).toBe("Intake valve clearance, left: 0.20 mm — limit 0.10–0.20 mm (maker's manual) — within the limit: at the maximum");
  });

  it("the margin is never coarser than the reading's resolution", () => {
    // 1.50 − 1.20 = 0.30: a 0.01 mm instrument's margin keeps two decimals
    const r = { label: "Pad thickness", value: 1.5, unit: "mm", min: 1.2, max: null, source: null, verdict: "within" as const, decimals: { value: 2, min: 1, max: null } };
    expect(readingMarginText(r)).toBe("0.30 mm over the minimum");
    expect(readingLine(r)).toBe("Pad thickness: 1.50 mm — limit at least 1.2 mm — within the limit: 0.30 mm over the minimum");
  });

  it("older bodies without decimals read as before (no trailing zeros)", () => {
    const { decimals: _dropped, ...old } = valve;
    expect(readingValueText(old)).toBe("0.06 mm");
    expect(readingLimitText(old)).toBe("0.1–0.2 mm");
  });

  it("no limit: says so", () => {
    const r = { label: "Idle speed", value: 1500, unit: "rpm", min: null, max: null, source: null, verdict: "no_limit" as const, marginText: null };
    expect(readingLine(r)).toBe("Idle speed: 1500 rpm — no limit given");
  });

  it("a chain reading computed from a stored row names the 200/N limit and why", () => {
    // REFERENCES §4: 200/N with N = 80 → 2.5 %; 2.6 % is 0.10 % past it
    const row = {
      label: "Drive chain wear",
      value: 2.6,
      unit: "%",
      min: null,
      max: 2.5,
      source: null,
      verdict: "above" as const,
      chain: { pitchMm: 15.875, pitches: 20, measuredMm: 325.755, limitPct: 2.5, sprocketTeeth: 80, shopLimitPct: 3 },
      decimals: { value: 2, min: null, max: null },
    };
    expect(readingLine(row)).toBe(
      "Drive chain wear: 2.60 % — limit at most 2.5 % (200/N for a large sprocket of 80 teeth, tighter than the shop's 3 %) — OUT OF LIMIT: at or past the replace-at limit by 0.10 %",
    );
  });
});

describe("where the owner reads it", () => {
  it("e-mails and digests: the whole line, not the number alone", () => {
    expect(summarizeEntry({ kind: "reading", body: valve, caption: null, photoCount: 0 }).text).toBe(
      "Intake valve clearance, left: 0.06 mm — limit 0.10–0.20 mm (maker's manual) — OUT OF LIMIT: 0.04 mm under the minimum",
    );
  });

  it("the timeline (staff and owner): value at its resolution, verdict, margin, limit and source", () => {
    const entry = { id: 1, kind: "reading", body: valve } as unknown as TimelineEntry;
    const html = renderToStaticMarkup(createElement(BenchEntryBody, { entry }));
    expect(html).toContain("Intake valve clearance, left: 0.06 mm");
    expect(html).toContain("Out of limit: under");
    expect(html).toContain("0.04 mm under the minimum.");
    expect(html).toContain("Limit 0.10–0.20 mm (maker&#x27;s manual)");
  });
});
