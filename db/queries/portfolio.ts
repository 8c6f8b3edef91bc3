import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import type { CustomersTable, JobsTable, MachinesTable, PhotosTable, StoriesTable, StoryItemsTable } from "@/db/tables";
import { transaction } from "@/db/transaction";
import { AppError } from "@/lib/errors";
import type { ConsentDecision, StoryItemKind, StoryStatus } from "@/lib/portfolio";
import type { MachineKind } from "@/lib/machine";

// The staff's and the machine owner's side of the portfolio: stories, their items, consent
// decisions and the shop's public profile. Public reads live in ./portfolio-public.ts.

const parseJson = (v: unknown): unknown => (typeof v === "string" ? JSON.parse(v) : (v ?? null));

export type StoryRow = {
  id: number;
  shopId: number;
  jobId: number;
  jobNumber: number;
  jobPublicId: string;
  slug: string;
  title: string;
  writeUp: unknown;
  coverPhotoId: string | null;
  status: StoryStatus;
  version: number;
  publishedAt: Date | null;
  updatedAt: Date;
  machine: { kind: MachineKind; year: number | null; make: string; model: string; serial: string | null };
  customer: { name: string; email: string | null; userId: number | null };
};

const STORY_COLUMNS = [
  "st.id",
  "st.shop_id",
  "st.job_id",
  "st.slug",
  "st.title",
  "st.write_up",
  "st.status",
  "st.version",
  "st.published_at",
  "st.updated_at",
  "cp.public_id as cover_public_id",
  "j.number as job_number",
  "j.public_id as job_public_id",
  "m.kind as machine_kind",
  "m.year as machine_year",
  "m.make as machine_make",
  "m.model as machine_model",
  "m.serial as machine_serial",
  "c.name as customer_name",
  "c.email as customer_email",
  "c.user_id as customer_user_id",
];

function storiesWithJob(k: Knex) {
  return k("stories as st")
    .join("jobs as j", "j.id", "st.job_id")
    .join("machines as m", "m.id", "j.machine_id")
    .join("customers as c", "c.id", "j.customer_id")
    .leftJoin("photos as cp", "cp.id", "st.cover_photo_id");
}

/** A row of STORY_COLUMNS. */
type StoryJoin = Pick<StoriesTable, "id" | "shop_id" | "job_id" | "slug" | "title" | "write_up" | "status" | "version" | "published_at" | "updated_at"> & {
  cover_public_id: string | null;
  job_number: JobsTable["number"];
  job_public_id: JobsTable["public_id"];
  machine_kind: MachinesTable["kind"];
  machine_year: MachinesTable["year"];
  machine_make: MachinesTable["make"];
  machine_model: MachinesTable["model"];
  machine_serial: MachinesTable["serial"];
  customer_name: CustomersTable["name"];
  customer_email: CustomersTable["email"];
  customer_user_id: CustomersTable["user_id"];
};

function toStory(r: StoryJoin): StoryRow {
  return {
    id: Number(r.id),
    shopId: Number(r.shop_id),
    jobId: Number(r.job_id),
    jobNumber: Number(r.job_number),
    jobPublicId: String(r.job_public_id),
    slug: String(r.slug),
    title: String(r.title),
    writeUp: parseJson(r.write_up),
    coverPhotoId: r.cover_public_id ?? null,
    status: r.status,
    version: Number(r.version),
    publishedAt: r.published_at ?? null,
    updatedAt: r.updated_at,
    machine: {
      kind: r.machine_kind,
      year: r.machine_year == null ? null : Number(r.machine_year),
      make: String(r.machine_make),
      model: String(r.machine_model),
      serial: r.machine_serial ?? null,
    },
    customer: { name: String(r.customer_name), email: r.customer_email ?? null, userId: r.customer_user_id == null ? null : Number(r.customer_user_id) },
  };
}

export async function getStory({ shopId, storyId }: { shopId: number; storyId: number }, k: Knex = db()): Promise<StoryRow | null> {
  const row: StoryJoin | undefined = await storiesWithJob(k).where({ "st.shop_id": shopId, "st.id": storyId }).first(STORY_COLUMNS);
  return row ? toStory(row) : null;
}

export async function getStoryForJob({ shopId, jobId }: { shopId: number; jobId: number }, k: Knex = db()): Promise<StoryRow | null> {
  const row: StoryJoin | undefined = await storiesWithJob(k).where({ "st.shop_id": shopId, "st.job_id": jobId }).first(STORY_COLUMNS);
  return row ? toStory(row) : null;
}

export async function listStories({ shopId }: { shopId: number }): Promise<StoryRow[]> {
  const rows: StoryJoin[] = await storiesWithJob(db()).where("st.shop_id", shopId).orderBy("st.updated_at", "desc").limit(500).select(STORY_COLUMNS);
  return rows.map(toStory);
}

