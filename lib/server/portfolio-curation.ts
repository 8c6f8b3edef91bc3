import "server-only";
import { randomBytes } from "node:crypto";
import { getReassemblyProgress } from "@/db/queries/bench";
import { listTimeline } from "@/db/queries/journal";
import { type ItemRow, type StoryRow, listItems, saveCuration, saveShopProfile, shareableEntryKinds, shareablePhotos, slugTaken } from "@/db/queries/portfolio";
import { AppError, type FieldErrors } from "@/lib/errors";
import { ITEM_ENTRY_KIND, type PrivateFacts, type ShopProfileInput, type StoryCuration, privateTextProblems } from "@/lib/portfolio";
import { type NoteDoc, noteText, parseNote } from "@/lib/rich-text/note";
import type { Resolved } from "@/lib/server/access";
import { transaction } from "@/db/transaction";
import { processPhoto } from "@/lib/server/photos";
import { storage } from "@/lib/server/storage";

// Staff curation: which shared entries a story shows and in what order, its words and cover, all
// checked against the job (only its shared, undeleted entries) and against what must never be
// public (the owner's name, the serial or a VIN, prices). Also the shop's public profile.

const factsOf = (story: StoryRow): PrivateFacts => ({ customerName: story.customer.name, serial: story.machine.serial });

function hasText(value: unknown): boolean {
  const stack = [value];
  while (stack.length) {
    const v = stack.pop();
    if (!v || typeof v !== "object") continue;
    const node = v as { text?: unknown; content?: unknown };
    if (typeof node.text === "string" && node.text.trim()) return true;
    if (Array.isArray(node.content)) stack.push(...node.content);
  }
  return false;
}

/** The write-up from the editor's JSON string: null when left empty, else checked by parseNote. */
function writeUpFrom(raw: string | undefined): NoteDoc | null {
  if (!raw?.trim()) return null;
  let json: unknown;
  try {
    json = JSON.parse(raw);
  } catch {
    throw new AppError("invalid", "The write-up couldn't be read; reload the page.", { writeUp: ["The write-up couldn't be read; reload the page."] });
  }
  return hasText(json) ? parseNote(json, { field: "writeUp" }) : null;
}

function checkWords(fields: FieldErrors, key: string, text: string | null | undefined, facts: PrivateFacts, what: string) {
  if (!text) return;
  const problems = privateTextProblems(text, facts);
  if (problems.length) fields[key] = [`${what} ${problems.join(", ")}: the public page never shows it.`];
}

/** Saves title, address, write-up, cover and items in one go, if the story is still at `version`. */
export async function curateStory({ story }: Resolved<"story">, input: StoryCuration): Promise<StoryRow & { previousSlug: string }> {
  const facts = factsOf(story);
  const fields: FieldErrors = {};
  const writeUp = writeUpFrom(input.writeUp);
  checkWords(fields, "title", input.title, facts, "The title");
  checkWords(fields, "writeUp", writeUp ? noteText(writeUp) : null, facts, "The write-up");
  input.items.forEach((it, i) => checkWords(fields, `items.${i}.caption`, it.caption, facts, `Item ${i + 1}'s caption`));

  const key = { shopId: story.shopId, jobId: story.jobId };
  const [entries, photos] = await Promise.all([shareableEntryKinds(key), shareablePhotos(key)]);
  const items: ItemRow[] = [];
  let checklists = 0;
  input.items.forEach((it, i) => {
    const at = `items.${i}`;
    if (it.kind === "checklist") {
      if (++checklists > 1) fields[at] = ["The reassembly progress can appear once."];
      items.push({ kind: "checklist", entryId: null, photoId: null, momentMs: null, caption: it.caption });
      return;
    }
    if (!it.entryId || entries.get(it.entryId) !== ITEM_ENTRY_KIND[it.kind]) {
      fields[at] = [`Item ${i + 1} isn't a shared entry of this job (it may have been unshared or deleted). Remove it.`];
      return;
    }
    let photoId: number | null = null;
    if (it.kind === "photo") {
      const photo = it.photoId ? photos.get(it.photoId) : undefined;
      if (!photo || photo.entryId !== it.entryId) {
        fields[at] = [`Item ${i + 1}: pick a photo of that set.`];
        return;
      }
      photoId = photo.id;
    }
    const momentMs = it.kind === "clip" && it.momentSeconds != null ? Math.round(it.momentSeconds * 1000) : null;
    items.push({ kind: it.kind, entryId: it.entryId, photoId, momentMs, caption: it.caption });
  });
  const cover = input.cover ? photos.get(input.cover) : undefined;
  if (input.cover && !cover) fields.cover = ["Pick the cover from this job's shared photos."];
  if (input.slug !== story.slug && (await slugTaken({ shopId: story.shopId, slug: input.slug, exceptId: story.id }))) {
    fields.slug = ["Another story of this shop already uses that address."];
  }
  if (Object.keys(fields).length) throw new AppError("invalid", "Some fields need attention.", fields);

  await transaction((tx) =>
    saveCuration(tx, { shopId: story.shopId, storyId: story.id, version: input.version, title: input.title, slug: input.slug, writeUp, coverPhotoId: cover?.id ?? null, items }),
  );
  return { ...story, title: input.title, slug: input.slug, version: input.version + 1, previousSlug: story.slug };
}

