// The job's timeline: entry shapes shared by the API, the SWR hooks and the pages. Pure: no I/O.
// The zod schemas for what clients send are in lib/schemas/journal.ts, so the browser bundles
// that import this module don't carry the validation library.
import type { JobStatus } from "@/lib/job-status";
import { JOB_STATUSES } from "@/lib/job-status";

// Bench records (torque, reading, teardown, part) keep their own rows; their entry's body is a
// snapshot of what was recorded, so the timeline reads them without a query per kind.
export const ENTRY_KINDS = ["note", "photos", "status", "torque", "reading", "teardown", "part", "clip", "approval", "invoice", "payment"] as const;
export type EntryKind = (typeof ENTRY_KINDS)[number];
export type EntryVisibility = "shop" | "shared";
/**
 * "shop": staff of the job's shop; "owner": the machine's owner (shared entries only);
 * "follower": someone the owner invited (shared entries without money or decisions).
 */
export type TimelineAudience = "shop" | "owner" | "follower";
/** Entries that carry prices or the owner's decisions: never shown or mailed to followers. */
export const MONEY_ENTRY_KINDS: readonly string[] = ["approval", "invoice", "payment"];
/**
 * Entries that stand for a record kept elsewhere (the status history, an approval request, an
 * invoice or payment): they can't be edited, hidden or deleted from the timeline.
 */
export const RECORD_ENTRY_KINDS: readonly string[] = ["status", "approval", "invoice", "payment"];

export const ENTRY_KIND_LABEL: Record<EntryKind, string> = {
  note: "Note",
  photos: "Photos",
  status: "Status",
  torque: "Torque record",
  reading: "Reading",
  teardown: "Teardown step",
  part: "Parts",
  clip: "Clip",
  approval: "Approval request",
  invoice: "Invoice",
  payment: "Payment",
};
export const VISIBILITY_LABEL: Record<EntryVisibility, string> = { shop: "Shop only", shared: "Shared with owner" };

export type TimelinePhoto = { id: string; width: number; height: number; thumbUrl: string; displayUrl: string };
export type ClipStatus = "uploading" | "processing" | "ready" | "errored" | "deleted";
/** A clip as a reader gets it: where it plays from only once it is ready. */
export type TimelineClip = {
  id: string;
  status: ClipStatus;
  durationSeconds: number | null;
  aspectRatio: string | null;
  src: string | null;
  poster: string | null;
  error: string | null;
  /** Marked moments, earliest first. */
  moments?: { atMs: number; label: string }[];
};
export type StatusBody = { from: JobStatus | null; to: JobStatus; note: string | null };

export type TimelineEntry = {
  id: number;
  kind: EntryKind;
  visibility: EntryVisibility;
  createdAt: string;
  editedAt: string | null;
  author: { name: string } | null;
  body: unknown;
  caption: string | null;
  photos: TimelinePhoto[];
  clip?: TimelineClip | null;
  /** Shop audience only. */
  version?: number;
  mine?: boolean;
};

export type TimelinePage = { entries: TimelineEntry[]; next: number | null };

export const PHOTO_SIZES = ["thumb", "display"] as const;
export type PhotoSize = (typeof PHOTO_SIZES)[number];
export const PHOTO_ID_PATTERN = /^[A-Za-z0-9_-]{22}$/;
export const JOB_PUBLIC_ID_PATTERN = /^[A-Za-z0-9_-]{16}$/;
/** Photos in one set: enough for a teardown, few enough for a phone on garage Wi-Fi. */
export const MAX_PHOTOS_PER_SET = 20;

export function photoUrl(id: string, size: PhotoSize): string {
  return `/api/photos/${id}/${size}`;
}

/**
 * Narrower copies of the display rendition that the photo routes make on first request
 * (size `w640`…), so a phone downloads a photo near the size it shows it at.
 */
export const PHOTO_WIDTHS = [640, 960, 1280] as const;
export type PhotoWidth = (typeof PHOTO_WIDTHS)[number];
/** The sizes a photo route answers for: the two renditions, then the copies (`w` + PHOTO_WIDTHS). */
export const PHOTO_ROUTE_SIZES = ["thumb", "display", "w640", "w960", "w1280"] as const;
export type PhotoRouteSize = (typeof PHOTO_ROUTE_SIZES)[number];
/** The long edge of the thumbnail rendition (lib/server/photos.ts makes it). */
export const THUMB_LONG_EDGE = 400;

/** The width of a copy size ("w960" → 960), or undefined for the renditions themselves. */
export function photoWidthOf(size: PhotoRouteSize): PhotoWidth | undefined {
  return PHOTO_WIDTHS.find((w) => `w${w}` === size);
}

/**
 * The `srcset` of a photo: its thumbnail, the narrower copies below its width, and the display
 * rendition itself, each with its real width, so the browser picks by `sizes` and screen density.
 * A copy's address is the display one with the size segment changed (a query such as an e-mail
 * token stays).
 */
export function photoSrcSet(photo: Pick<TimelinePhoto, "width" | "height" | "thumbUrl" | "displayUrl">): string {
  const thumbWidth = Math.round(photo.width * Math.min(1, THUMB_LONG_EDGE / Math.max(photo.width, photo.height, 1)));
  const candidates = [`${photo.thumbUrl} ${thumbWidth}w`];
  const copies = /\/display(?=$|\?)/.test(photo.displayUrl);
  for (const w of PHOTO_WIDTHS) {
    if (copies && w > thumbWidth && w < photo.width) candidates.push(`${photo.displayUrl.replace(/\/display(?=$|\?)/, `/w${w}`)} ${w}w`);
  }
  if (photo.width > thumbWidth) candidates.push(`${photo.displayUrl} ${photo.width}w`);
  return candidates.join(", ");
}

/** Groups entries by calendar day in the shop's time zone, keeping their order. */
export function groupByDay<T extends { createdAt: string }>(entries: T[], timeZone: string): { day: string; label: string; entries: T[] }[] {
  const key = new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" });
  const label = new Intl.DateTimeFormat("en-US", { timeZone, weekday: "long", month: "long", day: "numeric", year: "numeric" });
  const groups: { day: string; label: string; entries: T[] }[] = [];
  for (const entry of entries) {
    const at = new Date(entry.createdAt);
    const day = key.format(at);
    const last = groups[groups.length - 1];
    if (last && last.day === day) last.entries.push(entry);
    else groups.push({ day, label: label.format(at), entries: [entry] });
  }
  return groups;
}

export function isStatusBody(body: unknown): body is StatusBody {
  return !!body && typeof body === "object" && (JOB_STATUSES as readonly unknown[]).includes((body as StatusBody).to);
}
