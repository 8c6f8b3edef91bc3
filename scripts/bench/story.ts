// A published story at Copper Gulch for the story-page LCP budget: a collected job of Ruth Calloway with a
// shared set of three photos (the first the cover), shared notes and the items a curator would pick. The
// demo seed has no story (a story needs the owner's consent), so the bench writes one as given. Photos go
// through the app's own pipeline (processPhoto, storePhotoRenditions into STORAGE_DIR), from a 12 MP
// camera-sized JPEG made here of a few large shapes under lightly blurred noise (sized like a photo, and
// its tiny preview shows shapes as a real one does; no real picture needed).
import type { Knex } from "knex";
import sharp from "sharp";

export const STORY_SLUG = "bench-long-journal";

export async function cameraJpeg(seed: number): Promise<Buffer> {
  const [w, h] = [4032, 3024];
  // A scene's large shapes (floor, bench, wheels, a frame) under the sensor-like noise: a tiny preview of
  // it carries shapes and colours the way one of a real photo does, not one flat colour.
  const shapes: string[] = [
    `<rect width="${w}" height="${h}" fill="rgb(${70 + seed * 25},${88 + seed * 10},${120 - seed * 15})"/>`,
    `<rect y="${h * 0.62}" width="${w}" height="${h * 0.38}" fill="rgb(96,86,74)"/>`,
    `<rect x="${w * 0.12}" y="${h * 0.42}" width="${w * 0.55}" height="${h * 0.12}" rx="60" fill="rgb(150,40,32)"/>`,
    `<circle cx="${w * 0.22}" cy="${h * 0.68}" r="${h * 0.16}" fill="rgb(30,30,34)"/><circle cx="${w * 0.22}" cy="${h * 0.68}" r="${h * 0.07}" fill="rgb(170,170,176)"/>`,
    `<circle cx="${w * 0.62}" cy="${h * 0.68}" r="${h * 0.16}" fill="rgb(30,30,34)"/><circle cx="${w * 0.62}" cy="${h * 0.68}" r="${h * 0.07}" fill="rgb(170,170,176)"/>`,
    `<path d="M ${w * 0.3} ${h * 0.42} L ${w * 0.45} ${h * 0.2} L ${w * 0.58} ${h * 0.42} Z" fill="rgb(210,180,60)"/>`,
    `<rect x="${w * 0.78}" y="${h * 0.1}" width="${w * 0.16}" height="${h * 0.5}" fill="rgb(60,110,80)"/>`,
  ];
  // …and the clutter of a bench at every scale (tools, bolts, rags, edges of parts): a phone-width copy of a
  // real photo keeps detail that pixel noise alone loses when scaled down, so the copy the story page
  // carries inline weighs what a real one does (about 5–10 kB), not the 1–2 kB of flat shapes.
  let x = 0x2545f491 + seed;
  const rand = () => {
    x ^= x << 13;
    x ^= x >>> 17;
    x ^= x << 5;
    return (x >>> 0) / 0x100000000;
  };
  const clutter: string[] = [];
  for (let i = 0; i < 700; i += 1) {
    const size = w * 0.004 * Math.exp(rand() * 3.2); // 16 px to 400 px across, most of them small
    const grey = 30 + rand() * 180; // workshop colours: greys and browns, a few painted parts
    const [cx, cy, c] = [rand() * w, rand() * h, () => Math.floor(grey + (rand() - 0.5) * 80)];
    const fill = `rgb(${c()},${c()},${c()})`;
    clutter.push(
      rand() < 0.5
        ? `<circle cx="${cx}" cy="${cy}" r="${size / 2}" fill="${fill}"/>`
        : `<rect x="${cx}" y="${cy}" width="${size}" height="${size * (0.2 + rand())}" transform="rotate(${rand() * 180} ${cx} ${cy})" fill="${fill}"/>`,
    );
  }
  shapes.splice(2, 0, ...clutter); // behind the machine, in front of the wall and floor
  const scene = await sharp(Buffer.from(`<svg xmlns="http://www.w3.org/2000/svg" width="${w}" height="${h}">${shapes.join("")}</svg>`)).removeAlpha().ensureAlpha(0.6).png().toBuffer();
  return sharp({ create: { width: w, height: h, channels: 3, background: { r: 90 + seed * 20, g: 80, b: 70 }, noise: { type: "gaussian", mean: 110 + seed * 10, sigma: 90 } } })
    .composite([{ input: scene }])
    .blur(0.8)
    .jpeg({ quality: 90 })
    .toBuffer();
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
