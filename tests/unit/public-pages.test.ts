// Which paths the proxy checks against the database before Next renders (and caches) a public page.
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { MISSING_PUBLIC_PAGE, possiblePublicPage, publicPageAddress } from "@/lib/public-pages";
import { isReservedSlug } from "@/lib/portfolio";

describe("public page addresses", () => {
  it("reads the shop's page and a story, with their social cards", () => {
    expect(publicPageAddress("/s/copper-gulch")).toEqual({ shop: "copper-gulch", story: null });
    expect(publicPageAddress("/s/copper-gulch/opengraph-image")).toEqual({ shop: "copper-gulch", story: null });
    expect(publicPageAddress("/s/copper-gulch/top-end-rebuild")).toEqual({ shop: "copper-gulch", story: "top-end-rebuild" });
    expect(publicPageAddress("/s/copper-gulch/top-end-rebuild/opengraph-image")).toEqual({ shop: "copper-gulch", story: "top-end-rebuild" });
    expect(publicPageAddress("/s/copper-gulch/top-end-rebuild/opengraph-image-1x2y3z")).toEqual({ shop: "copper-gulch", story: "top-end-rebuild" });
  });

  it("leaves every other path alone: the logo, a story's photos and clips, other areas, trailing slashes", () => {
    for (const p of [
      "/",
      "/s",
      "/s/",
      "/s/copper-gulch/",
      "/s/copper-gulch/logo",
      "/s/copper-gulch/top-end-rebuild/photos/abc/w640",
      "/s/copper-gulch/top-end-rebuild/clips/abc/video.mp4",
      "/shop/copper-gulch",
      "/my/jobs/x",
      "/api/public/shops/copper-gulch/booking-ticket",
      "/sx/copper-gulch",
    ]) {
      expect(publicPageAddress(p), p).toBeNull();
    }
  });

  it("treats a route beside [story] under /s/<shop> as no story, so a new one can't be sent to the 404", () => {
    const shopDir = path.join(process.cwd(), "app", "(public)", "s", "[shop]");
    const fixed = fs
      .readdirSync(shopDir, { withFileTypes: true })
      .filter((d) => d.isDirectory() && !d.name.startsWith("[") && !d.name.startsWith("_") && !d.name.startsWith("("))
      .map((d) => d.name);
    expect(fixed.length).toBeGreaterThan(0);
    for (const name of fixed) {
      expect(isReservedSlug(name), `app/(public)/s/[shop]/${name} must be in RESERVED_STORY_SLUGS`).toBe(true);
      expect(publicPageAddress(`/s/copper-gulch/${name}`)).toBeNull();
    }
  });

  it("knows an address that can't name a page without asking, the 404 address among them", () => {
    expect(possiblePublicPage({ shop: "copper-gulch", story: null })).toBe(true);
    expect(possiblePublicPage({ shop: "copper-gulch", story: "top-end-rebuild" })).toBe(true);
    expect(possiblePublicPage({ shop: "Copper-Gulch", story: null })).toBe(false);
    expect(possiblePublicPage({ shop: "copper-gulch", story: "top%20end" })).toBe(false);
    expect(possiblePublicPage({ shop: "copper-gulch", story: "a".repeat(81) })).toBe(false);
    expect(possiblePublicPage(publicPageAddress(MISSING_PUBLIC_PAGE)!)).toBe(false);
  });
});
