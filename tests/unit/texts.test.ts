import { describe, expect, it } from "vitest";
import { channelsFor, inQuietWindow, keywordOf, noticeBody, parseClock, quietUntil, toE164 } from "@/lib/texts";

describe("phone numbers to E.164", () => {
  it("keeps international numbers and reads national ones only in NANP shops", () => {
    // ITU-T E.164: "+", country code, at most 15 digits. 7700 900123 is an Ofcom drama number (UK).
    expect(toE164("+44 7700 900123", "GBP")).toBe("+447700900123");
    expect(toE164("0044 7700 900123", "EUR")).toBe("+447700900123");
    // North American Numbering Plan: NXX-NXX-XXXX with N = 2–9; 555-01xx is reserved for fiction.
    expect(toE164("(303) 555-0142", "USD")).toBe("+13035550142");
    expect(toE164("1 303 555 0142", "CAD")).toBe("+13035550142");
    expect(toE164("303 555 0142", "GBP")).toBeNull();
    expect(toE164("(103) 555-0142", "USD")).toBeNull();
    expect(toE164("+1234", "USD")).toBeNull();
    expect(toE164("call me", "USD")).toBeNull();
  });
});

describe("keywords (CTIA Messaging Principles and Best Practices, opt-out and HELP)", () => {
  it("reads the standard words whatever the case, spaces or closing punctuation", () => {
    for (const word of ["STOP", "stop", " Stop! ", "Unsubscribe.", "end", "cancel", "quit", "stopall", "opt out", "revoke"]) expect(keywordOf(word, ["en"], false)?.keyword, word).toBe("stop");
    for (const word of ["START", "unstop"]) expect(keywordOf(word, ["en"], true)?.keyword, word).toBe("start");
    for (const word of ["help", "INFO?"]) expect(keywordOf(word, ["en"], false)?.keyword, word).toBe("help");
  });

  it("leaves sentences alone, and YES opts back in only a number that opted out", () => {
    expect(keywordOf("Please stop the work on the clutch", ["en"], false)).toBeNull();
    expect(keywordOf("yes", ["en"], false)).toBeNull();
    expect(keywordOf("yes", ["en"], true)?.keyword).toBe("start");
  });
});

describe("quiet hours on the shop's clock", () => {
  // Default 21:00–08:00 (47 CFR § 64.1200(c)(1) hours, kept for service texts: common carrier practice).
  const quiet = { start: 21 * 60, end: 8 * 60 };

  it("wraps midnight", () => {
    expect(inQuietWindow(20 * 60 + 59, quiet.start, quiet.end)).toBe(false);
    expect(inQuietWindow(21 * 60, quiet.start, quiet.end)).toBe(true);
    expect(inQuietWindow(3 * 60, quiet.start, quiet.end)).toBe(true);
    expect(inQuietWindow(8 * 60, quiet.start, quiet.end)).toBe(false);
    expect(inQuietWindow(600, 600, 600)).toBe(false);
  });

  it("holds until the morning in the shop's time zone", () => {
    // IANA tz database: America/Denver is UTC−7 in January, Europe/London UTC+1 in July (BST).
    expect(quietUntil(new Date("2030-01-10T05:30:42Z"), "America/Denver", quiet)?.toISOString()).toBe("2030-01-10T15:00:00.000Z");
    expect(quietUntil(new Date("2030-01-10T18:00:00Z"), "America/Denver", quiet)).toBeNull();
    expect(quietUntil(new Date("2030-07-01T21:15:00Z"), "Europe/London", quiet)?.toISOString()).toBe("2030-07-02T07:00:00.000Z");
  });

  it("reads the settings' clock times", () => {
    expect(parseClock("21:00")).toBe(1260);
    expect(parseClock("7:30")).toBe(450);
    expect(parseClock("24:00")).toBeNull();
  });
});

describe("wording and channels", () => {
  it("every text carries the shop's name and how to stop", () => {
    expect(noticeBody("  Saltmarsh\nSmall Engines ", "Your mower is ready.")).toBe("Saltmarsh Small Engines: Your mower is ready. Reply STOP to stop.");
  });

  it("honours the owner's choice, falling back to e-mail when a text can't go", () => {
    expect(channelsFor("email", true)).toEqual({ email: true, text: false });
    expect(channelsFor("text", true)).toEqual({ email: false, text: true });
    expect(channelsFor("text", false)).toEqual({ email: true, text: false });
    expect(channelsFor("both", true)).toEqual({ email: true, text: true });
  });
});
