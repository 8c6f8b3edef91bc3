import "server-only";
import { randomBytes } from "node:crypto";
import { fileTypeFromBuffer } from "file-type";
import sharp from "sharp";
import { AppError } from "@/lib/errors";
import { PHOTO_WIDTHS, type PhotoRouteSize, type PhotoWidth, THUMB_LONG_EDGE, photoWidthOf } from "@/lib/journal";
import { type ReceivedFile, receiveFile } from "@/lib/server/multipart-file";
import { storage, type ObjectStorage, type StoredObject } from "@/lib/server/storage";

// Uploaded photos are never served as sent: the type is read from the bytes, the size and pixel
// count are capped, and what we keep is a fresh JPEG re-encoded by sharp with no EXIF/GPS/XMP.

export const PHOTO_LIMITS = {
  maxBytes: 20 * 1024 * 1024,
  /** Refused before decoding, so a small file that claims huge dimensions can't exhaust memory. */
  maxPixels: 100_000_000,
  displayLongEdge: 1600,
  thumbLongEdge: THUMB_LONG_EDGE,
} as const;

/** Room for the multipart envelope (boundaries, part headers) around one photo at the size limit. */
const ENVELOPE_BYTES = 64 * 1024;

/**
 * The photo of an upload request (multipart, field "photo"), streamed to a temporary file with
 * the size limit enforced as it arrives: 413 at the limit with nothing more read, whatever
 * Content-Length said or didn't. The caller disposes of it when done.
 */
export function receivePhotoFile(req: Request): Promise<ReceivedFile> {
  return receiveFile(req, {
    field: "photo",
    maxFileBytes: PHOTO_LIMITS.maxBytes,
    maxBodyBytes: PHOTO_LIMITS.maxBytes + ENVELOPE_BYTES,
    tooLargeMessage: `Photos can be at most ${PHOTO_LIMITS.maxBytes / 1024 / 1024} MB each.`,
    missingMessage: "Attach a photo.",
  });
}

export const ACCEPTED_PHOTO_TYPES = ["image/jpeg", "image/png", "image/webp"] as const;
export type AcceptedPhotoType = (typeof ACCEPTED_PHOTO_TYPES)[number];

// What sharp calls each accepted type, to check its decoder agrees with the sniffed type.
const SHARP_FORMAT: Record<AcceptedPhotoType, string> = { "image/jpeg": "jpeg", "image/png": "png", "image/webp": "webp" };

export type PhotoRendition = { data: Buffer; width: number; height: number; contentType: "image/jpeg" };
export type ProcessedPhoto = { display: PhotoRendition; thumb: PhotoRendition; sourceType: AcceptedPhotoType };

const JPEG_OPTIONS = { quality: 82, mozjpeg: true } as const;
const SEND_INSTEAD = "Send a JPEG, PNG or WebP photo.";

function label(name: string | undefined): string {
  // The name is only echoed back in a message: keep it short and printable.
  const clean = (name ?? "").replace(/[\u0000-\u001f\u007f]/g, "").trim().slice(0, 80);
  return clean ? `"${clean}"` : "This file";
}

async function sniff(buffer: Buffer, who: string): Promise<AcceptedPhotoType> {
  const found = await fileTypeFromBuffer(buffer);
  if (found && (ACCEPTED_PHOTO_TYPES as readonly string[]).includes(found.mime)) return found.mime as AcceptedPhotoType;
  if (found && /^image\/hei[cf]/.test(found.mime)) {
    throw new AppError(
      "invalid",
      `${who} is a HEIC/HEIF photo, which we can't read. Send it as a JPEG: most phones convert it when you pick it from the gallery in the browser, or you can set the camera to save JPEG.`,
    );
  }
  if (found?.mime.startsWith("image/")) {
    throw new AppError("invalid", `${who} is a ${found.ext.toUpperCase()} image, which we don't take. ${SEND_INSTEAD}`);
  }
  const looks = found ? `looks like ${found.mime}` : "we couldn't tell what it is";
  throw new AppError("invalid", `${who} is not a photo (${looks}). ${SEND_INSTEAD}`);
}

function unreadable(who: string, error: unknown): AppError {
  const message = error instanceof Error ? error.message : String(error);
  if (/pixel limit/i.test(message)) {
    return new AppError("invalid", `${who} has too many pixels (over ${PHOTO_LIMITS.maxPixels / 1_000_000} megapixels). Send a smaller photo.`);
  }
  return new AppError("invalid", `${who} couldn't be read as a photo: it may be damaged or only partly uploaded. Try sending it again.`);
}

