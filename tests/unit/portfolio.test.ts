import { describe, expect, it } from "vitest";
import { CONSENT_FROM, PUBLISHABLE_FROM, STORY_STATUSES, privateTextProblems, redactNote, redactText, slugify, storySlugSchema } from "@/lib/portfolio";

// Our own rules for what a public story may say; no published source except where noted.
const facts = { customerName: "Odile Varnakova", serial: "QX7-20-555123" };

describe("curated words for the public", () => {
  it("flag the owner's name, either part, as a whole word only", () => {
    expect(privateTextProblems("Odile's ATV, back on the trail", facts)).toEqual(["mentions the owner's name"]);
    expect(privateTextProblems("For the VARNAKOVA family", facts)).toEqual(["mentions the owner's name"]);
    expect(privateTextProblems("Odilesque handling after the rebuild", facts)).toEqual([]);
  });

  it("flag the serial however it is spaced, and anything shaped like a VIN", () => {
    expect(privateTextProblems("frame qx7 20 555123 checked", facts)).toEqual(["contains the machine's serial number"]);
    // from memory, unverified: 49 CFR Part 565 — a VIN has 17 characters and never uses I, O or Q.
    expect(privateTextProblems("VIN BNCH5TRL7K2004418 on the frame", facts)).toEqual(["contains what looks like a VIN"]);
    expect(privateTextProblems("Seventeen letters ABCDEFGHJKLMNPRST only", facts)).toEqual([]);
  });

  it("flag prices in any common form", () => {
    for (const text of ["Done for $240", "about 240 dollars", "parts 89.99 USD", "€ 60 labour"]) expect(privateTextProblems(text, facts), text).toEqual(["mentions a price"]);
    expect(privateTextProblems("Torqued to 70 lbf·ft in 3 passes", facts)).toEqual([]);
  });

  it("redact the name and serial from saved words, notes included", () => {
    expect(redactText("Odile Varnakova's quad, serial QX7-20-555123", facts)).toBe("[name removed] [name removed]'s quad, serial [serial removed]");
    const note = redactNote({ type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text: "Thanks, Odile!", marks: [{ type: "bold" }] }] }] }, facts);
    expect(note).toEqual({ type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text: "Thanks, [name removed]!", marks: [{ type: "bold" }] }] }] });
  });
});

describe("story addresses", () => {
  it("come from titles as plain ASCII words joined by hyphens", () => {
    expect(slugify("Ridgeline 570: fall service & brakes")).toBe("ridgeline-570-fall-service-brakes");
    expect(slugify("Ça roule — révision")).toBe("ca-roule-revision");
    expect(slugify("!!!")).toBe("story");
  });

  it("refuse the site's own paths and malformed ones", () => {
    expect(storySlugSchema.safeParse("opengraph-image").success).toBe(false);
    expect(storySlugSchema.safeParse("photos").success).toBe(false);
    expect(storySlugSchema.safeParse("opengraph-image-1wq4p7").success).toBe(false);
    expect(storySlugSchema.safeParse("photos-of-the-rebuild").success).toBe(true);
    expect(storySlugSchema.safeParse("two--hyphens").success).toBe(false);
    expect(storySlugSchema.safeParse("Axle-Job").data).toBe("axle-job");
  });
});

describe("consent and publishing", () => {
  it("publishing is possible only from states where the owner's yes stands", () => {
    expect(PUBLISHABLE_FROM.every((s) => CONSENT_FROM.withdrawn.includes(s))).toBe(true);
    for (const s of STORY_STATUSES) if (CONSENT_FROM.given.includes(s)) expect(PUBLISHABLE_FROM).not.toContain(s);
  });
});
