import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import type { CustomersTable, MachinesTable, Nullable, PhotosTable, ShopProfilesTable, ShopsTable, StoriesTable } from "@/db/tables";
import type { TimelineClip } from "@/lib/journal";
import type { MachineKind } from "@/lib/machine";
import type { StoryItemKind } from "@/lib/portfolio";
import { clipsForEntries } from "./clips";
import { getReassemblyProgress } from "./bench";

// What the public pages read. Every query here asks for status = 'published' itself, so no
// caller can forget it; a photo or entry counts only while its entry is still shared and not
// deleted. Rows carry the owner's name and the serial only so the builder can redact them.

const parseJson = (v: unknown): unknown => (typeof v === "string" ? JSON.parse(v) : (v ?? null));

/**
 * A published story of this shop, by address: the check every render of a public story makes
 * first (the page is then cached until a change drops it: lib/server/portfolio-cache.ts).
 */
export type StoryGate = { storyId: number; shopId: number; version: number };

export async function findPublishedStory({ shopSlug, storySlug }: { shopSlug: string; storySlug: string }, k: Knex = db()): Promise<StoryGate | null> {
  const r: Pick<StoriesTable, "id" | "shop_id" | "version"> | undefined = await k("shops as s")
    .join("stories as st", "st.shop_id", "s.id")
    .where({ "s.slug": shopSlug, "st.slug": storySlug, "st.status": "published" })
    .first("st.id", "st.shop_id", "st.version");
  return r ? { storyId: Number(r.id), shopId: Number(r.shop_id), version: Number(r.version) } : null;
}

/**
 * Whether a shop's public page (storySlug null) or one of its stories is shown: the story is
 * published, or the shop has a profile or a published story. One indexed look, asked by the proxy
 * before every public page (lib/server/public-gate.ts).
 */
export async function publicPageIsShown({ shopSlug, storySlug }: { shopSlug: string; storySlug: string | null }, k: Knex = db()): Promise<boolean> {
  if (storySlug !== null) return (await findPublishedStory({ shopSlug, storySlug }, k)) !== null;
  const r = await k("shops as s")
    .where("s.slug", shopSlug)
    .where((q) =>
      q
        .whereExists((e) => e.select(k.raw("1")).from("shop_profiles as p").whereRaw("p.shop_id = s.id"))
        .orWhereExists((e) => e.select(k.raw("1")).from("stories as st").whereRaw("st.shop_id = s.id").where("st.status", "published")),
    )
    .first("s.id");
  return r !== undefined;
}

export type PublicShopRow = {
  id: number;
  slug: string;
  name: string;
  displayName: string | null;
  about: string | null;
  logoKey: string | null;
  locationText: string | null;
  showLocation: boolean;
  publicEmail: string | null;
  publicPhone: string | null;
  takesIn: string | null;
  hasProfile: boolean;
};

/** A shop and its public profile (the profile's fields null when it has none), by address or id. */
export async function getPublicShop(by: { shopSlug: string } | { shopId: number }, k: Knex = db()): Promise<PublicShopRow | null> {
  type Row = Pick<ShopsTable, "id" | "slug" | "name"> &
    Nullable<Pick<ShopProfilesTable, "display_name" | "about" | "logo_key" | "location_text" | "show_location" | "public_email" | "public_phone" | "takes_in">> & { profile_shop: number | null };
  const r: Row | undefined = await k("shops as s")
    .leftJoin("shop_profiles as p", "p.shop_id", "s.id")
    .where("shopSlug" in by ? { "s.slug": by.shopSlug } : { "s.id": by.shopId })
    .first("s.id", "s.slug", "s.name", "p.shop_id as profile_shop", "p.display_name", "p.about", "p.logo_key", "p.location_text", "p.show_location", "p.public_email", "p.public_phone", "p.takes_in");
  if (!r) return null;
  return {
    id: Number(r.id),
    slug: String(r.slug),
    name: String(r.name),
    displayName: r.display_name ?? null,
    about: r.about ?? null,
    logoKey: r.logo_key ?? null,
    locationText: r.location_text ?? null,
    showLocation: Boolean(r.show_location),
    publicEmail: r.public_email ?? null,
    publicPhone: r.public_phone ?? null,
    takesIn: r.takes_in ?? null,
    hasProfile: r.profile_shop != null,
  };
}

