import { describe, expect, it } from "vitest";
import { PHOTO_ROUTE_SIZES, PHOTO_WIDTHS, photoSrcSet, photoWidthOf } from "@/lib/journal";

// A `w` descriptor is the image's real width in pixels (HTML Living Standard, "srcset"
// attribute, width descriptors), so each candidate names the width the route answers with.

const photo = (width: number, height: number, base = "/api/photos/AAAAAAAAAAAAAAAAAAAAAA") => ({ width, height, thumbUrl: `${base}/thumb`, displayUrl: `${base}/display` });

describe("photoSrcSet", () => {
  it("lists the thumbnail, the copies narrower than the photo, and the display rendition", () => {
    // A 1600 × 1200 display rendition: thumbnail 400 wide (long edge 400).
    expect(photoSrcSet(photo(1600, 1200))).toBe(
      "/api/photos/AAAAAAAAAAAAAAAAAAAAAA/thumb 400w, /api/photos/AAAAAAAAAAAAAAAAAAAAAA/w640 640w, /api/photos/AAAAAAAAAAAAAAAAAAAAAA/w960 960w, /api/photos/AAAAAAAAAAAAAAAAAAAAAA/w1280 1280w, /api/photos/AAAAAAAAAAAAAAAAAAAAAA/display 1600w",
    );
  });

  it("gives a portrait photo's thumbnail its real width, and no copy as wide as the photo", () => {
    // 900 × 1200: the thumbnail's long edge is its height, 400, so it is 300 wide; 960 and 1280 would be enlargements.
    expect(photoSrcSet(photo(900, 1200)).split(", ").map((c) => c.split(" ")[1])).toEqual(["300w", "640w", "900w"]);
  });

  it("has only the thumbnail for a photo no wider than it", () => {
    expect(photoSrcSet(photo(320, 240))).toBe("/api/photos/AAAAAAAAAAAAAAAAAAAAAA/thumb 320w");
  });

  it("keeps a query (an e-mail token) on every address and changes only the size segment", () => {
    const withToken = { width: 1000, height: 750, thumbUrl: "/api/approvals/R/evidence/P/thumb?t=abc", displayUrl: "/api/approvals/R/evidence/P/display?t=abc" };
    expect(photoSrcSet(withToken)).toBe("/api/approvals/R/evidence/P/thumb?t=abc 400w, /api/approvals/R/evidence/P/w640?t=abc 640w, /api/approvals/R/evidence/P/w960?t=abc 960w, /api/approvals/R/evidence/P/display?t=abc 1000w");
  });
});

describe("photo route sizes", () => {
  it("are the two renditions and one copy size per width", () => {
    expect(PHOTO_ROUTE_SIZES.filter((s) => photoWidthOf(s) !== undefined).map(photoWidthOf)).toEqual([...PHOTO_WIDTHS]);
    expect(photoWidthOf("thumb")).toBeUndefined();
    expect(photoWidthOf("display")).toBeUndefined();
    expect(photoWidthOf("w960")).toBe(960);
  });
});
