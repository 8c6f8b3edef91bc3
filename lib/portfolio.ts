// The public portfolio: story statuses and who may move them, what a story may show, the
// privacy checks on curated words, and the shapes the public pages read. Pure: no I/O.
import { z } from "zod";
import type { TimelineClip, TimelinePhoto } from "@/lib/journal";
import { PHOTO_ID_PATTERN } from "@/lib/journal";
import type { MachineKind } from "@/lib/machine";
import type { NoteDoc, NoteNode } from "@/lib/rich-text/note";
import type { TorqueUnit } from "@/lib/torque";

export const STORY_STATUSES = ["proposed", "consent_requested", "consented", "declined", "published", "withdrawn", "unpublished"] as const;
export type StoryStatus = (typeof STORY_STATUSES)[number];
export const STORY_STATUS_LABEL: Record<StoryStatus, string> = {
  proposed: "Proposed, owner not asked yet",
  consent_requested: "Waiting on the owner's answer",
  consented: "Owner agreed, not public yet",
  declined: "Owner said no",
  published: "Public",
  withdrawn: "Owner withdrew consent",
  unpublished: "Taken down by the shop",
};

/** The same statuses as the machine's owner reads them. */
export const OWNER_STATUS_WORDS: Record<StoryStatus, string> = {
  proposed: "The shop is writing this job up to show it. Nothing is public; you'll be asked once it is ready to read.",
  consent_requested: "The shop is waiting for your answer. Nothing is public.",
  consented: "You agreed. The shop hasn't published it yet.",
  declined: "You said no. Nothing is public.",
  published: "You agreed and the story is public.",
  withdrawn: "You withdrew your consent. Nothing is public.",
  unpublished: "You agreed; the shop has taken the story down for now.",
};

export const CONSENT_DECISIONS = ["given", "refused", "withdrawn"] as const;
export type ConsentDecision = (typeof CONSENT_DECISIONS)[number];
/** Where each of the owner's answers may be given from; anything else is a 409 that says why. */
export const CONSENT_FROM: Record<ConsentDecision, readonly StoryStatus[]> = {
  // Not while "proposed": the owner agrees to a written story, once the shop has asked about it.
  given: ["consent_requested", "declined", "withdrawn"],
  refused: ["proposed", "consent_requested"],
  withdrawn: ["consented", "published", "unpublished"],
};
export const CONSENT_TO: Record<ConsentDecision, StoryStatus> = { given: "consented", refused: "declined", withdrawn: "withdrawn" };
/** The shop owner publishes only what the machine's owner agreed to (and hasn't taken back). */
export const PUBLISHABLE_FROM: readonly StoryStatus[] = ["consented", "unpublished"];

export const STORY_ITEM_KINDS = ["photos", "photo", "clip", "torque", "checklist"] as const;
export type StoryItemKind = (typeof STORY_ITEM_KINDS)[number];
export const STORY_ITEM_LABEL: Record<StoryItemKind, string> = {
  photos: "Photo set",
  photo: "One photo",
  clip: "Clip",
  torque: "Torque record",
  checklist: "Reassembly progress",
};
/** The timeline entry kind each item draws on (the checklist is the job's, not an entry's). */
export const ITEM_ENTRY_KIND: Record<Exclude<StoryItemKind, "checklist">, "photos" | "clip" | "torque"> = {
  photos: "photos",
  photo: "photos",
  clip: "clip",
  torque: "torque",
};
export const MAX_STORY_ITEMS = 40;

// Paths under /s/[shop]/ that are files of ours, not stories (social cards get a hashed suffix).
export const RESERVED_STORY_SLUGS: readonly string[] = ["logo", "opengraph-image", "twitter-image", "icon", "photos", "sitemap", "robots"];
export const isReservedSlug = (slug: string) => RESERVED_STORY_SLUGS.includes(slug) || /^(?:opengraph-image|twitter-image|icon)-/.test(slug);
export const STORY_SLUG_PATTERN = /^[a-z0-9]+(?:-[a-z0-9]+)*$/;
export const SHOP_SLUG_PATTERN = /^[a-z0-9][a-z0-9-]{0,59}$/;

/** "Ridgeline 570: fall service" → "ridgeline-570-fall-service" (ASCII, at most 80 characters). */
export function slugify(text: string): string {
  const slug = text
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-+|-+$/g, "")
    .slice(0, 80)
    .replace(/-+$/, "");
  return slug || "story";
}

