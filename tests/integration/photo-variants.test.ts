// Narrower copies of a photo's display rendition (lib/server/photos.ts, photoRendition): made by
// sharp on first request, kept beside the renditions, removed with them. The routes that call it
// check who is asking first (tests/e2e/access-generated.spec.ts calls them as every visitor).
import { mkdtemp, readFile, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import exifr from "exifr";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { INLINE_COPY_MAX_BYTES, INLINE_COPY_WIDTH, deletePhotoRenditions, photoInlineCopy, photoRendition, processPhoto, storePhotoRenditions, variantKey, type StoredPhoto } from "@/lib/server/photos";
import { LocalDiskStorage } from "@/lib/server/storage";

const FIXTURES = path.resolve(__dirname, "../fixtures/photos");

/** A 2000 × 1500 photo-like JPEG (a gradient with noise, so it doesn't compress to nothing). */
async function largePhoto(): Promise<Buffer> {
  const width = 2000;
  const height = 1500;
  const raw = Buffer.alloc(width * height * 3);
  for (let i = 0; i < raw.length; i += 3) {
    const x = (i / 3) % width;
    raw[i] = (x * 255) / width;
    raw[i + 1] = ((i * 7919) >>> 3) & 0xff;
    raw[i + 2] = 128;
  }
  return sharp(raw, { raw: { width, height, channels: 3 } }).jpeg({ quality: 90 }).toBuffer();
}

describe("photoRendition", () => {
  let dir: string;
  let store: LocalDiskStorage;
  let large: StoredPhoto;
  let narrow: StoredPhoto;
  beforeAll(async () => {
    dir = await mkdtemp(path.join(os.tmpdir(), "benchside-variants-"));
    store = new LocalDiskStorage(dir);
    large = await storePhotoRenditions(await processPhoto(await largePhoto()), { shopId: 7, store });
    // gps.jpg's display rendition is 600 × 800: narrower than every copy width.
    narrow = await storePhotoRenditions(await processPhoto(await readFile(path.join(FIXTURES, "gps.jpg"))), { shopId: 7, store });
  });
  afterAll(async () => {
    if (dir) await rm(dir, { recursive: true, force: true });
  });

  it("makes the inline copy a story's cover shows with the first screen: the photo at a phone's 1× width, in a few kB", async () => {
    const copy = await photoInlineCopy(large, { store });
    expect(copy?.uri).toMatch(/^data:image\/(avif|webp);base64,/);
    const bytes = Buffer.from(copy!.uri.slice(copy!.uri.indexOf(",") + 1), "base64");
    const meta = await sharp(bytes).metadata();
    // The display rendition's 4:3 at INLINE_COPY_WIDTH, and the size the page is told.
    expect([meta.width, meta.height]).toEqual([INLINE_COPY_WIDTH, 270]);
    expect([copy!.width, copy!.height, copy!.bytes]).toEqual([INLINE_COPY_WIDTH, 270, bytes.length]);
    expect(bytes.length).toBeLessThanOrEqual(INLINE_COPY_MAX_BYTES);
    // A picture, not a placeholder: Chromium counts an image for LCP only from 0.05 bits per
    // displayed pixel (web-platform-tests, images/README.md, "contentfulness threshold of 0.05 bits
    // per pixel"); at the 358 × 269 CSS px a 390-px phone shows it, this copy carries more.
    expect((bytes.length * 8) / (358 * 269)).toBeGreaterThan(0.05);
    // A portrait photo narrower than the copy's width keeps its own size.
    const portrait = await photoInlineCopy(narrow, { store });
    expect([portrait?.width, portrait?.height]).toEqual([INLINE_COPY_WIDTH, 480]);
    expect(await photoInlineCopy({ ...large, displayKey: `${large.key}/missing.jpg` }, { store })).toBeNull();
  });

  it("keeps even a picture of pure noise under the byte cap, by stepping down the quality", async () => {
    // Noise in every channel and pixel: the busiest picture there is.
    const width = 1600;
    const height = 1200;
    const raw = Buffer.alloc(width * height * 3);
    for (let i = 0, x = 0x9e3779b9; i < raw.length; i += 1) {
      x ^= x << 13;
      x ^= x >>> 17;
      x ^= x << 5;
      raw[i] = x & 0xff;
    }
    const busy = await storePhotoRenditions(await processPhoto(await sharp(raw, { raw: { width, height, channels: 3 } }).jpeg({ quality: 90 }).toBuffer()), { shopId: 7, store });
    const copy = await photoInlineCopy(busy, { store });
    expect([copy?.width, copy?.height]).toEqual([INLINE_COPY_WIDTH, 270]);
    expect(copy!.bytes).toBeLessThanOrEqual(INLINE_COPY_MAX_BYTES);
  });

  it("answers the two renditions as they are stored", async () => {
    expect((await photoRendition(large, "thumb", { store }))?.body).toEqual((await store.get(large.thumbKey))?.body);
    expect((await photoRendition(large, "display", { store }))?.body).toEqual((await store.get(large.displayKey))?.body);
    expect(large).toMatchObject({ width: 1600, height: 1200 });
  });

  it("makes a copy of the asked width, keeps it beside the renditions, and answers the kept one next time", async () => {
    const key = variantKey(large.displayKey, 640)!;
    expect(key).toBe(`${large.key}/display-w640.jpg`);
    expect(await store.get(key)).toBeNull();
    const made = await photoRendition(large, "w640", { store });
    const meta = await sharp(made!.body).metadata();
    expect([meta.format, meta.width, meta.height]).toEqual(["jpeg", 640, 480]);
    expect(made!.contentType).toBe("image/jpeg");
    expect(made!.size).toBeLessThan((await store.get(large.displayKey))!.size);
    // Made from the cleaned display rendition: still no metadata.
    expect(await exifr.parse(made!.body, { tiff: true, exif: true, gps: true, xmp: true, iptc: true })).toBeUndefined();
    expect((await store.get(key))?.body).toEqual(made!.body);

    // The next request reads the kept copy rather than making another (a marker image proves it).
    const marker = await sharp({ create: { width: 640, height: 480, channels: 3, background: "#ff0000" } }).jpeg().toBuffer();
    await store.put(key, marker, "image/jpeg");
    expect((await photoRendition(large, "w640", { store }))?.body).toEqual(marker);

    const wider = await sharp((await photoRendition(large, "w1280", { store }))!.body).metadata();
    expect([wider.width, wider.height]).toEqual([1280, 960]);
  });

  it("answers the display rendition itself for a photo no wider than the copy, and keeps nothing", async () => {
    const display = await store.get(narrow.displayKey);
    expect((await photoRendition(narrow, "w960", { store }))?.body).toEqual(display!.body);
    expect(await store.get(variantKey(narrow.displayKey, 960)!)).toBeNull();
  });

  it("answers null when the rendition is gone", async () => {
    const gone = { displayKey: "shops/7/photos/0000/display.jpg", thumbKey: "shops/7/photos/0000/thumb.jpg" };
    expect(await photoRendition(gone, "w640", { store })).toBeNull();
    expect(await photoRendition(gone, "thumb", { store })).toBeNull();
  });

  it("removes the copies with the renditions", async () => {
    await photoRendition(large, "w960", { store });
    expect(await store.get(variantKey(large.displayKey, 960)!)).not.toBeNull();
    await deletePhotoRenditions(large, { store });
    for (const key of [large.displayKey, large.thumbKey, variantKey(large.displayKey, 640)!, variantKey(large.displayKey, 960)!, variantKey(large.displayKey, 1280)!]) {
      expect(await store.get(key), key).toBeNull();
    }
  });
});