export type PhotoRow = { id: number; publicId: string; entryId: number; width: number; height: number };
export type PublishedStoryRow = {
  id: number;
  slug: string;
  title: string;
  writeUp: unknown;
  publishedAt: Date;
  jobId: number;
  coverPhotoId: number | null;
  machine: { kind: MachineKind; year: number | null; make: string; model: string };
  customerName: string;
  serial: string | null;
};

function publishedStories(k: Knex, shopId: number, anyStatus = false) {
  return k("stories as st")
    .join("jobs as j", "j.id", "st.job_id")
    .join("machines as m", "m.id", "j.machine_id")
    .join("customers as c", "c.id", "j.customer_id")
    .where({ "st.shop_id": shopId, ...(anyStatus ? {} : { "st.status": "published" }) })
    .select("st.id", "st.slug", "st.title", "st.write_up", "st.published_at", "st.job_id", "st.cover_photo_id", "m.kind", "m.year", "m.make", "m.model", "m.serial", "c.name as customer_name");
}

/** A row of publishedStories(). */
type PublishedJoin = Pick<StoriesTable, "id" | "slug" | "title" | "write_up" | "published_at" | "job_id" | "cover_photo_id"> &
  Pick<MachinesTable, "kind" | "year" | "make" | "model" | "serial"> & { customer_name: CustomersTable["name"] };

function toPublished(r: PublishedJoin): PublishedStoryRow {
  return {
    id: Number(r.id),
    slug: String(r.slug),
    title: String(r.title),
    writeUp: parseJson(r.write_up),
    // Published stories always have it (moveStory sets it with the status); a preview reads as if published now.
    publishedAt: (r.published_at as Date | null) ?? new Date(),
    jobId: Number(r.job_id),
    coverPhotoId: r.cover_photo_id == null ? null : Number(r.cover_photo_id),
    machine: { kind: r.kind, year: r.year == null ? null : Number(r.year), make: String(r.make), model: String(r.model) },
    customerName: String(r.customer_name),
    serial: r.serial ?? null,
  };
}

/** Shared, undeleted photos among these ids (covers): the rest are left out. */
async function shownPhotosById(k: Knex, shopId: number, ids: number[]): Promise<Map<number, PhotoRow>> {
  if (!ids.length) return new Map();
  const rows: PhotoColumns[] = await k("photos as p")
    .join("journal_entries as e", "e.id", "p.entry_id")
    .where({ "p.shop_id": shopId, "e.visibility": "shared", "e.kind": "photos" })
    .whereNull("e.deleted_at")
    .whereIn("p.id", ids)
    .select("p.id", "p.public_id", "p.entry_id", "p.width", "p.height");
  return new Map(rows.map((r) => [Number(r.id), toPhotoRow(r)]));
}

type PhotoColumns = Pick<PhotosTable, "id" | "public_id" | "entry_id" | "width" | "height">;
const toPhotoRow = (r: PhotoColumns): PhotoRow => ({ id: Number(r.id), publicId: String(r.public_id), entryId: Number(r.entry_id), width: Number(r.width), height: Number(r.height) });

/** The shop's published stories, newest first, optionally of one machine kind, with their covers. */
export async function listPublishedStories({ shopId, kind }: { shopId: number; kind?: MachineKind | null }, k: Knex = db()) {
  const q = publishedStories(k, shopId).orderBy("st.published_at", "desc").limit(200);
  if (kind) q.where("m.kind", kind);
  const rows: PublishedJoin[] = await q;
  const stories = rows.map(toPublished);
  const covers = await shownPhotosById(k, shopId, stories.flatMap((s) => (s.coverPhotoId ? [s.coverPhotoId] : [])));
  return stories.map((s) => ({ ...s, cover: s.coverPhotoId ? (covers.get(s.coverPhotoId) ?? null) : null }));
}