/**
 * Checks an uploaded photo and makes the two renditions we keep (display and thumbnail), both
 * JPEG in sRGB, turned upright by their EXIF orientation, with all metadata dropped.
 * Throws AppError("invalid") with a message naming the file for anything we won't take.
 */
export async function processPhoto(buffer: Buffer, options: { name?: string } = {}): Promise<ProcessedPhoto> {
  const who = label(options.name);
  // Size first: nothing of an oversized upload is parsed.
  if (buffer.length > PHOTO_LIMITS.maxBytes) {
    throw new AppError("invalid", `${who} is larger than ${PHOTO_LIMITS.maxBytes / 1024 / 1024} MB. Send a smaller photo.`);
  }
  if (buffer.length === 0) throw new AppError("invalid", `${who} is empty.`);
  const sourceType = await sniff(buffer, who);

  try {
    // failOn "warning" is sharp's advice for untrusted input: truncated or corrupt data is refused.
    const input = { limitInputPixels: PHOTO_LIMITS.maxPixels, failOn: "warning" } as const;
    const meta = await sharp(buffer, input).metadata();
    if (meta.format !== SHARP_FORMAT[sourceType]) throw new Error(`decoder ${meta.format} disagrees with ${sourceType}`);

    // No withMetadata/keepExif/keepXmp: sharp then writes no EXIF, GPS, XMP or IPTC and converts
    // the pixels to sRGB. Transparent areas go white rather than JPEG's default black.
    const display = await sharp(buffer, input)
      .autoOrient()
      .resize({ width: PHOTO_LIMITS.displayLongEdge, height: PHOTO_LIMITS.displayLongEdge, fit: "inside", withoutEnlargement: true })
      .flatten({ background: "#ffffff" })
      .jpeg(JPEG_OPTIONS)
      .toBuffer({ resolveWithObject: true });
    // The thumbnail comes from the display rendition: already upright, small and clean to decode.
    const thumb = await sharp(display.data)
      .resize({ width: PHOTO_LIMITS.thumbLongEdge, height: PHOTO_LIMITS.thumbLongEdge, fit: "inside", withoutEnlargement: true })
      .jpeg(JPEG_OPTIONS)
      .toBuffer({ resolveWithObject: true });

    return {
      display: { data: display.data, width: display.info.width, height: display.info.height, contentType: "image/jpeg" },
      thumb: { data: thumb.data, width: thumb.info.width, height: thumb.info.height, contentType: "image/jpeg" },
      sourceType,
    };
  } catch (error) {
    if (error instanceof AppError) throw error;
    throw unreadable(who, error);
  }
}

export type StoredPhoto = {
  /** Random per-photo prefix, `shops/<shopId>/photos/<32 hex>`; unguessable, but access is still checked by the route. */
  key: string;
  displayKey: string;
  thumbKey: string;
  width: number;
  height: number;
  /** Size of the display rendition in bytes. */
  bytes: number;
  thumbWidth: number;
  thumbHeight: number;
  thumbBytes: number;
};

export type PhotoKeys = { displayKey: string; thumbKey: string };

/** Writes both renditions; if the second write fails the first is removed, so nothing is half-stored. */
export async function storePhotoRenditions(
  processed: ProcessedPhoto,
  options: { shopId: number; store?: ObjectStorage },
): Promise<StoredPhoto> {
  if (!Number.isSafeInteger(options.shopId) || options.shopId <= 0) throw new AppError("bad_request", "Unknown shop.");
  const store = options.store ?? storage();
  const key = `shops/${options.shopId}/photos/${randomBytes(16).toString("hex")}`;
  const displayKey = `${key}/display.jpg`;
  const thumbKey = `${key}/thumb.jpg`;

  await store.put(displayKey, processed.display.data, processed.display.contentType);
  try {
    await store.put(thumbKey, processed.thumb.data, processed.thumb.contentType);
  } catch (error) {
    await store.delete(displayKey).catch(() => undefined);
    throw error;
  }
  return {
    key,
    displayKey,
    thumbKey,
    width: processed.display.width,
    height: processed.display.height,
    bytes: processed.display.data.length,
    thumbWidth: processed.thumb.width,
    thumbHeight: processed.thumb.height,
    thumbBytes: processed.thumb.data.length,
  };
}

