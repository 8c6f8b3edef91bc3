// Photo uploads on the server (issue 3): type sniffed from the bytes, size and pixel caps, metadata
// stripped, renditions stored through the storage module. Fixtures: tests/fixtures/photos/make-fixtures.ts.
import { mkdtemp, readdir, readFile, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { crc32 } from "node:zlib";
import exifr from "exifr";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { deletePhotoRenditions, PHOTO_LIMITS, processPhoto, storePhotoRenditions } from "@/lib/server/photos";
import { LocalDiskStorage, S3Storage, storageFromEnv } from "@/lib/server/storage";
import { FIXTURE_GPS } from "../fixtures/photos/make-fixtures";

const FIXTURES = path.resolve(__dirname, "../fixtures/photos");
const fixture = (name: string) => readFile(path.join(FIXTURES, name));

/** Every metadata block exifr knows, so "nothing found" means nothing of EXIF/GPS/XMP/IPTC/ICC survived. */
const ALL_METADATA = { tiff: true, exif: true, gps: true, interop: true, ifd1: true, xmp: true, iptc: true, icc: true, jfif: false, ihdr: false };

/** RGB of one pixel. */
async function pixel(jpeg: Buffer, x: number, y: number): Promise<[number, number, number]> {
  const raw = await sharp(jpeg).extract({ left: x, top: y, width: 1, height: 1 }).removeAlpha().raw().toBuffer();
  return [raw[0]!, raw[1]!, raw[2]!];
}

/** A valid PNG whose header claims width × height; sharp must refuse it before allocating the pixels. */
async function pngClaiming(width: number, height: number): Promise<Buffer> {
  const png = Buffer.from(await sharp({ create: { width: 8, height: 8, channels: 3, background: "#808080" } }).png().toBuffer());
  // IHDR data starts at byte 16 (8-byte signature, 4-byte length, "IHDR"); its CRC covers type + data.
  png.writeUInt32BE(width, 16);
  png.writeUInt32BE(height, 20);
  png.writeUInt32BE(crc32(png.subarray(12, 29)) >>> 0, 29);
  return png;
}

describe("processPhoto", () => {
  let gpsJpeg: Buffer;
  beforeAll(async () => {
    gpsJpeg = await fixture("gps.jpg");
  });

  it("drops EXIF, GPS and XMP that the upload carried", async () => {
    // The fixture really carries them, or the check below would prove nothing.
    const before = await exifr.gps(gpsJpeg);
    expect(before.latitude).toBeCloseTo(FIXTURE_GPS.latitude, 6);
    expect(before.longitude).toBeCloseTo(FIXTURE_GPS.longitude, 6);
    expect((await exifr.parse(gpsJpeg, { xmp: true })).creator).toBe("Fixture Maker");

    const out = await processPhoto(gpsJpeg, { name: "gps.jpg" });
    for (const rendition of [out.display, out.thumb]) {
      // Issue 3 requirement (EXIF/GPS stripped); common practice, no published source.
      expect(await exifr.gps(rendition.data)).toBeUndefined();
      expect(await exifr.parse(rendition.data, ALL_METADATA)).toBeUndefined();
      const meta = await sharp(rendition.data).metadata();
      expect(meta.exif).toBeUndefined();
      expect(meta.xmp).toBeUndefined();
      expect(meta.iptc).toBeUndefined();
      expect(meta.format).toBe("jpeg");
      expect(rendition.contentType).toBe("image/jpeg");
    }
    expect(out.sourceType).toBe("image/jpeg");
  });

  it("turns the photo upright by its EXIF orientation and never enlarges it", async () => {
    const out = await processPhoto(gpsJpeg);
    // Stored 800×600 with Orientation 6 (rotate 90° clockwise to view): upright it is 600×800, smaller than 1600.
    expect([out.display.width, out.display.height]).toEqual([600, 800]);
    expect([out.thumb.width, out.thumb.height]).toEqual([300, 400]);
    const meta = await sharp(out.display.data).metadata();
    expect([meta.width, meta.height]).toEqual([600, 800]);
    // The stored top half (red) is on the right once upright, the bottom half (blue) on the left.
    const [rr, , rb] = await pixel(out.display.data, 550, 400);
    const [lr, , lb] = await pixel(out.display.data, 50, 400);
    expect(rr).toBeGreaterThan(150);
    expect(rb).toBeLessThan(90);
    expect(lb).toBeGreaterThan(100);
    expect(lr).toBeLessThan(80);
  });

  it("shrinks a large photo to the display and thumbnail long edges", async () => {
    const big = await sharp({ create: { width: 4000, height: 3000, channels: 3, background: "#6b5b3e" } }).jpeg().toBuffer();
    const out = await processPhoto(big);
    expect([out.display.width, out.display.height]).toEqual([PHOTO_LIMITS.displayLongEdge, 1200]);
    expect([out.thumb.width, out.thumb.height]).toEqual([PHOTO_LIMITS.thumbLongEdge, 300]);
  });

  it("takes a PNG and fills its transparent parts with white", async () => {
    const out = await processPhoto(await fixture("plain.png"), { name: "plain.png" });
    expect(out.sourceType).toBe("image/png");
    expect([out.display.width, out.display.height]).toEqual([640, 480]);
    const [r, g, b] = await pixel(out.display.data, 600, 240);
    expect(Math.min(r, g, b)).toBeGreaterThan(245);
    const [, green] = await pixel(out.display.data, 40, 240);
    expect(green).toBeGreaterThan(100);
  });

  it("takes a WebP", async () => {
    const webp = await sharp({ create: { width: 300, height: 200, channels: 3, background: "#335577" } }).webp().toBuffer();
    const out = await processPhoto(webp);
    expect(out.sourceType).toBe("image/webp");
    expect([out.display.width, out.display.height]).toEqual([300, 200]);
  });

  // The checks below are security checks on untrusted uploads: common practice, no published source.

  it("refuses an executable named .jpg, by its content", async () => {
    await expect(processPhoto(await fixture("not-a-photo.jpg"), { name: "not-a-photo.jpg" })).rejects.toMatchObject({
      code: "invalid",
      message: expect.stringContaining('"not-a-photo.jpg" is not a photo (looks like application/x-elf)'),
    });
  });

  it("refuses bytes of no known type, and an empty file", async () => {
    await expect(processPhoto(Buffer.from("just some text, renamed photo.jpg"))).rejects.toMatchObject({
      code: "invalid",
      message: expect.stringContaining("This file is not a photo (we couldn't tell what it is)"),
    });
    await expect(processPhoto(Buffer.alloc(0), { name: "empty.jpg" })).rejects.toThrow('"empty.jpg" is empty');
  });

  it("asks for a JPEG when given HEIC", async () => {
    await expect(processPhoto(await fixture("heic-looking.heic"), { name: "IMG_0001.HEIC" })).rejects.toMatchObject({
      code: "invalid",
      message: expect.stringMatching(/^"IMG_0001\.HEIC" is a HEIC\/HEIF photo.*Send it as a JPEG/),
    });
  });

  it("refuses a 50 MB upload by size, before looking inside", async () => {
    // A real JPEG padded past the cap: sharp would decode it happily, so only the size check can refuse it.
    const padded = Buffer.concat([gpsJpeg, Buffer.alloc(50 * 1024 * 1024)]);
    await expect(processPhoto(padded, { name: "huge.jpg" })).rejects.toMatchObject({
      code: "invalid",
      message: '"huge.jpg" is larger than 20 MB. Send a smaller photo.',
    });
    // All zeros would be "not a photo" if the content were examined first.
    await expect(processPhoto(Buffer.alloc(PHOTO_LIMITS.maxBytes + 1))).rejects.toThrow("This file is larger than 20 MB");
  });

  it("refuses a truncated JPEG", async () => {
    const truncated = gpsJpeg.subarray(0, Math.floor(gpsJpeg.length / 2));
    await expect(processPhoto(truncated, { name: "cut.jpg" })).rejects.toMatchObject({
      code: "invalid",
      message: expect.stringContaining('"cut.jpg" couldn\'t be read as a photo'),
    });
  });

  it("refuses a small file that claims more pixels than the cap", async () => {
    const bomb = await pngClaiming(20_000, 20_000);
    expect(bomb.length).toBeLessThan(1000);
    await expect(processPhoto(bomb, { name: "bomb.png" })).rejects.toMatchObject({
      code: "invalid",
      message: expect.stringContaining('"bomb.png" has too many pixels (over 100 megapixels)'),
    });
  });
});

describe("storage", () => {
  let dir: string;
  beforeAll(async () => {
    dir = await mkdtemp(path.join(os.tmpdir(), "benchside-storage-"));
  });
  afterAll(async () => {
    if (dir) await rm(dir, { recursive: true, force: true });
  });

  it("puts, gets, streams and deletes on local disk", async () => {
    const store = new LocalDiskStorage(dir);
    const body = Buffer.from("bench photo bytes");
    await store.put("shops/1/photos/abc/display.jpg", body, "image/jpeg");
    // Written through a temporary file and renamed: only the final file remains.
    expect(await readdir(path.join(dir, "shops/1/photos/abc"))).toEqual(["display.jpg"]);

    expect(await store.get("shops/1/photos/abc/display.jpg")).toEqual({ body, contentType: "image/jpeg", size: body.length });
    const streamed = await store.getStream("shops/1/photos/abc/display.jpg");
    expect(streamed?.size).toBe(body.length);
    expect(Buffer.from(await new Response(streamed!.stream).arrayBuffer())).toEqual(body);

    await store.put("shops/1/photos/abc/display.jpg", Buffer.from("replaced"), "image/jpeg");
    expect((await store.get("shops/1/photos/abc/display.jpg"))?.body.toString()).toBe("replaced");

    await store.delete("shops/1/photos/abc/display.jpg");
    expect(await store.get("shops/1/photos/abc/display.jpg")).toBeNull();
    expect(await store.getStream("shops/1/photos/abc/display.jpg")).toBeNull();
    await store.delete("shops/1/photos/abc/display.jpg"); // deleting twice is fine
  });

  it("refuses keys that could leave the storage folder or read oddly", async () => {
    const store = new LocalDiskStorage(dir);
    const bad = ["../x.jpg", "/etc/passwd", "a/../../b.jpg", "a//b.jpg", ".hidden.jpg", "a/.b.jpg", "A.JPG", "noext", "a\\b.jpg", "a/b.jpg/"];
    for (const key of bad) {
      await expect(store.put(key, Buffer.from("x"), "image/jpeg"), key).rejects.toMatchObject({ code: "bad_request" });
      await expect(store.get(key), key).rejects.toMatchObject({ code: "bad_request" });
      await expect(store.delete(key), key).rejects.toMatchObject({ code: "bad_request" });
    }
    expect(await readdir(dir)).not.toContain("x.jpg");
  });

  it("refuses a content type that disagrees with the key", async () => {
    const store = new LocalDiskStorage(dir);
    await expect(store.put("shops/1/x.jpg", Buffer.from("x"), "text/html")).rejects.toThrow("must be stored as image/jpeg, not text/html");
  });

  it("stores and deletes both renditions of a photo", async () => {
    const store = new LocalDiskStorage(dir);
    const processed = await processPhoto(await fixture("gps.jpg"));
    const stored = await storePhotoRenditions(processed, { shopId: 42, store });
    expect(stored.key).toMatch(/^shops\/42\/photos\/[0-9a-f]{32}$/);
    expect(stored.displayKey).toBe(`${stored.key}/display.jpg`);
    expect(stored.thumbKey).toBe(`${stored.key}/thumb.jpg`);
    expect(stored).toMatchObject({ width: 600, height: 800, bytes: processed.display.data.length, thumbWidth: 300, thumbHeight: 400 });
    expect((await store.get(stored.displayKey))?.body).toEqual(processed.display.data);
    expect((await store.get(stored.thumbKey))?.body).toEqual(processed.thumb.data);

    const again = await storePhotoRenditions(processed, { shopId: 42, store });
    expect(again.key).not.toBe(stored.key);

    await deletePhotoRenditions(stored, { store });
    expect(await store.get(stored.displayKey)).toBeNull();
    expect(await store.get(stored.thumbKey)).toBeNull();
    expect(await store.get(again.displayKey)).not.toBeNull();
    await expect(storePhotoRenditions(processed, { shopId: 0, store })).rejects.toMatchObject({ code: "bad_request" });
  });
});

describe("storageFromEnv", () => {
  it("uses local disk by default, under .data/uploads or STORAGE_DIR", () => {
    const local = storageFromEnv({});
    expect(local).toBeInstanceOf(LocalDiskStorage);
    expect((local as LocalDiskStorage).dir).toBe(path.join(process.cwd(), ".data", "uploads"));
    expect((storageFromEnv({ STORAGE_DRIVER: "local", STORAGE_DIR: "/tmp/elsewhere" }) as LocalDiskStorage).dir).toBe("/tmp/elsewhere");
  });

  it("names the missing variable when S3 is half configured", () => {
    expect(() => storageFromEnv({ STORAGE_DRIVER: "s3" })).toThrow("S3_BUCKET");
    expect(() => storageFromEnv({ STORAGE_DRIVER: "s3", S3_BUCKET: "b", S3_ACCESS_KEY_ID: "k" })).toThrow("S3_SECRET_ACCESS_KEY");
    expect(() => storageFromEnv({ STORAGE_DRIVER: "s3", S3_BUCKET: "b", S3_SECRET_ACCESS_KEY: "s" })).toThrow("S3_ACCESS_KEY_ID");
    expect(() => storageFromEnv({ STORAGE_DRIVER: "s3", S3_BUCKET: "b", S3_FORCE_PATH_STYLE: "yes" })).toThrow("S3_FORCE_PATH_STYLE");
    expect(() => storageFromEnv({ STORAGE_DRIVER: "ftp" })).toThrow("STORAGE_DRIVER");
  });

  it("builds S3 storage from a full configuration", () => {
    const s3 = storageFromEnv({
      STORAGE_DRIVER: "s3",
      S3_BUCKET: "bench-uploads",
      S3_ENDPOINT: "http://127.0.0.1:9000",
      S3_FORCE_PATH_STYLE: "true",
      S3_ACCESS_KEY_ID: "key",
      S3_SECRET_ACCESS_KEY: "secret",
    });
    expect(s3).toBeInstanceOf(S3Storage);
    expect((s3 as S3Storage).bucket).toBe("bench-uploads");
  });
});
