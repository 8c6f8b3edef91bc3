import "server-only";
import {
  type PhotoRow,
  type PublicShopRow,
  type PublishedStoryRow,
  type StoryBodyRows,
  findPublishedStory,
  getPublicShop,
  listPublishedStories,
  loadStoryBody,
  publishedKinds,
} from "@/db/queries/portfolio-public";
import { isTorqueBody, torqueProof } from "@/lib/bench";
import { MACHINE_KINDS, MACHINE_KIND_LABEL, type MachineKind, describeMachine } from "@/lib/machine";
import {
  type PrivateFacts,
  type PublicMachine,
  type PublicPhoto,
  type PublicShop,
  type PublicStory,
  type PublicStoryCard,
  type PublicStoryItem,
  publicClipUrls,
  publicPhotoUrl,
  redactNote,
  redactText,
  shopLogoPath,
  storyPath,
} from "@/lib/portfolio";
import { type NoteDoc, noteExcerpt } from "@/lib/rich-text/note";
import { ids } from "@/lib/server/access";

// Turns published rows into what the public reads. Only what is listed here leaves: no entry
// ids, no job numbers, no prices, no names of people; the owner's name and the serial are
// redacted from every curated word once more, whatever was saved.

const facts = (s: PublishedStoryRow): PrivateFacts => ({ customerName: s.customerName, serial: s.serial });

export function publicShop(row: PublicShopRow): PublicShop {
  return {
    slug: row.slug,
    name: row.displayName ?? row.name,
    about: row.about,
    takesIn: row.takesIn,
    logoUrl: row.logoKey ? shopLogoPath(row.slug) : null,
    location: row.showLocation ? row.locationText : null,
    email: row.publicEmail,
    phone: row.publicPhone,
  };
}

function machineOf(s: PublishedStoryRow): PublicMachine {
  return { kind: s.machine.kind, kindLabel: MACHINE_KIND_LABEL[s.machine.kind], label: describeMachine(s.machine) };
}

function photoOf(shop: string, story: string, p: PhotoRow): PublicPhoto {
  return { id: p.publicId, width: p.width, height: p.height, thumbUrl: publicPhotoUrl(shop, story, p.publicId, "thumb"), displayUrl: publicPhotoUrl(shop, story, p.publicId, "display") };
}

function writeUpOf(s: PublishedStoryRow): NoteDoc | null {
  const doc = s.writeUp as NoteDoc | null;
  return doc && doc.type === "doc" ? redactNote(doc, facts(s)) : null;
}

function cardOf(shopSlug: string, s: PublishedStoryRow, cover: PhotoRow | null): PublicStoryCard {
  const writeUp = writeUpOf(s);
  return {
    slug: s.slug,
    title: redactText(s.title, facts(s)),
    excerpt: writeUp ? noteExcerpt(writeUp, 200) : "",
    publishedAt: s.publishedAt.toISOString(),
    machine: machineOf(s),
    cover: cover ? photoOf(shopSlug, s.slug, cover) : null,
  };
}

function itemsOf(shopSlug: string, rows: StoryBodyRows): PublicStoryItem[] {
  const { story } = rows;
  const caption = (c: string | null) => (c ? redactText(c, facts(story)) : null);
  const out: PublicStoryItem[] = [];
  for (const item of rows.items) {
    if (item.kind === "checklist") {
      if (rows.checklist) out.push({ kind: "checklist", caption: caption(item.caption), progress: rows.checklist });
      continue;
    }
    // An entry that was unshared or deleted since curation simply drops out.
    const entry = item.entryId ? rows.entries.get(item.entryId) : undefined;
    if (!entry) continue;
    if (item.kind === "photos" && entry.kind === "photos") {
      const photos = (rows.photosByEntry.get(item.entryId!) ?? []).map((p) => photoOf(shopSlug, story.slug, p));
      if (photos.length) out.push({ kind: "photos", caption: caption(item.caption), photos });
    } else if (item.kind === "photo" && entry.kind === "photos") {
      const p = item.photoId ? rows.photosById.get(item.photoId) : undefined;
      if (p && p.entryId === item.entryId) out.push({ kind: "photo", caption: caption(item.caption), photo: photoOf(shopSlug, story.slug, p) });
    } else if (item.kind === "clip" && entry.kind === "clip") {
      const clip = rows.clips.get(item.entryId!);
      // Only a playable clip goes public; its error text is for the shop.
      if (clip?.status === "ready" && clip.src) {
        // Served by the story's own route (not the signed-in one); the bench's moment labels stay private.
        const publicClip = { ...clip, ...publicClipUrls(shopSlug, story.slug, clip.id), error: null, ...("moments" in clip ? { moments: [] } : {}) };
        out.push({ kind: "clip", caption: caption(item.caption), clip: publicClip, startSeconds: item.momentMs == null ? null : item.momentMs / 1000 });
      }
    } else if (item.kind === "torque" && entry.kind === "torque" && isTorqueBody(entry.body)) {
      const b = entry.body;
      // The proof, not the bench's free-text note, tool, retorque sequence or "other" lubrication: those were written for the shop.
      out.push({
        kind: "torque",
        caption: caption(item.caption),
        torque: { fastener: redactText(b.fastener, facts(story)), specValue: b.specValue, unit: b.unit, displayUnit: b.displayUnit, proof: torqueProof({ ...b, retorqueSequence: null, lubricationOther: null }), boltCount: b.boltCount, pattern: b.pattern },
      });
    }
  }
  return out;
}

