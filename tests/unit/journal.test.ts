import { describe, expect, it } from "vitest";
import { groupByDay } from "@/lib/journal";
import { entryChangeSchema, newEntrySchema, timelineQuerySchema } from "@/lib/schemas/journal";

describe("timeline input schemas", () => {
  it("new entries default to shop-only", () => {
    const parsed = newEntrySchema.parse({ kind: "photos", photoIds: ["a".repeat(22)] });
    expect(parsed.visibility).toBe("shop");
  });

  it("refuses an unknown kind, an empty or oversized photo set and a bad photo id", () => {
    expect(newEntrySchema.safeParse({ kind: "video", note: {} }).success).toBe(false);
    expect(newEntrySchema.safeParse({ kind: "photos", photoIds: [] }).success).toBe(false);
    expect(newEntrySchema.safeParse({ kind: "photos", photoIds: Array.from({ length: 21 }, () => "a".repeat(22)) }).success).toBe(false);
    expect(newEntrySchema.safeParse({ kind: "photos", photoIds: ["../../etc/passwd"] }).success).toBe(false);
    expect(newEntrySchema.safeParse({ kind: "photos", photoIds: ["a".repeat(22)], caption: "x".repeat(501) }).success).toBe(false);
  });

  it("a change must say what changes, with the version it was based on", () => {
    expect(entryChangeSchema.safeParse({ version: 1 }).success).toBe(false);
    expect(entryChangeSchema.safeParse({ visibility: "shared" }).success).toBe(false);
    expect(entryChangeSchema.parse({ version: 2, caption: "  " }).caption).toBeNull();
  });

  it("timeline paging is bounded", () => {
    expect(timelineQuerySchema.parse({})).toEqual({ order: "desc", limit: 50 });
    expect(timelineQuerySchema.safeParse({ limit: "1000" }).success).toBe(false);
    expect(timelineQuerySchema.safeParse({ after: "-3" }).success).toBe(false);
  });
});

describe("grouping entries by day", () => {
  // IANA time zone database: America/Denver is UTC−7 in January (MST). Calendar arithmetic, no
  // published source needed beyond the zone rules.
  it("uses the shop's calendar day, not UTC's", () => {
    const entries = [
      { createdAt: "2026-01-10T05:30:00Z" }, // 22:30 on the 9th in Denver
      { createdAt: "2026-01-10T06:30:00Z" }, // 23:30 on the 9th
      { createdAt: "2026-01-10T07:30:00Z" }, // 00:30 on the 10th
    ];
    const groups = groupByDay(entries, "America/Denver");
    expect(groups.map((g) => [g.day, g.entries.length])).toEqual([
      ["2026-01-09", 2],
      ["2026-01-10", 1],
    ]);
    expect(groups[0]!.label).toBe("Friday, January 9, 2026");
    expect(groupByDay(entries, "UTC").map((g) => g.day)).toEqual(["2026-01-10"]);
  });
});