export const storySlugSchema = z
  .string()
  .trim()
  .toLowerCase()
  .min(3, "Use at least 3 characters for the address.")
  .max(80, "Keep the address under 80 characters.")
  .regex(STORY_SLUG_PATTERN, "Use lower-case letters, digits and single hyphens, e.g. ridgeline-fall-service.")
  .refine((s) => !isReservedSlug(s), "That address is taken by the site itself; pick another.");

const caption = z
  .string()
  .trim()
  .max(300, "Keep each caption under 300 characters.")
  .nullish()
  .transform((s) => (s ? s : null));

export const storyItemInputSchema = z.object({
  kind: z.enum(STORY_ITEM_KINDS, { message: "Unknown kind of item." }),
  entryId: z.number().int().positive().nullish(),
  photoId: z.string().regex(PHOTO_ID_PATTERN, "That is not a photo id.").nullish(),
  momentSeconds: z.number().min(0).max(24 * 3600).nullish(),
  caption,
});
export type StoryItemInput = z.output<typeof storyItemInputSchema>;

const jsonArray = z.string().transform((s, ctx) => {
  try {
    return JSON.parse(s) as unknown;
  } catch {
    ctx.addIssue({ code: "custom", message: "The list of items couldn't be read; reload the page." });
    return z.NEVER;
  }
});

/** The owner's consent form (consentAction adds `job`): the pressed button is the decision, the typed name signs it. */
export const storyConsentFields = z.object({
  decision: z.enum(CONSENT_DECISIONS, { message: "Choose an answer." }),
  /** SHA-256 of the story the page showed; agreeing binds to it (lib/server/portfolio.ts). */
  shownHash: z
    .string()
    .regex(/^[0-9a-f]{64}$/, "Reload the page and answer again.")
    .optional(),
  name: z.string({ message: "Type your name to sign your answer." }).trim().min(1, "Type your name to sign your answer.").max(120, "Keep your name under 120 characters."),
});

/** The curation form (a server action's FormData): the write-up is a JSON string from NoteEditor, "" for none. */
const staleStory = "This story changed or couldn't be read: reload the page and try again.";
export const storyCurationSchema = z.object({
  story: z.coerce.number({ message: staleStory }).int(staleStory).positive(staleStory),
  version: z.coerce.number({ message: staleStory }).int(staleStory).positive(staleStory),
  title: z.string().trim().min(3, "Give the story a title of at least 3 characters.").max(120, "Keep the title under 120 characters."),
  slug: storySlugSchema,
  writeUp: z.string().max(70_000).optional(),
  cover: z
    .string()
    .trim()
    .refine((s) => s === "" || PHOTO_ID_PATTERN.test(s), "Pick a cover photo from the list.")
    .optional()
    .transform((s) => (s ? s : null)),
  items: jsonArray.pipe(z.array(storyItemInputSchema, { message: "The list of items couldn't be read; reload the page." }).max(MAX_STORY_ITEMS, `A story shows at most ${MAX_STORY_ITEMS} items.`)),
});
export type StoryCuration = z.output<typeof storyCurationSchema>;

const optionalLine = (max: number, what: string) =>
  z
    .string()
    .trim()
    .max(max, `Keep ${what} under ${max} characters.`)
    .optional()
    .transform((s) => (s ? s : null));

export const shopProfileSchema = z.object({
  shop: z.string().regex(SHOP_SLUG_PATTERN, "This page names no shop of yours: reload it and try again."),
  displayName: optionalLine(120, "the name"),
  about: optionalLine(2000, "the about text"),
  locationText: optionalLine(200, "the location"),
  takesIn: optionalLine(600, "what the shop takes in"),
  showLocation: z
    .string()
    .optional()
    .transform((v) => v === "on" || v === "true"),
  publicEmail: z
    .string()
    .trim()
    .toLowerCase()
    .max(254, "That e-mail address is too long.")
    .optional()
    .transform((s) => (s ? s : null))
    .pipe(z.email({ error: "That is not an e-mail address." }).nullable()),
  publicPhone: optionalLine(40, "the phone number").refine((s) => s === null || /^[+\d][\d ().-]{3,39}$/.test(s), "Use digits, spaces, +, ( ) and - only."),
  removeLogo: z
    .string()
    .optional()
    .transform((v) => v === "on" || v === "true"),
});
export type ShopProfileInput = z.output<typeof shopProfileSchema>;

// ---- privacy: what curated words must never carry ----

export type PrivateFacts = { customerName: string; serial: string | null };