/** The whole public story from its rows (no I/O). */
export function toPublicStory(shop: PublicShopRow, rows: StoryBodyRows): PublicStory {
  return { ...cardOf(shop.slug, rows.story, rows.cover), shop: publicShop(shop), writeUp: writeUpOf(rows.story), items: itemsOf(shop.slug, rows) };
}

/** Builds a published story by id (getPublicStory, once its published row is found). */
export async function buildPublicStory({ shopId, storyId, shopSlug }: { shopId: number; storyId: number; shopSlug: string }): Promise<PublicStory | null> {
  const [shop, rows] = await Promise.all([getPublicShop({ shopSlug }), loadStoryBody({ shopId, storyId })]);
  if (!shop || shop.id !== shopId || !rows) return null;
  return toPublicStory(shop, rows);
}

/**
 * The story exactly as the public page would show it, whatever its status, for the machine's
 * owner to read before they answer. Its photos and clips are the owner's own shared entries, so
 * they come through the signed-in media routes (the public ones serve published stories only).
 */
export async function previewStory({ shopId, storyId, shopSlug }: { shopId: number; storyId: number; shopSlug: string }): Promise<PublicStory | null> {
  const [shop, rows] = await Promise.all([getPublicShop({ shopSlug }), loadStoryBody({ shopId, storyId, anyStatus: true })]);
  if (!shop || shop.id !== shopId || !rows) return null;
  const story = toPublicStory(shop, rows);
  const base = storyPath(shopSlug, story.slug);
  const json = JSON.stringify(story).replaceAll(`${base}/photos/`, "/api/photos/").replaceAll(`${base}/clips/`, "/api/clips/");
  return JSON.parse(json) as PublicStory;
}

const validSlugs = (shopSlug: string, storySlug: string) => ids.shop.safeParse(shopSlug).success && ids.story.safeParse(storySlug).success;

/** The public story, straight from the database (the JSON route; pages go through the cache in portfolio-cache.ts). */
export async function getPublicStory(shopSlug: string, storySlug: string): Promise<PublicStory | null> {
  if (!validSlugs(shopSlug, storySlug)) return null;
  const gate = await findPublishedStory({ shopSlug, storySlug });
  return gate ? buildPublicStory({ shopId: gate.shopId, storyId: gate.storyId, shopSlug }) : null;
}

export async function publicStoryGate(shopSlug: string, storySlug: string) {
  return validSlugs(shopSlug, storySlug) ? findPublishedStory({ shopSlug, storySlug }) : null;
}

export function parseKind(raw: unknown): MachineKind | null {
  return typeof raw === "string" && (MACHINE_KINDS as readonly string[]).includes(raw) ? (raw as MachineKind) : null;
}

/**
 * The shop's public page: its profile and published stories (of one machine kind, when asked).
 * null for an unknown shop, and for a shop that has neither a profile nor a published story.
 */
export async function getPublicShopPage(shopSlug: string, kind: MachineKind | null) {
  if (!ids.shop.safeParse(shopSlug).success) return null;
  const row = await getPublicShop({ shopSlug });
  if (!row) return null;
  const [stories, kinds] = await Promise.all([listPublishedStories({ shopId: row.id, kind }), publishedKinds({ shopId: row.id })]);
  if (!row.hasProfile && !kinds.length) return null;
  return { shop: publicShop(row), stories: stories.map((s) => cardOf(row.slug, s, s.cover)), kinds: MACHINE_KINDS.filter((k) => kinds.includes(k)) };
}