/** Machine kinds that have at least one published story (the filter buttons). */
export async function publishedKinds({ shopId }: { shopId: number }, k: Knex = db()): Promise<MachineKind[]> {
  const rows: Pick<MachinesTable, "kind">[] = await k("stories as st").join("jobs as j", "j.id", "st.job_id").join("machines as m", "m.id", "j.machine_id").where({ "st.shop_id": shopId, "st.status": "published" }).distinct("m.kind");
  return rows.map((r) => r.kind);
}

export type BodyItem = { kind: StoryItemKind; caption: string | null; momentMs: number | null; entryId: number | null; photoId: number | null };
export type StoryBodyRows = {
  story: PublishedStoryRow;
  cover: PhotoRow | null;
  items: BodyItem[];
  /** Shared, undeleted entries the items point at, with their snapshot bodies. */
  entries: Map<number, { kind: string; body: unknown }>;
  photosByEntry: Map<number, PhotoRow[]>;
  photosById: Map<number, PhotoRow>;
  clips: Map<number, TimelineClip>;
  checklist: { done: number; total: number; percent: number } | null;
};

/** Everything one published story shows, in a fixed number of queries; null when it isn't published (any more). */
/** `anyStatus`: a story not (yet) public too, for the owner's preview before they answer. */
export async function loadStoryBody({ shopId, storyId, anyStatus = false }: { shopId: number; storyId: number; anyStatus?: boolean }, k: Knex = db()): Promise<StoryBodyRows | null> {
  const row: PublishedJoin | undefined = await publishedStories(k, shopId, anyStatus).where("st.id", storyId).first();
  if (!row) return null;
  const story = toPublished(row);
  const items = (await k("story_items").where({ shop_id: shopId, story_id: storyId }).orderBy("position").select("kind", "caption", "moment_ms", "entry_id", "photo_id")).map(
    (r): BodyItem => ({
      kind: r.kind,
      caption: r.caption ?? null,
      momentMs: r.moment_ms == null ? null : Number(r.moment_ms),
      entryId: r.entry_id == null ? null : Number(r.entry_id),
      photoId: r.photo_id == null ? null : Number(r.photo_id),
    }),
  );
  const entryIds = [...new Set(items.flatMap((i) => (i.entryId ? [i.entryId] : [])))];
  const entryRows = entryIds.length
    ? await k("journal_entries").where({ shop_id: shopId, job_id: story.jobId, visibility: "shared" }).whereNull("deleted_at").whereIn("id", entryIds).select("id", "kind", "body")
    : [];
  const entries = new Map(entryRows.map((r) => [Number(r.id), { kind: String(r.kind), body: parseJson(r.body) }]));
  const photoEntryIds = entryRows.filter((r) => r.kind === "photos").map((r) => Number(r.id));
  const photoRows = photoEntryIds.length
    ? (await k("photos").where("shop_id", shopId).whereIn("entry_id", photoEntryIds).orderBy(["entry_id", "position", "id"]).select("id", "public_id", "entry_id", "width", "height")).map(toPhotoRow)
    : [];
  const photosByEntry = new Map<number, PhotoRow[]>();
  for (const p of photoRows) photosByEntry.set(p.entryId, [...(photosByEntry.get(p.entryId) ?? []), p]);
  const photosById = new Map(photoRows.map((p) => [p.id, p]));
  const cover = story.coverPhotoId ? ((await shownPhotosById(k, shopId, [story.coverPhotoId])).get(story.coverPhotoId) ?? null) : null;
  const clipEntryIds = entryRows.filter((r) => r.kind === "clip").map((r) => Number(r.id));
  const clips = await clipsForEntries(k, shopId, clipEntryIds);
  const checklist = items.some((i) => i.kind === "checklist") ? await getReassemblyProgress({ shopId, jobId: story.jobId }) : null;
  return { story, cover, items, entries, photosByEntry, photosById, clips, checklist };
}

/**
 * The storage keys of a photo, only when it is shown by this published story (its cover, one of
 * its photo items, or in a photo set it shows) and its entry is still shared and not deleted.
 */