/**
 * Checked again before publishing, against the owner's name and serial as they are now: why the
 * saved words can't go public, or null when they can.
 */
export async function curationProblems(story: StoryRow): Promise<string | null> {
  const facts = factsOf(story);
  const items = await listItems({ shopId: story.shopId, storyId: story.id });
  const texts: [string, string | null][] = [
    ["the title", story.title],
    ["the write-up", story.writeUp && hasText(story.writeUp) ? noteText(story.writeUp as NoteDoc) : null],
    ...items.map((it, i): [string, string | null] => [`item ${i + 1}'s caption`, it.caption]),
  ];
  for (const [what, text] of texts) {
    const problems = text ? privateTextProblems(text, facts) : [];
    if (problems.length) return `${what} ${problems.join(", ")}. Edit it first.`;
  }
  return null;
}

/** What the curation page offers: the job's shared photo sets, clips and torque records, and the reassembly progress. */
export async function curationChoices(story: StoryRow) {
  const page = await listTimeline({ shopId: story.shopId, jobId: story.jobId, audience: "owner", order: "asc", limit: 500 });
  const entries = page.entries.filter((e) => e.kind === "photos" || e.kind === "clip" || e.kind === "torque");
  const checklist = await getReassemblyProgress({ shopId: story.shopId, jobId: story.jobId });
  return { entries, checklist };
}

const LOGO_MAX_BYTES = 5 * 1024 * 1024;

/** The shop owner's public profile, with an optional new logo (checked and re-encoded like any photo). */
export async function saveProfile({ shop }: Resolved<"shop">, input: ShopProfileInput, logo: File | null) {
  let logoKey: string | null | undefined = input.removeLogo ? null : undefined;
  if (logo && logo.size > 0) {
    if (logo.size > LOGO_MAX_BYTES) throw new AppError("invalid", "The logo must be under 5 MB.", { logo: ["The logo must be under 5 MB."] });
    const processed = await processPhoto(Buffer.from(await logo.arrayBuffer()), { name: logo.name }).catch((error: unknown) => {
      if (error instanceof AppError) throw new AppError("invalid", error.message, { logo: [error.message] });
      throw error;
    });
    logoKey = `shops/${shop.id}/logo/${randomBytes(12).toString("hex")}.jpg`;
    await storage().put(logoKey, processed.thumb.data, processed.thumb.contentType);
  }
  const replaced = await saveShopProfile({ shopId: shop.id, displayName: input.displayName, about: input.about, locationText: input.locationText, takesIn: input.takesIn, showLocation: input.showLocation, publicEmail: input.publicEmail, publicPhone: input.publicPhone, logoKey });
  if (replaced) await storage().delete(replaced).catch(() => undefined);
  return { shop };
}