/** Where the copy of a display rendition `width` pixels wide is kept: beside it, named by width. */
export function variantKey(displayKey: string, width: PhotoWidth | undefined): string | null {
  return width && /\.jpe?g$/.test(displayKey) ? displayKey.replace(/\.jpe?g$/, `-w${width}.jpg`) : null;
}

/**
 * The stored image a photo route answers with, after the route has checked who is asking: the
 * thumbnail, the display rendition, or (`w640`…) a narrower copy of the display rendition, made
 * by sharp from it on first request and kept beside it. A photo no wider than `width` answers
 * with the display rendition itself. Null when the rendition is missing.
 */
export async function photoRendition(keys: PhotoKeys, size: PhotoRouteSize, options: { store?: ObjectStorage } = {}): Promise<StoredObject | null> {
  const store = options.store ?? storage();
  if (size === "thumb") return store.get(keys.thumbKey);
  const width = photoWidthOf(size);
  const key = width ? variantKey(keys.displayKey, width) : null;
  if (!width || !key) return store.get(keys.displayKey);
  const kept = await store.get(key);
  if (kept) return kept;
  const display = await store.get(keys.displayKey);
  if (!display) return null;
  const made = await sharp(display.body).resize({ width, withoutEnlargement: true }).jpeg(JPEG_OPTIONS).toBuffer({ resolveWithObject: true });
  // Not wider than asked: the display rendition is already the copy (and nothing is kept).
  if (made.info.width < width) return display;
  // Two requests may make the same copy at once: both write the same bytes. A copy that can't be
  // kept is still answered; the next request makes it again.
  await store.put(key, made.data, "image/jpeg").catch(() => undefined);
  return { body: made.data, contentType: "image/jpeg", size: made.data.length };
}

/** Removes the renditions of a stored photo and any narrower copies made of it; missing files are not an error. */
export async function deletePhotoRenditions(keys: PhotoKeys, options: { store?: ObjectStorage } = {}): Promise<void> {
  const store = options.store ?? storage();
  const copies = PHOTO_WIDTHS.map((w) => variantKey(keys.displayKey, w)).filter((k): k is string => !!k);
  await Promise.all([store.delete(keys.displayKey), store.delete(keys.thumbKey), ...copies.map((k) => store.delete(k))]);
}

/** How wide a photo's inline copy is: a phone's column (358 CSS px on a 390-px screen) at 1× density. */
export const INLINE_COPY_WIDTH = 360;
/** The most an inline copy may weigh: 8 kB take 0.16 s at "Slow 3G"'s 400 kbps, and the first paint waits for them. */
export const INLINE_COPY_MAX_BYTES = 8_000;
const INLINE_COPY_QUALITIES = [55, 45, 35] as const;

export type InlineCopy = { uri: string; width: number; height: number; bytes: number };

/**
 * The photo at a phone's 1× width as a data: URI (AVIF or WebP), for a page to carry inside its HTML: on a
 * slow connection the picture shows with the first screen, a little soft, and the full-density
 * copy replaces it once it has arrived. Sharp, not a blurred placeholder: what the reader sees is
 * the photo. The best quality that fits INLINE_COPY_MAX_BYTES; null when none does (a busy picture
 * then just waits for its own request) or the display rendition is missing.
 */
export async function photoInlineCopy(keys: PhotoKeys, options: { store?: ObjectStorage } = {}): Promise<InlineCopy | null> {
  const display = await (options.store ?? storage()).get(keys.displayKey);
  if (!display) return null;
  const resized = sharp(display.body).resize({ width: INLINE_COPY_WIDTH, withoutEnlargement: true });
  for (const quality of INLINE_COPY_QUALITIES) {
    // AVIF is usually the smaller for a photo, WebP for a drawing or a flat picture: the smaller goes.
    const [avif, webp] = await Promise.all([
      resized.clone().avif({ quality, effort: 3 }).toBuffer({ resolveWithObject: true }),
      resized.clone().webp({ quality }).toBuffer({ resolveWithObject: true }),
    ]);
    const [type, { data, info }] = avif.data.length <= webp.data.length ? (["avif", avif] as const) : (["webp", webp] as const);
    if (data.length <= INLINE_COPY_MAX_BYTES) return { uri: `data:image/${type};base64,${data.toString("base64")}`, width: info.width, height: info.height, bytes: data.length };
  }
  return null;
}
