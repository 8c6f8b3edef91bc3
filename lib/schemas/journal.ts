// What clients send to the job's timeline (lib/journal.ts holds the shapes and pure helpers):
// kept apart so client components can import lib/journal.ts without zod.
import { z } from "zod";
import { MAX_PHOTOS_PER_SET, PHOTO_ID_PATTERN } from "@/lib/journal";

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
