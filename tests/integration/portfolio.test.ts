import crypto from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { NextRequest } from "next/server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { GET as storyJson } from "@/app/api/public/stories/[shop]/[story]/route";
import { GET as storyPhoto } from "@/app/(public)/s/[shop]/[story]/photos/[photo]/[size]/route";
import { GET as storyClip } from "@/app/(public)/s/[shop]/[story]/clips/[clip]/[file]/route";
import { GET as shopLogo } from "@/app/(public)/s/[shop]/logo/route";
import exifr from "exifr";
import { createClipEntry } from "@/db/queries/clips";
import { insertEntry } from "@/db/queries/entries";
import { getStory, listItems } from "@/db/queries/portfolio";
import { jobHasPublishedStory } from "@/db/queries/portfolio-public";
import { StoryView } from "@/components/portfolio/story-view";
import type { Action, Actor } from "@/lib/permissions";
import type { PublicStory } from "@/lib/portfolio";
import { askOwner, decideConsent, proposeStory, publishStory, reaskIfChanged, storyContentHash, unpublishStory } from "@/lib/server/portfolio";
import { curateStory, saveProfile } from "@/lib/server/portfolio-curation";
import { shopProfileSchema } from "@/lib/portfolio";
import { getPublicShopPage, getPublicStory, publicStoryGate } from "@/lib/server/portfolio-public";
import { publicPageShown } from "@/lib/server/public-gate";
import { storage } from "@/lib/server/storage";
import { access } from "@/lib/server/access";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";

type Shop = Awaited<ReturnType<typeof makeShop>>;
const staff = (shop: Shop, role: "owner" | "technician" | "service_writer"): Actor => ({
  userId: shop.staff[role]!.id,
  email: shop.staff[role]!.email,
  name: role,
  memberships: [{ shopId: shop.id, shopSlug: shop.slug, shopName: shop.slug, role }],
});
const meta = { ip: "203.0.113.9", userAgent: "vitest portfolio" };
const doc = (text: string) => JSON.stringify({ type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text }] }] });
const OWNER_NAME = "Odile Varnakova";
const SERIAL = "QX7-20-555123";