export async function publicPhotoKeys({ shopSlug, storySlug, photoPublicId }: { shopSlug: string; storySlug: string; photoPublicId: string }, k: Knex = db()) {
  const r: Pick<PhotosTable, "display_key" | "thumb_key"> | undefined = await k("photos as p")
    .join("journal_entries as e", "e.id", "p.entry_id")
    .join("stories as st", (j) => j.on("st.shop_id", "p.shop_id").andOn("st.job_id", "p.job_id"))
    .join("shops as s", "s.id", "st.shop_id")
    .where({ "p.public_id": photoPublicId, "e.visibility": "shared", "e.kind": "photos", "st.status": "published", "st.slug": storySlug, "s.slug": shopSlug })
    .whereNull("e.deleted_at")
    .where((w) =>
      w.whereRaw("st.cover_photo_id = p.id").orWhereExists(
        k("story_items as si")
          .whereRaw("si.story_id = st.id")
          .where((x) => x.where((a) => a.where("si.kind", "photos").whereRaw("si.entry_id = p.entry_id")).orWhere((b) => b.where("si.kind", "photo").whereRaw("si.photo_id = p.id")))
          .select(k.raw("1")),
      ),
    )
    .first("p.display_key", "p.thumb_key");
  return r ? { displayKey: String(r.display_key), thumbKey: String(r.thumb_key) } : null;
}

/** The playback id of a ready clip this published story shows (a clip item whose entry is still shared), or null. */
export async function publicClipPlayback({ shopSlug, storySlug, clipPublicId }: { shopSlug: string; storySlug: string; clipPublicId: string }, k: Knex = db()): Promise<string | null> {
  const r: { playback_id: string | null } | undefined = await k("clips as v")
    .join("journal_entries as e", "e.id", "v.entry_id")
    .join("story_items as si", (j) => j.on("si.entry_id", "v.entry_id").andOnVal("si.kind", "=", "clip"))
    .join("stories as st", "st.id", "si.story_id")
    .join("shops as s", "s.id", "st.shop_id")
    .where({ "v.public_id": clipPublicId, "v.status": "ready", "e.visibility": "shared", "st.status": "published", "st.slug": storySlug, "s.slug": shopSlug })
    .whereNull("e.deleted_at")
    .whereNotNull("v.playback_id")
    .first("v.playback_id");
  return r ? String(r.playback_id) : null;
}

/** Every published story with its shop, for the sitemap. */
export async function listSitemapStories(k: Knex = db()) {
  const rows: (Pick<StoriesTable, "slug" | "updated_at"> & { shop_slug: string })[] = await k("stories as st")
    .join("shops as s", "s.id", "st.shop_id")
    .where("st.status", "published")
    .orderBy("st.published_at", "desc")
    .limit(45_000)
    .select("s.slug as shop_slug", "st.slug", "st.updated_at");
  return rows.map((r) => ({ shop: String(r.shop_slug), slug: String(r.slug), updatedAt: r.updated_at }));
}

/** Shops with a public page: a profile, or at least one published story. */
export async function listPublicShops(k: Knex = db()) {
  const rows: (Pick<ShopsTable, "slug"> & { updated_at: Date | null })[] = await k("shops as s")
    .leftJoin("shop_profiles as p", "p.shop_id", "s.id")
    .where((w) => w.whereNotNull("p.shop_id").orWhereExists(k("stories as st").whereRaw("st.shop_id = s.id").where("st.status", "published").select(k.raw("1"))))
    .limit(5000)
    .select("s.slug", "p.updated_at");
  return rows.map((r) => ({ shop: String(r.slug), updatedAt: r.updated_at ?? null }));
}

/** Whether the job's story is public now (one per job: the unique (shop_id, job_id) key), so a change to its entries must drop the shop's cached public pages. */
export async function jobHasPublishedStory({ shopId, jobId }: { shopId: number; jobId: number }, k: Knex = db()): Promise<boolean> {
  const r = await k("stories").where({ shop_id: shopId, job_id: jobId, status: "published" }).first("id");
  return r !== undefined;
}
