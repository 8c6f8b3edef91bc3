import { describe, expect, it } from "vitest";
import { lastDailyCutoff } from "@/lib/following";

describe("the daily digest moment on the shop's clock", () => {
  it("is today at the hour once the hour has passed, in daylight saving time", () => {
    // US daylight saving starts the second Sunday of March (15 U.S.C. §260a): 8 March 2026, so
    // Denver is on MDT, UTC−6 (IANA tz database, America/Denver). 02:30Z on the 10th = 20:30 on the 9th.
    expect(lastDailyCutoff(new Date("2026-03-10T02:30:00Z"), "America/Denver", 18).toISOString()).toBe("2026-03-10T00:00:00.000Z");
  });

  it("is yesterday at the hour before the hour comes, in standard time", () => {
    // January: MST, UTC−7 (IANA tz database, America/Denver). 20:00Z = 13:00 local, before 18:00.
    expect(lastDailyCutoff(new Date("2026-01-15T20:00:00Z"), "America/Denver", 18).toISOString()).toBe("2026-01-15T01:00:00.000Z");
  });

  it("is the moment itself at the hour exactly, and works east of Greenwich", () => {
    expect(lastDailyCutoff(new Date("2026-06-01T18:00:00Z"), "UTC", 18).toISOString()).toBe("2026-06-01T18:00:00.000Z");
    // Japan keeps UTC+9 all year, no daylight saving (IANA tz database, Asia/Tokyo). 10:00Z = 19:00 local.
    expect(lastDailyCutoff(new Date("2026-06-01T10:00:00Z"), "Asia/Tokyo", 18).toISOString()).toBe("2026-06-01T09:00:00.000Z");
  });
});