export async function slugTaken({ shopId, slug, exceptId }: { shopId: number; slug: string; exceptId?: number }, k: Knex = db()): Promise<boolean> {
  const q = k("stories").where({ shop_id: shopId, slug });
  if (exceptId) q.whereNot("id", exceptId);
  return !!(await q.first("id"));
}

export async function insertStory(
  tx: Knex.Transaction,
  s: { shopId: number; jobId: number; slug: string; title: string; status: StoryStatus; proposedBy: number },
): Promise<number> {
  const [id] = await tx("stories").insert({ shop_id: s.shopId, job_id: s.jobId, slug: s.slug, title: s.title, status: s.status, proposed_by_user_id: s.proposedBy });
  return Number(id);
}

/**
 * Moves a story from one of `from` to `to` in one conditional UPDATE, so two tabs (or the shop
 * publishing while the owner withdraws) can't both win: the loser changes nothing and gets false.
 */
export async function moveStory(
  m: { shopId: number; storyId: number; from: readonly StoryStatus[]; to: StoryStatus; publishedBy?: number },
  k: Knex = db(),
): Promise<boolean> {
  const changes: Knex.DbRecord<StoriesTable> = {
    status: m.to,
    version: k.raw("version + 1"),
    updated_at: k.fn.now(3),
    ...(m.to === "published" ? { published_at: k.fn.now(3), published_by_user_id: m.publishedBy ?? null } : {}),
  };
  const n = await k("stories").where({ shop_id: m.shopId, id: m.storyId }).whereIn("status", m.from).update(changes);
  return Number(n) === 1;
}

export type ItemRow = { kind: StoryItemKind; entryId: number | null; photoId: number | null; momentMs: number | null; caption: string | null };

/** Title, address, write-up, cover and the whole ordered item list, if nobody changed the story since `version`. */
export async function saveCuration(
  tx: Knex.Transaction,
  c: { shopId: number; storyId: number; version: number; title: string; slug: string; writeUp: unknown; coverPhotoId: number | null; items: ItemRow[] },
): Promise<number> {
  const n = await tx("stories")
    .where({ shop_id: c.shopId, id: c.storyId, version: c.version })
    .update({
      title: c.title,
      slug: c.slug,
      write_up: c.writeUp == null ? null : JSON.stringify(c.writeUp),
      cover_photo_id: c.coverPhotoId,
      version: c.version + 1,
      updated_at: tx.fn.now(3),
    });
  if (Number(n) !== 1) throw new AppError("conflict", "Someone changed this story while you were editing. Reload the page to see their changes, then make yours again.");
  await tx("story_items").where({ shop_id: c.shopId, story_id: c.storyId }).delete();
  if (c.items.length) {
    await tx("story_items").insert(
      c.items.map((it, position) => ({
        shop_id: c.shopId,
        story_id: c.storyId,
        position,
        kind: it.kind,
        entry_id: it.entryId,
        photo_id: it.photoId,
        moment_ms: it.momentMs,
        caption: it.caption,
      })),
    );
  }
  return c.version + 1;
}

export type StaffItem = { kind: StoryItemKind; entryId: number | null; photoPublicId: string | null; momentMs: number | null; caption: string | null };

export async function listItems({ shopId, storyId }: { shopId: number; storyId: number }, k: Knex = db()): Promise<StaffItem[]> {
  const rows: (Pick<StoryItemsTable, "kind" | "entry_id" | "moment_ms" | "caption"> & { photo_public_id: string | null })[] = await k("story_items as si")
    .leftJoin("photos as p", "p.id", "si.photo_id")
    .where({ "si.shop_id": shopId, "si.story_id": storyId })
    .orderBy("si.position")
    .select("si.kind", "si.entry_id", "p.public_id as photo_public_id", "si.moment_ms", "si.caption");
  return rows.map((r) => ({
    kind: r.kind,
    entryId: r.entry_id == null ? null : Number(r.entry_id),
    photoPublicId: r.photo_public_id ?? null,
    momentMs: r.moment_ms == null ? null : Number(r.moment_ms),
    caption: r.caption ?? null,
  }));
}

/** Photos of the job's shared, undeleted photo sets, by public id: the only ones a story may show. */
export async function shareablePhotos({ shopId, jobId }: { shopId: number; jobId: number }, k: Knex = db()) {
  const rows: Pick<PhotosTable, "id" | "public_id" | "entry_id">[] = await k("photos as p")
    .join("journal_entries as e", "e.id", "p.entry_id")
    .where({ "p.shop_id": shopId, "p.job_id": jobId, "e.visibility": "shared", "e.kind": "photos" })
    .whereNull("e.deleted_at")
    .select("p.id", "p.public_id", "p.entry_id");
  return new Map(rows.map((r) => [String(r.public_id), { id: Number(r.id), entryId: Number(r.entry_id) }]));
}

