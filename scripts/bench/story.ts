// A published story at Copper Gulch for the story-page LCP budget: a collected job of Ruth Calloway with a
// shared set of three photos (the first the cover), shared notes and the items a curator would pick. The
// demo seed has no story (a story needs the owner's consent), so the bench writes one as given. Photos go
// through the app's own pipeline (processPhoto, storePhotoRenditions into STORAGE_DIR), from a 12 MP
// camera-sized JPEG made here of lightly blurred noise (its 1600-px rendition is about 300 kB, like a
// photo; no real picture needed).
import type { Knex } from "knex";
import sharp from "sharp";

export const STORY_SLUG = "bench-long-journal";

async function cameraJpeg(seed: number): Promise<Buffer> {
  const raw = await sharp({ create: { width: 4032, height: 3024, channels: 3, background: { r: 90 + seed * 20, g: 80, b: 70 }, noise: { type: "gaussian", mean: 110 + seed * 10, sigma: 40 } } })
    .blur(0.8)
    .jpeg({ quality: 90 })
    .toBuffer();
  return raw;
}

export async function seedStory(k: Knex, storageDir: string, log: (s: string) => void): Promise<string> {
  const exists = await k("stories").where({ slug: STORY_SLUG, status: "published" }).first("id");
  if (exists) return STORY_SLUG;
  // lib/server/storage.ts reads STORAGE_DIR when it is first used, which is below.
  process.env.STORAGE_DIR = storageDir;
  const { processPhoto, storePhotoRenditions } = await import("../../lib/server/photos");
  const owner = (await k("customers as c")
    .join("shops as s", "s.id", "c.shop_id")
    .join("machines as m", "m.customer_id", "c.id")
    .where({ "s.slug": "copper-gulch", "c.email": "ruth.calloway@mail.test" })
    .first("c.shop_id", "c.id as customer_id", "c.user_id", "m.id as machine_id", "s.next_job_number as number")) as
    | { shop_id: number; customer_id: number; user_id: number | null; machine_id: number; number: number }
    | undefined;
  if (!owner) throw new Error("the demo seed has no Ruth Calloway at Copper Gulch: the story needs her");
  const shopId = Number(owner.shop_id);
  const stored: Awaited<ReturnType<typeof storePhotoRenditions>>[] = [];
  for (let i = 0; i < 3; i += 1) stored.push(await storePhotoRenditions(await processPhoto(await cameraJpeg(i), { name: `bench-${i}.jpg` }), { shopId }));
  log(`  story photos: display ${stored.map((s) => `${s.width}×${s.height} ${(s.bytes / 1024).toFixed(0)} kB`).join(", ")}`);
  const note = (text: string) => JSON.stringify({ type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text }] }] });
  await k.transaction(async (tx) => {
    await tx("shops").where({ id: shopId }).increment("next_job_number", 1);
    const jobId = Number(
      (
        await tx("jobs").insert({
          shop_id: shopId, number: Number(owner.number), public_id: `benchstory${String(owner.number).padStart(6, "0")}`, customer_id: Number(owner.customer_id),
          machine_id: Number(owner.machine_id), status: "picked_up", concern: "Bench: the story of a top-end rebuild",
        })
      )[0],
    );
    const entry = async (kind: string, body: string | null, caption: string | null) =>
      Number((await tx("journal_entries").insert({ shop_id: shopId, job_id: jobId, kind, visibility: "shared", body, caption, shared_at: tx.fn.now(3) }))[0]);
    await entry("note", note("Took the top end apart: the piston skirt was scuffed and the rings had lost their tension."), null);
    const photosEntry = await entry("photos", null, "The cylinder before and after the hone");
    const photoIds: number[] = [];
    for (const [position, s] of stored.entries()) {
      const [id] = await tx("photos").insert({
        public_id: `benchstory${position}${String(owner.number).padStart(11, "0")}`, shop_id: shopId, job_id: jobId, entry_id: photosEntry, position,
        original_name: `bench-${position}.jpg`, display_key: s.displayKey, thumb_key: s.thumbKey, width: s.width, height: s.height, bytes: s.bytes,
      });
      photoIds.push(Number(id));
    }
    await entry("note", note("New piston and rings, gaps checked against the maker's figures, torqued in order. Runs clean and quiet."), null);
    const writeUp = note("A tired top end, taken apart, measured and put back right. Every step was filmed and photographed for the owner.");
    const [storyId] = await tx("stories").insert({
      shop_id: shopId, job_id: jobId, slug: STORY_SLUG, title: "A top end brought back to life", write_up: writeUp, cover_photo_id: photoIds[0],
      status: "published", published_at: tx.fn.now(3),
    });
    const items = [
      { kind: "photos" as const, entry_id: photosEntry, photo_id: null },
      { kind: "photo" as const, entry_id: photosEntry, photo_id: photoIds[1] ?? null },
    ];
    for (const [position, item] of items.entries()) await tx("story_items").insert({ shop_id: shopId, story_id: Number(storyId), position, ...item, caption: null });
    await tx("story_consents").insert({ shop_id: shopId, story_id: Number(storyId), user_id: owner.user_id, name_typed: "Ruth Calloway", decision: "given", ip: "127.0.0.1" });
  });
  return STORY_SLUG;
}