const PRICE = /[$€£¥]\s?\d|\b\d+(?:[.,]\d{2})?\s?(?:USD|EUR|GBP|CAD|AUD|dollars?|bucks)\b/i;
// A 17-character vehicle identification number (letters I, O, Q never appear in one).
const VIN = /\b(?=[A-HJ-NPR-Z0-9]*\d)(?=[A-HJ-NPR-Z0-9]*[A-HJ-NPR-Z])[A-HJ-NPR-Z0-9]{17}\b/i;
const alnum = (s: string) => s.toLowerCase().replace(/[^\p{L}\p{N}]+/gu, "");
const escapeRe = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");

function nameWords(name: string): RegExp[] {
  return name
    .split(/[\s,]+/)
    .map((w) => w.replace(/[^\p{L}\p{N}'-]/gu, ""))
    .filter((w) => w.length >= 2)
    .map((w) => new RegExp(`(?<![\\p{L}\\p{N}])${escapeRe(w)}(?![\\p{L}\\p{N}])`, "iu"));
}

/** What is wrong with a piece of curated text for the public, in words for the curator; [] when fine. */
export function privateTextProblems(text: string, facts: PrivateFacts): string[] {
  const problems: string[] = [];
  if (nameWords(facts.customerName).some((re) => re.test(text))) problems.push("mentions the owner's name");
  const serial = facts.serial ? alnum(facts.serial) : "";
  if (serial.length >= 4 && alnum(text).includes(serial)) problems.push("contains the machine's serial number");
  else if (VIN.test(text)) problems.push("contains what looks like a VIN");
  if (PRICE.test(text)) problems.push("mentions a price");
  return problems;
}

/** The last guard at render time: the owner's name and the serial never reach the public, whatever was saved. */
export function redactText(text: string, facts: PrivateFacts): string {
  let out = text;
  for (const re of nameWords(facts.customerName)) out = out.replace(new RegExp(re.source, "giu"), "[name removed]");
  if (facts.serial && facts.serial.trim().length >= 4) out = out.replace(new RegExp(escapeRe(facts.serial.trim()), "gi"), "[serial removed]");
  return out.replace(new RegExp(VIN.source, "gi"), "[number removed]");
}

/** Every text node of a note, redacted; structure and marks unchanged. */
export function redactNote(doc: NoteDoc, facts: PrivateFacts): NoteDoc {
  const walk = (nodes: NoteNode[] | undefined): NoteNode[] | undefined =>
    nodes?.map((n) => (n.type === "text" ? { ...n, text: redactText(n.text, facts) } : "content" in n ? ({ ...n, content: walk(n.content) } as NoteNode) : n));
  return { ...doc, content: walk(doc.content) };
}

// ---- what the public pages read ----

export type PublicPhoto = TimelinePhoto;
export type PublicTorque = { fastener: string; specValue: number; unit: TorqueUnit; displayUnit: TorqueUnit; proof: string; boltCount: number | null; pattern: "cross" | null };
export type PublicStoryItem =
  | { kind: "photos"; caption: string | null; photos: PublicPhoto[] }
  | { kind: "photo"; caption: string | null; photo: PublicPhoto }
  | { kind: "clip"; caption: string | null; clip: TimelineClip; startSeconds: number | null }
  | { kind: "torque"; caption: string | null; torque: PublicTorque }
  | { kind: "checklist"; caption: string | null; progress: { done: number; total: number; percent: number } };

export type PublicShop = {
  slug: string;
  name: string;
  about: string | null;
  /** Kinds of machines and work the shop takes, in its own words. */
  takesIn: string | null;
  logoUrl: string | null;
  location: string | null;
  email: string | null;
  phone: string | null;
};
export type PublicMachine = { kind: MachineKind; kindLabel: string; label: string };
export type PublicStoryCard = { slug: string; title: string; excerpt: string; publishedAt: string; machine: PublicMachine; cover: PublicPhoto | null };
export type PublicStory = PublicStoryCard & { shop: PublicShop; writeUp: NoteDoc | null; items: PublicStoryItem[] };

export const storyPath = (shop: string, story: string) => `/s/${shop}/${story}`;
export function publicPhotoUrl(shop: string, story: string, photo: string, size: "thumb" | "display"): string {
  return `${storyPath(shop, story)}/photos/${photo}/${size}`;
}
export const shopLogoPath = (shop: string) => `/s/${shop}/logo`;
export const PUBLIC_CLIP_FILES = ["video.mp4", "poster.jpg"] as const;
/** A story's clip plays through the story's own route, which checks it is still published. */
export function publicClipUrls(shop: string, story: string, clip: string): { src: string; poster: string } {
  const base = `${storyPath(shop, story)}/clips/${clip}`;
  return { src: `${base}/video.mp4`, poster: `${base}/poster.jpg` };
}