/** The job's shared, undeleted entries by id with their kind: what items may point at. */
export async function shareableEntryKinds({ shopId, jobId }: { shopId: number; jobId: number }, k: Knex = db()) {
  const rows = await k("journal_entries").where({ shop_id: shopId, job_id: jobId, visibility: "shared" }).whereNull("deleted_at").whereIn("kind", ["photos", "clip", "torque"]).select("id", "kind");
  return new Map(rows.map((r) => [Number(r.id), String(r.kind)]));
}

export async function insertConsent(
  tx: Knex.Transaction,
  c: { shopId: number; storyId: number; userId: number; name: string; decision: ConsentDecision; ip: string; userAgent: string | null; shownHash: string | null },
): Promise<void> {
  await tx("story_consents").insert({
    shown_hash: c.shownHash,
    shop_id: c.shopId,
    story_id: c.storyId,
    user_id: c.userId,
    name_typed: c.name,
    decision: c.decision,
    ip: c.ip.slice(0, 64),
    user_agent: c.userAgent?.slice(0, 500) ?? null,
  });
}

export type ConsentRow = { decision: ConsentDecision; name: string; at: Date };

export async function listConsents({ shopId, storyId }: { shopId: number; storyId: number }): Promise<ConsentRow[]> {
  const rows = await db()("story_consents").where({ shop_id: shopId, story_id: storyId }).orderBy("id", "desc").limit(50).select("decision", "name_typed", "decided_at");
  return rows.map((r) => ({ decision: r.decision, name: String(r.name_typed), at: r.decided_at }));
}

// ---- the shop's public profile ----

/** Creates or replaces the profile. Returns the logo key it replaced, if any (for the caller to delete). */
export type ProfileChange = {
  shopId: number;
  displayName: string | null;
  about: string | null;
  locationText: string | null;
  takesIn: string | null;
  showLocation: boolean;
  publicEmail: string | null;
  publicPhone: string | null;
  /** undefined keeps the current logo; null removes it. */
  logoKey?: string | null;
};

export async function saveShopProfile(p: ProfileChange): Promise<string | null> {
  return transaction(async (tx) => {
    const before = await tx("shop_profiles").where({ shop_id: p.shopId }).forUpdate().first("logo_key");
    const row = {
      display_name: p.displayName,
      about: p.about,
      location_text: p.locationText,
      takes_in: p.takesIn,
      show_location: p.showLocation,
      public_email: p.publicEmail,
      public_phone: p.publicPhone,
      updated_at: tx.fn.now(3),
      ...(p.logoKey !== undefined ? { logo_key: p.logoKey } : {}),
    };
    if (before) await tx("shop_profiles").where({ shop_id: p.shopId }).update(row);
    else await tx("shop_profiles").insert({ shop_id: p.shopId, ...row });
    const old = before?.logo_key ?? null;
    return p.logoKey !== undefined && old !== p.logoKey ? old : null;
  });
}

/** The story row locked for a decision or a publish, so the two can't cross. */
export async function lockStory(tx: Knex.Transaction, { shopId, storyId }: { shopId: number; storyId: number }) {
  const r = await tx("stories").where({ shop_id: shopId, id: storyId }).forUpdate().first("status", "version");
  return r ? { status: r.status, version: Number(r.version) } : null;
}

export async function latestConsent(k: Knex, { shopId, storyId }: { shopId: number; storyId: number }): Promise<ConsentDecision | null> {
  const r = await k("story_consents").where({ shop_id: shopId, story_id: storyId }).orderBy("id", "desc").first("decision");
  return r ? r.decision : null;
}

/** The content hash the owner's latest "given" answer was made on (null: none, or given before hashes were kept). */
export async function consentedHash(k: Knex, { shopId, storyId }: { shopId: number; storyId: number }): Promise<string | null> {
  const r = await k("story_consents").where({ shop_id: shopId, story_id: storyId, decision: "given" }).orderBy("id", "desc").first("shown_hash");
  return r?.shown_hash ?? null;
}

export async function countItems(k: Knex, { shopId, storyId }: { shopId: number; storyId: number }): Promise<number> {
  const r = await k("story_items").where({ shop_id: shopId, story_id: storyId }).count({ n: "*" }).first();
  return Number(r?.n ?? 0);
}

export async function getCustomerEmail({ shopId, customerId }: { shopId: number; customerId: number }, k: Knex = db()): Promise<string | null> {
  const r = await k("customers").where({ shop_id: shopId, id: customerId }).first("email");
  return r?.email ?? null;
}