describe("public portfolio", () => {
  let k: Knex;
  let shop: Shop;
  let uploads: string;
  let owner: Actor;
  let stranger: Actor;
  let jobPublicId: string;
  let jobRowId = 0;
  let openJobPublicId: string;
  const ids = { sharedPhotos: 0, hiddenPhotos: 0, hiddenNote: 0, torque: 0, clip: 0, otherShared: 0 };
  const photo = { shown: "", hidden: "", notInStory: "" };

  async function addPhotoEntry(jobId: number, visibility: "shop" | "shared", count: number) {
    const entryId = await insertEntry(k, { shopId: shop.id, jobId, kind: "photos", authorId: shop.staff.technician!.id, visibility, caption: `Photos for ${OWNER_NAME}` });
    const made: string[] = [];
    for (let position = 0; position < count; position++) {
      const publicId = crypto.randomBytes(16).toString("base64url").slice(0, 22);
      const key = `shops/${shop.id}/photos/${crypto.randomBytes(8).toString("hex")}`;
      await storage().put(`${key}/display.jpg`, Buffer.from("display-bytes"), "image/jpeg");
      await storage().put(`${key}/thumb.jpg`, Buffer.from("thumb-bytes"), "image/jpeg");
      await k("photos").insert({ public_id: publicId, shop_id: shop.id, job_id: jobId, entry_id: entryId, position, display_key: `${key}/display.jpg`, thumb_key: `${key}/thumb.jpg`, width: 800, height: 600, bytes: 13 });
      made.push(publicId);
    }
    return { entryId, photos: made };
  }

  const json = (slug: string) => storyJson(new NextRequest(`http://app.test/api/public/stories/${shop.slug}/${slug}`), { params: Promise.resolve({ shop: shop.slug, story: slug }) });
  const image = (slug: string, id: string) =>
    storyPhoto(new NextRequest(`http://app.test/s/${shop.slug}/${slug}/photos/${id}/display`), { params: Promise.resolve({ shop: shop.slug, story: slug, photo: id, size: "display" }) });

  const video = (slug: string, id: string) =>
    storyClip(new NextRequest(`http://app.test/s/${shop.slug}/${slug}/clips/${id}/video.mp4`), { params: Promise.resolve({ shop: shop.slug, story: slug, clip: id, file: "video.mp4" }) });

  beforeAll(async () => {
    k = testKnex();
    uploads = fs.mkdtempSync(path.join(os.tmpdir(), "benchside-portfolio-"));
    process.env.STORAGE_DIR = uploads;
    process.env.MUX_TOKEN_ID ??= "test-token";
    process.env.MUX_TOKEN_SECRET ??= "test-secret";
    process.env.VIDEO_PLAYBACK_URL = "http://127.0.0.1:1/media/{id}/video.mp4";
    process.env.VIDEO_POSTER_URL = "http://127.0.0.1:1/media/{id}/poster.jpg";
    shop = await makeShop(k, { label: "portfolio", roles: ["owner", "service_writer", "technician"] });
    const email = `odile.${shop.slug}@mail.test`;
    const [userId] = await k("users").insert({ email, name: OWNER_NAME });
    owner = { userId: Number(userId), email, name: OWNER_NAME, memberships: [] };
    const [otherId] = await k("users").insert({ email: `someone.${shop.slug}@mail.test`, name: "Someone Else" });
    stranger = { userId: Number(otherId), email: `someone.${shop.slug}@mail.test`, name: "Someone Else", memberships: [] };
    const made = await makeCustomerWithJobs(k, shop.id, { name: OWNER_NAME, email, userId: Number(userId), serial: SERIAL, statuses: ["picked_up", "in_progress"] });
    const [jobId, openJobId] = made.jobIds as [number, number];
    jobRowId = jobId;
    jobPublicId = String((await k("jobs").where({ id: jobId }).first("public_id"))!.public_id);
    openJobPublicId = String((await k("jobs").where({ id: openJobId }).first("public_id"))!.public_id);

    const shared = await addPhotoEntry(jobId, "shared", 2);
    const hidden = await addPhotoEntry(jobId, "shop", 1);
    const other = await addPhotoEntry(jobId, "shared", 1);
    ids.sharedPhotos = shared.entryId;
    ids.hiddenPhotos = hidden.entryId;
    ids.otherShared = other.entryId;
    [photo.shown, photo.hidden, photo.notInStory] = [shared.photos[0]!, hidden.photos[0]!, other.photos[0]!];
    ids.hiddenNote = await insertEntry(k, { shopId: shop.id, jobId, kind: "note", authorId: null, visibility: "shop", body: JSON.parse(doc("Quoted $480.00 to the owner")) });
    ids.torque = await insertEntry(k, {
      shopId: shop.id,
      jobId,
      kind: "torque",
      authorId: null,
      visibility: "shared",
      body: { fastener: "Front axle nut", specValue: 70, unit: "lbf_ft", appliedValue: 70, tool: "Shop wrench 7", passPercents: [30, 60, 100], boltCount: null, pattern: null, note: "Owner paid $12.50 extra", displayUnit: "nm" },
    });
    ({ entryId: ids.clip } = await createClipEntry({ shopId: shop.id, jobId, userId: shop.staff.technician!.id, uploadId: `up_${crypto.randomBytes(6).toString("hex")}`, publicId: crypto.randomBytes(16).toString("base64url").slice(0, 22), name: "idle.mp4", bytes: 10, caption: null, visibility: "shared" }));
    await k("clips").where({ entry_id: ids.clip }).update({ status: "ready", playback_id: "pb-portfolio-1", duration_seconds: 3.2, aspect_ratio: "16:9" });
  });
  afterAll(async () => {
    await k?.destroy();
    fs.rmSync(uploads, { recursive: true, force: true });
  });

  let storyId = 0;
  let slug = "";
  // What the portfolio actions declare (app/(staff)/shop/[shop]/portfolio/actions.ts, app/(owner)/my/jobs/[job]/portfolio/actions.ts),
  // resolved and authorised as the action wrapper does (lib/server/access.ts).
  const onJob = (actor: Actor, publicId: string, permission: Action) => access(actor, "job", publicId, permission);
  const onStory = (actor: Actor, permission: Action) => access(actor, "story", storyId, permission, { shop: shop.slug });
  const onShop = (actor: Actor) => access(actor, "shop", shop.slug, "shop:manage-settings");
  const hashNow = async () => storyContentHash((await getStory({ shopId: shop.id, storyId }))!);
  /** The saved items as the curation form would post them back. */
  const curatedItems = async () =>
    (await listItems({ shopId: shop.id, storyId })).map((it) => ({ kind: it.kind, entryId: it.entryId, photoId: it.photoPublicId ?? undefined, momentSeconds: it.momentMs == null ? null : it.momentMs / 1000, caption: it.caption }));

  it("staff propose only collected jobs; the desk may, the bench may not; nobody is asked before the story is written", async () => {
    await expect(onJob(staff(shop, "technician"), jobPublicId, "portfolio:propose")).rejects.toMatchObject({ code: "forbidden" });
    await expect(proposeStory(staff(shop, "service_writer"), await onJob(staff(shop, "service_writer"), openJobPublicId, "portfolio:propose"))).rejects.toMatchObject({ code: "conflict" });
    const { story, created } = await proposeStory(staff(shop, "service_writer"), await onJob(staff(shop, "service_writer"), jobPublicId, "portfolio:propose"));
    expect([created, story.status]).toEqual([true, "proposed"]);
    storyId = story.id;
    slug = story.slug;
    // Twice is the same story; no mail either way, and nothing to ask about while the story is empty.
    expect((await proposeStory(staff(shop, "owner"), await onJob(staff(shop, "owner"), jobPublicId, "portfolio:propose"))).created).toBe(false);
    await expect(askOwner(await onStory(staff(shop, "service_writer"), "portfolio:curate"))).rejects.toMatchObject({ code: "conflict", message: expect.stringMatching(/Add at least one/) });
    expect(await k("outbox").where({ dedupe_scope: shop.id }).where("dedupe_key", "like", "portfolio-consent:%")).toHaveLength(0);
    // The owner can't agree to a story nobody has asked them about yet.
    await expect(decideConsent(owner, await onJob(owner, jobPublicId, "portfolio:consent"), { decision: "given", name: OWNER_NAME, shownHash: await hashNow() }, meta)).rejects.toMatchObject({ code: "conflict" });
  });

  it("curation takes only this job's shared entries, and no owner's name, serial or price in the words", async () => {
    const writer = staff(shop, "service_writer");
    const base = { story: storyId, version: 1, slug: "axle-and-brakes", writeUp: doc("Front end rebuilt, axle nut torqued in three passes."), cover: photo.shown };
    const items = [
      { kind: "photos" as const, entryId: ids.sharedPhotos, caption: "Before and after" },
      { kind: "clip" as const, entryId: ids.clip, momentSeconds: 1.5, caption: null },
      { kind: "torque" as const, entryId: ids.torque, caption: null },
    ];
    await expect(curateStory(await onStory(writer, "portfolio:curate"), { ...base, title: `${OWNER_NAME.split(" ")[0]}'s ATV`, items })).rejects.toMatchObject({ code: "invalid", fields: { title: [expect.stringMatching(/owner's name/)] } });
    await expect(curateStory(await onStory(writer, "portfolio:curate"), { ...base, title: `Serial ${SERIAL}`, items })).rejects.toMatchObject({ fields: { title: [expect.stringMatching(/serial/)] } });
    await expect(curateStory(await onStory(writer, "portfolio:curate"), { ...base, title: "Axle job", items: [{ ...items[0]!, caption: "All done for $240" }] })).rejects.toMatchObject({ fields: { "items.0.caption": [expect.stringMatching(/price/)] } });
    await expect(curateStory(await onStory(writer, "portfolio:curate"), { ...base, title: "Axle job", items: [{ kind: "photos", entryId: ids.hiddenPhotos, caption: null }] })).rejects.toMatchObject({ fields: { "items.0": [expect.stringMatching(/isn't a shared entry/)] } });
    await expect(curateStory(await onStory(writer, "portfolio:curate"), { ...base, title: "Axle job", cover: photo.hidden, items })).rejects.toMatchObject({ fields: { cover: [expect.any(String)] } });
    await expect(onStory(staff(shop, "technician"), "portfolio:curate")).rejects.toMatchObject({ code: "forbidden" });
    const saved = await curateStory(await onStory(writer, "portfolio:curate"), { ...base, title: "Front axle and brakes, back on the trail", items });
    slug = saved.slug;
    expect(saved.version).toBe(2);
    // Saving from a stale form is refused rather than silently overwriting.
    await expect(curateStory(await onStory(writer, "portfolio:curate"), { ...base, title: "Stale", items })).rejects.toMatchObject({ code: "conflict" });

    // Written: the owner is asked by e-mail about this version, once.
    expect((await askOwner(await onStory(writer, "portfolio:curate"))).status).toBe("consent_requested");
    const mail = await k("outbox").where({ dedupe_scope: shop.id, dedupe_key: `portfolio-consent:${storyId}:${(await hashNow()).slice(0, 16)}` }).first();
    expect(mail?.to_email).toBe(owner.email);
    expect(mail?.html).toContain(`/my/jobs/${jobPublicId}/portfolio`);
    await expect(askOwner(await onStory(writer, "portfolio:curate"))).rejects.toMatchObject({ code: "conflict" });
  });

  it("a story can't be published without the owner's consent, and only the shop owner publishes", async () => {
    await expect(publishStory(staff(shop, "owner"), await onStory(staff(shop, "owner"), "portfolio:publish"))).rejects.toMatchObject({ code: "conflict", message: expect.stringMatching(/hasn't answered/) });
    await expect(onStory(staff(shop, "service_writer"), "portfolio:publish")).rejects.toMatchObject({ code: "forbidden" });
    // A status forced by hand without a consent record still doesn't publish.
    await k("stories").where({ id: storyId }).update({ status: "consented" });
    await expect(publishStory(staff(shop, "owner"), await onStory(staff(shop, "owner"), "portfolio:publish"))).rejects.toMatchObject({ code: "conflict" });
    await k("stories").where({ id: storyId }).update({ status: "consent_requested" });
    expect(await getPublicStory(shop.slug, slug)).toBeNull();
    // The proxy's look (lib/server/public-gate.ts) agrees: no page yet, for the story or the shop
    // (no profile, nothing published), nor for a made-up shop or story.
    expect(await publicPageShown({ shop: shop.slug, story: slug })).toBe(false);
    expect(await publicPageShown({ shop: shop.slug, story: null })).toBe(false);
    expect(await publicPageShown({ shop: "no-such-shop-here", story: null })).toBe(false);
    expect((await json(slug)).status).toBe(404);
  });

  it("only the machine's owner answers, with a typed name, time, address and browser on record", async () => {
    await expect(onJob(stranger, jobPublicId, "portfolio:consent")).rejects.toMatchObject({ code: "not_found" });
    await expect(onJob(staff(shop, "owner"), jobPublicId, "portfolio:consent")).rejects.toMatchObject({ code: "forbidden" });
    await expect(decideConsent(owner, await onJob(owner, jobPublicId, "portfolio:consent"), { decision: "withdrawn", name: OWNER_NAME }, meta)).rejects.toMatchObject({ code: "conflict" });
    await expect(decideConsent(owner, await onJob(owner, jobPublicId, "portfolio:consent"), { decision: "given", name: "  " }, meta)).rejects.toMatchObject({ code: "invalid" });
    // Agreeing binds to the version shown: a page opened before the last save is sent back to read it again.
    await expect(decideConsent(owner, await onJob(owner, jobPublicId, "portfolio:consent"), { decision: "given", name: OWNER_NAME, shownHash: "0".repeat(64) }, meta)).rejects.toMatchObject({ code: "conflict", message: expect.stringMatching(/changed the story/) });
    const shown = await hashNow();
    expect((await decideConsent(owner, await onJob(owner, jobPublicId, "portfolio:consent"), { decision: "given", name: OWNER_NAME, shownHash: shown }, meta)).status).toBe("consented");
    const row = (await k("story_consents").where({ story_id: storyId }).orderBy("id", "desc").first())!;
    expect([row.decision, row.name_typed, row.ip, row.user_agent, row.user_id, row.shown_hash]).toEqual(["given", OWNER_NAME, meta.ip, meta.userAgent, owner.userId, shown]);
    expect(row.decided_at).toBeInstanceOf(Date);
  });

  let published: PublicStory;
  let clipId = "";

  it("published, the public JSON and HTML hold no owner's name, serial, prices or shop-only entries", async () => {
    expect((await publishStory(staff(shop, "owner"), await onStory(staff(shop, "owner"), "portfolio:publish"))).status).toBe("published");
    const res = await json(slug);
    expect(res.status).toBe(200);
    const text = await res.text();
    published = JSON.parse(text) as PublicStory;
    expect(published.items.map((i) => i.kind)).toEqual(["photos", "clip", "torque"]);
    expect(published.cover?.id).toBe(photo.shown);
    const html = renderToStaticMarkup(createElement(StoryView, { story: published }));
    expect(html).toContain("Front axle and brakes, back on the trail");
    expect(html).toContain("Front axle nut");
    for (const out of [text, html]) {
      for (const secret of [OWNER_NAME, OWNER_NAME.split(" ")[1]!, SERIAL, owner.email, jobPublicId, photo.hidden, photo.notInStory, "Shop wrench 7", "Photos for"]) expect(out).not.toContain(secret);
      expect(out).not.toMatch(/\$\s?\d|12\.50|480/); // no price, not even from the torque record's bench note
    }
    // No entry id of any kind leaves: not as a value, not as a key.
    expect(text).not.toMatch(/"(entryId|entry_id|jobId|job_id|shopId|shop_id)"/);
    const numbers = [...text.matchAll(/:(\d+)(?=[,}\]])/g)].map((m) => Number(m[1]));
    // (Photo sizes and torque figures are the only numbers the story itself carries.)
    const shown = new Set([800, 600, 70, 30, 60, 100]);
    for (const id of [ids.hiddenPhotos, ids.hiddenNote, ids.otherShared].filter((n) => !shown.has(n))) expect(numbers).not.toContain(id);
    // Photos: only those the story shows, through the public route.
    expect((await image(slug, photo.shown)).status).toBe(200);
    expect((await image(slug, photo.hidden)).status).toBe(404);
    expect((await image(slug, photo.notInStory)).status).toBe(404);
    // The clip plays through the story's own route: past the check, on to the video service
    // (unreachable in this test, so 503); the signed-in clip route is never linked.
    const clip = published.items.find((i) => i.kind === "clip");
    expect(clip?.kind === "clip" && clip.clip.src).toBe(`/s/${shop.slug}/${slug}/clips/${clip?.kind === "clip" ? clip.clip.id : ""}/video.mp4`);
    expect(text).not.toContain("/api/");
    clipId = clip?.kind === "clip" ? clip.clip.id : "";
    expect((await video(slug, clipId)).status).toBe(503);
    const page = await getPublicShopPage(shop.slug, null);
    expect(page?.stories.map((s) => s.slug)).toEqual([slug]);
    expect(await publicPageShown({ shop: shop.slug, story: slug })).toBe(true);
    expect(await publicPageShown({ shop: shop.slug, story: null })).toBe(true);
    expect(await publicPageShown({ shop: shop.slug, story: `${slug}-not-this-one` })).toBe(false);
    // An edit to this job's entries must drop the shop's cached public pages (lib/server/portfolio-cache.ts).
    expect(await jobHasPublishedStory({ shopId: shop.id, jobId: jobRowId })).toBe(true);
  });

  it("withdrawing consent makes the story 404 at once: JSON, page loader, photos, grid; it can't be republished", async () => {
    expect((await decideConsent(owner, await onJob(owner, jobPublicId, "portfolio:consent"), { decision: "withdrawn", name: OWNER_NAME }, meta)).status).toBe("withdrawn");
    expect((await json(slug)).status).toBe(404);
    expect(await publicStoryGate(shop.slug, slug)).toBeNull();
    expect(await publicPageShown({ shop: shop.slug, story: slug })).toBe(false);
    expect((await image(slug, photo.shown)).status).toBe(404);
    expect((await video(slug, clipId)).status).toBe(404);
    expect((await getPublicShopPage(shop.slug, null))?.stories ?? []).toEqual([]);
    expect(await jobHasPublishedStory({ shopId: shop.id, jobId: jobRowId })).toBe(false);
    await expect(publishStory(staff(shop, "owner"), await onStory(staff(shop, "owner"), "portfolio:publish"))).rejects.toMatchObject({ code: "conflict", message: expect.stringMatching(/withdrew/) });
    const decisions = await k("story_consents").where({ story_id: storyId }).orderBy("id").pluck("decision");
    expect(decisions).toEqual(["given", "withdrawn"]);
  });

  it("the owner may agree again; the shop then republishes, and can take it down itself", async () => {
    await decideConsent(owner, await onJob(owner, jobPublicId, "portfolio:consent"), { decision: "given", name: OWNER_NAME, shownHash: await hashNow() }, meta);
    await publishStory(staff(shop, "owner"), await onStory(staff(shop, "owner"), "portfolio:publish"));
    expect((await json(slug)).status).toBe(200);
    // An entry unshared after curation drops out of the public story by itself.
    await k("journal_entries").where({ id: ids.torque }).update({ visibility: "shop" });
    expect((await getPublicStory(shop.slug, slug))?.items.map((i) => i.kind)).toEqual(["photos", "clip"]);
    await unpublishStory(await onStory(staff(shop, "service_writer"), "portfolio:curate"));
    expect((await json(slug)).status).toBe(404);
    expect(await publicPageShown({ shop: shop.slug, story: slug })).toBe(false);
  });

  it("words changed after the owner agreed go back to the owner: off the public site, asked again, published only once they agree", async () => {
    const desk = staff(shop, "service_writer");
    // Taken down by the shop in the test before, the owner's consent standing: published again
    // (with the torque record shared again, so the curation form posts back only shared entries).
    await k("journal_entries").where({ id: ids.torque }).update({ visibility: "shared" });
    await publishStory(staff(shop, "owner"), await onStory(staff(shop, "owner"), "portfolio:publish"));
    expect((await json(slug)).status).toBe(200);
    const before = (await getStory({ shopId: shop.id, storyId }))!;
    // Saving the same words again changes nothing.
    const same = await curateStory(await onStory(desk, "portfolio:curate"), { story: storyId, version: before.version, title: before.title, slug: before.slug, writeUp: JSON.stringify(before.writeUp), cover: photo.shown, items: await curatedItems() });
    expect(await reaskIfChanged(same)).toBe(false);
    expect((await json(slug)).status).toBe(200);
    // New words: the story leaves the public site and the owner is asked about the new version.
    const changed = await curateStory(await onStory(desk, "portfolio:curate"), { story: storyId, version: same.version, title: "Front axle, brakes and a new chain", slug: before.slug, writeUp: JSON.stringify(before.writeUp), cover: photo.shown, items: await curatedItems() });
    expect(await reaskIfChanged(changed)).toBe(true);
    expect((await getStory({ shopId: shop.id, storyId }))!.status).toBe("consent_requested");
    expect((await json(slug)).status).toBe(404);
    expect(await k("outbox").where({ dedupe_scope: shop.id, dedupe_key: `portfolio-consent:${storyId}:${(await hashNow()).slice(0, 16)}` }).first()).toBeTruthy();
    await expect(publishStory(staff(shop, "owner"), await onStory(staff(shop, "owner"), "portfolio:publish"))).rejects.toMatchObject({ code: "conflict" });
    await decideConsent(owner, await onJob(owner, jobPublicId, "portfolio:consent"), { decision: "given", name: OWNER_NAME, shownHash: await hashNow() }, meta);
    expect((await publishStory(staff(shop, "owner"), await onStory(staff(shop, "owner"), "portfolio:publish"))).status).toBe("published");
  });

  it("the shop owner's profile: who may edit it, what shows, and a logo kept without its photo metadata", async () => {
    const form = { shop: shop.slug, displayName: "Test Gulch Works", about: "Two bays.", locationText: "By the old mill", publicEmail: "Desk@Shop.test", publicPhone: "+1 555 010 0000" };
    const input = shopProfileSchema.parse(form);
    expect(input.showLocation).toBe(false);
    expect(input.publicEmail).toBe("desk@shop.test");
    expect(shopProfileSchema.safeParse({ ...form, publicEmail: "not mail" }).success).toBe(false);
    await expect(onShop(staff(shop, "service_writer"))).rejects.toMatchObject({ code: "forbidden" });
    // A photo with GPS in its EXIF (tests/fixtures/photos/make-fixtures.ts) as the logo.
    const gps = fs.readFileSync(path.join(__dirname, "..", "fixtures", "photos", "gps.jpg"));
    expect(await exifr.gps(gps)).toBeTruthy();
    await saveProfile(await onShop(staff(shop, "owner")), input, new File([new Uint8Array(gps)], "logo.jpg", { type: "image/jpeg" }));
    const page = await getPublicShopPage(shop.slug, null);
    // A profile alone is a page (nothing is published at this point).
    expect(await publicPageShown({ shop: shop.slug, story: null })).toBe(true);
    expect(page?.shop).toMatchObject({ name: "Test Gulch Works", about: "Two bays.", location: null, email: "desk@shop.test", logoUrl: `/s/${shop.slug}/logo` });
    const logo = await shopLogo(new NextRequest(`http://app.test/s/${shop.slug}/logo`), { params: Promise.resolve({ shop: shop.slug }) });
    expect([logo.status, logo.headers.get("content-type")]).toEqual([200, "image/jpeg"]);
    expect(await exifr.gps(Buffer.from(await logo.arrayBuffer()))).toBeFalsy();
    await saveProfile(await onShop(staff(shop, "owner")), shopProfileSchema.parse({ ...form, showLocation: "on", removeLogo: "on" }), null);
    expect((await getPublicShopPage(shop.slug, null))?.shop).toMatchObject({ location: "By the old mill", logoUrl: null });
  });
});
