// Issue 20 §3: a wrong kind of file is named, with what it seems to be and what is accepted.
import { describe, expect, it } from "vitest";
import { clipFileProblem, photoFileProblem, seemsToBe, shownName } from "@/lib/file-kinds";
import { newClipSchema } from "@/lib/schemas/clips";

describe("picked files", () => {
  it("takes the photo types the server takes, by type or, without one, by ending", () => {
    for (const f of [{ name: "a.jpg", type: "image/jpeg" }, { name: "b.png", type: "image/png" }, { name: "c.webp", type: "image/webp" }, { name: "d.JPEG", type: "" }]) {
      expect(photoFileProblem(f), f.name).toBeNull();
    }
  });

  it("names a wrong file for a photo set and says what is accepted", () => {
    expect(photoFileProblem({ name: "invoice.pdf", type: "application/pdf" })).toBe('"invoice.pdf" is a PDF document, not a photo we can take. A photo set takes JPEG, PNG or WebP photos.');
    expect(photoFileProblem({ name: "idle.mp4", type: "video/mp4" })).toMatch(/^"idle\.mp4" is a video, not a photo/);
    expect(photoFileProblem({ name: "IMG_0042.HEIC", type: "image/heic" })).toMatch(/is a HEIC photo.*convert HEIC to JPEG/);
    expect(photoFileProblem({ name: "scan.tiff", type: "image/tiff" })).toMatch(/is a TIFF image/);
  });

  it("takes any video for a clip, and names anything else with what clips take", () => {
    expect(clipFileProblem({ name: "idle.mov", type: "video/quicktime" })).toBeNull();
    expect(clipFileProblem({ name: "rattle.mp4", type: "" })).toBeNull();
    expect(clipFileProblem({ name: "notes.txt", type: "text/plain" })).toBe('"notes.txt" is a text file, not a video. Clips take video files (MP4, MOV, WebM, 3GP…) from the camera or the gallery.');
    expect(clipFileProblem({ name: "carb.jpg", type: "image/jpeg" })).toMatch(/^"carb\.jpg" is a JPEG image, not a video\./);
    expect(clipFileProblem({ name: "blob", type: "" })).toMatch(/a file of a kind we can't tell/);
  });

  it("the clip route says the same beside the file's type (not only \"some fields need attention\")", () => {
    const parsed = newClipSchema.safeParse({ name: "brake-quote.pdf", size: 1000, type: "application/pdf" });
    expect(parsed.success).toBe(false);
    expect(parsed.error?.issues).toEqual([expect.objectContaining({ path: ["type"], message: '"brake-quote.pdf" is a PDF document, not a video. Clips take video files (MP4, MOV, WebM, 3GP…) from the camera or the gallery.' })]);
    expect(newClipSchema.safeParse({ name: "idle.mp4", size: 1000, type: "video/mp4" }).success).toBe(true);
  });

  it("shows names printable and short", () => {
    expect(shownName("a\u0007b.mov")).toBe('"ab.mov"');
    expect(shownName(`${"x".repeat(100)}.mp4`)).toHaveLength(80);
    expect(seemsToBe({ name: "engine.bin", type: "application/octet-stream" })).toBe("a .bin file");
  });
});
