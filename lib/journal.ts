// The job's timeline: entry shapes shared by the API, the SWR hooks and the pages, and the
// zod schemas for what clients send. Pure: no I/O.
import { z } from "zod";
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

export const timelineQuerySchema = z.object({
  order: z.enum(["asc", "desc"]).default("desc"),
  after: z.coerce.number().int().positive().optional(),
  limit: z.coerce.number().int().min(1).max(100).default(50),
  /** Staff can read a timeline as its owner sees it (the owner's own page does). */
  as: z.literal("owner").optional(),
});

const visibility = z.enum(["shop", "shared"], { message: 'Choose "shop" or "shared".' });
const caption = z
  .string()
  .trim()
  .max(500, "Keep the caption under 500 characters.")
  .transform((s) => (s === "" ? null : s));
const photoId = z.string().regex(PHOTO_ID_PATTERN, "That is not a photo id.");

export const newEntrySchema = z.discriminatedUnion(
  "kind",
  [
    // The note's document is checked by parseNote (lib/rich-text/note.ts) after this.
    z.object({ kind: z.literal("note"), note: z.unknown(), visibility: visibility.default("shop") }),
    z.object({
      kind: z.literal("photos"),
      photoIds: z.array(photoId).min(1, "Add at least one photo.").max(MAX_PHOTOS_PER_SET, `Post at most ${MAX_PHOTOS_PER_SET} photos at once.`),
      caption: caption.optional(),
      visibility: visibility.default("shop"),
    }),
  ],
  { message: 'Say what to post: "note" or "photos".' },
);
export type NewEntry = z.output<typeof newEntrySchema>;

export const entryChangeSchema = z
  .object({
    version: z.number().int().positive(),
    note: z.unknown().optional(),
    caption: caption.nullable().optional(),
    visibility: visibility.optional(),
  })
  .refine((v) => v.note !== undefined || v.caption !== undefined || v.visibility !== undefined, { message: "Nothing to change." });

export const entryDeleteSchema = z.object({ version: z.coerce.number().int().positive() });

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
