import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { changeEntry, getPhotoAccess, listTimeline, moveJobStatus } from "@/db/queries/journal";
import { startSession } from "@/db/queries/sessions";
import { getActorBySession } from "@/db/queries/users";
import { AppError } from "@/lib/errors";
import type { Action, Actor } from "@/lib/permissions";
import { db } from "@/db/client";
import { access } from "@/lib/server/access";
import { changeJobStatus, editEntry, postEntry, readTimeline, uploadPhoto } from "@/lib/server/journal";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";

const note = (text: string) => ({ type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text }] }] });

function staffActor(shop: Awaited<ReturnType<typeof makeShop>>, role: "owner" | "technician" | "service_writer"): Actor {
  return { userId: shop.staff[role]!.id, email: shop.staff[role]!.email, name: role, memberships: [{ shopId: shop.id, shopSlug: shop.slug, shopName: shop.slug, role }] };
}

describe("job journal", () => {
  let k: Knex;
  let shop: Awaited<ReturnType<typeof makeShop>>;
  let other: Awaited<ReturnType<typeof makeShop>>;
  let jobId: number;
  let publicId: string;
  let owner: Actor;
  let tech: Actor;
  let writer: Actor;
  let uploads: string;
  /** The job as the entries and timeline handlers and the status action find it: resolved and authorised (lib/server/access.ts). */
  const onJob = (actor: Actor, permission: Action) => access(actor, "job", publicId, permission);

  beforeAll(async () => {
    k = testKnex();
    uploads = fs.mkdtempSync(path.join(os.tmpdir(), "benchside-uploads-"));
    process.env.STORAGE_DIR = uploads;
    shop = await makeShop(k, { label: "journal", roles: ["owner", "technician", "service_writer"] });
    other = await makeShop(k, { label: "journal-other", roles: ["technician"] });
    const [userId] = await k("users").insert({ email: `owner.${shop.slug}@mail.test`, name: "Rae Quill" });
    const made = await makeCustomerWithJobs(k, shop.id, { name: "Rae Quill", userId: Number(userId), statuses: ["checked_in"] });
    jobId = made.jobIds[0]!;
    publicId = String((await k("jobs").where({ id: jobId }).first("public_id"))!.public_id);
    owner = { userId: Number(userId), email: `owner.${shop.slug}@mail.test`, name: "Rae Quill", memberships: [] };
    tech = staffActor(shop, "technician");
    writer = staffActor(shop, "service_writer");
  });
  afterAll(async () => {
    await k?.destroy();
    fs.rmSync(uploads, { recursive: true, force: true });
  });

  it("new entries are shop-only; the owner sees only what is shared", async () => {
    const hidden = await postEntry(tech, await onJob(tech, "journal:post"), { kind: "note", note: note("metal flakes on the drain plug magnet"), visibility: "shop" });
    const shown = await postEntry(tech, await onJob(tech, "journal:post"), { kind: "note", note: note("Oil drained, filter off."), visibility: "shared" });
    const forOwner = await readTimeline(owner, await onJob(owner, "job:view"), { order: "desc", limit: 50 });
    expect(forOwner.audience).toBe("owner");
    const ids = forOwner.entries.map((e) => e.id);
    expect(ids).toContain(shown.id);
    expect(ids).not.toContain(hidden.id);
    // Staff-only fields are left out of the owner's answer altogether.
    expect(JSON.stringify(forOwner)).not.toMatch(/"version"|"mine"|metal flakes/);
    const forShop = await readTimeline(tech, await onJob(tech, "job:view"), { order: "asc", limit: 50 });
    expect(forShop.entries.map((e) => e.id)).toEqual(expect.arrayContaining([hidden.id, shown.id]));
    expect(forShop.entries.find((e) => e.id === hidden.id)?.visibility).toBe("shop");
  });

  it("staff can read the timeline as the owner does", async () => {
    const asOwner = await readTimeline(tech, await onJob(tech, "job:view"), { order: "desc", limit: 50, as: "owner" });
    expect(asOwner.entries.every((e) => e.visibility === "shared")).toBe(true);
  });

  it("someone else's job answers 404, to staff of another shop and to another customer", async () => {
    const stranger: Actor = { userId: 999_999, email: "x@mail.test", name: "X", memberships: [] };
    await expect(access(staffActor(other, "technician"), "job", publicId, "job:view")).rejects.toMatchObject({ code: "not_found" });
    await expect(access(stranger, "job", publicId, "job:view")).rejects.toMatchObject({ code: "not_found" });
    await expect(access(owner, "job", publicId, "journal:post")).rejects.toMatchObject({ code: "forbidden" });
  });

  it("bad notes are refused and nothing is written", async () => {
    const before = await k("journal_entries").where({ job_id: jobId }).count({ n: "*" }).first();
    await expect(postEntry(tech, await onJob(tech, "journal:post"), { kind: "note", note: { type: "doc", content: [] }, visibility: "shop" })).rejects.toThrow();
    await expect(postEntry(tech, await onJob(tech, "journal:post"), { kind: "note", note: { type: "doc", content: [{ type: "script", text: "x" }] }, visibility: "shop" })).rejects.toThrow();
    await expect(postEntry(tech, await onJob(tech, "journal:post"), { kind: "note", note: note("x".repeat(200_000)), visibility: "shop" })).rejects.toThrow();
    const after = await k("journal_entries").where({ job_id: jobId }).count({ n: "*" }).first();
    expect(Number(after?.n)).toBe(Number(before?.n));
  });

  it("an edit keeps the old version in history; a stale version is refused; only the author may edit", async () => {
    const { id } = await postEntry(tech, await onJob(tech, "journal:post"), { kind: "note", note: note("first words"), visibility: "shop" });
    const edited = await editEntry(tech, await onJob(tech, "journal:post"), id, { version: 1, note: note("better words") });
    expect(edited.version).toBe(2);
    await expect(editEntry(tech, await onJob(tech, "journal:post"), id, { version: 1, note: note("lost update") })).rejects.toMatchObject({ code: "conflict" });
    await expect(editEntry(writer, await onJob(writer, "journal:post"), id, { version: 2, visibility: "shared" })).rejects.toMatchObject({ code: "forbidden" });
    const revisions = await k("journal_entry_revisions").where({ entry_id: id });
    expect(revisions).toHaveLength(1);
    expect(JSON.stringify(revisions[0]!.body)).toContain("first words");
    // The shop owner may tidy anyone's entries.
    await editEntry(staffActor(shop, "owner"), await onJob(staffActor(shop, "owner"), "journal:post"), id, { version: 2, visibility: "shared" });
  });

  it("a deleted shared entry disappears for the owner and stays in history", async () => {
    const { id } = await postEntry(tech, await onJob(tech, "journal:post"), { kind: "note", note: note("to be deleted"), visibility: "shared" });
    expect((await readTimeline(owner, await onJob(owner, "job:view"), { order: "desc", limit: 100 })).entries.map((e) => e.id)).toContain(id);
    await editEntry(tech, await onJob(tech, "journal:post"), id, { version: 1, delete: true });
    expect((await readTimeline(owner, await onJob(owner, "job:view"), { order: "desc", limit: 100 })).entries.map((e) => e.id)).not.toContain(id);
    expect((await readTimeline(tech, await onJob(tech, "job:view"), { order: "desc", limit: 100 })).entries.map((e) => e.id)).not.toContain(id);
    const kept = await k("journal_entries").where({ id }).first();
    expect(kept?.deleted_at).not.toBeNull();
    expect(await k("journal_entry_revisions").where({ entry_id: id, change: "delete" })).toHaveLength(1);
  });

  it("photos: uploaded, posted as a set; a shop-only photo is not the owner's to fetch", async () => {
    const fixture = fs.readFileSync(path.join(__dirname, "../fixtures/photos/gps.jpg"));
    const a = await uploadPhoto(tech, await onJob(tech, "journal:post"), new File([fixture], "a.jpg", { type: "image/jpeg" }));
    const b = await uploadPhoto(tech, await onJob(tech, "journal:post"), new File([fixture], "b.jpg", { type: "image/jpeg" }));
    const exe = new File([Buffer.concat([Buffer.from("MZ"), Buffer.alloc(200)])], "c.jpg", { type: "image/jpeg" });
    await expect(uploadPhoto(tech, await onJob(tech, "journal:post"), exe)).rejects.toBeInstanceOf(AppError);
    const { id } = await postEntry(tech, await onJob(tech, "journal:post"), { kind: "photos", photoIds: [a.id, b.id], caption: "Cam chain slider", visibility: "shop" });
    const entry = (await readTimeline(tech, await onJob(tech, "job:view"), { order: "desc", limit: 100 })).entries.find((e) => e.id === id);
    expect(entry?.photos.map((p) => p.id)).toEqual([a.id, b.id]);
    expect((await getPhotoAccess({ publicId: a.id }))?.sharedWithOwner).toBe(false);
    await editEntry(tech, await onJob(tech, "journal:post"), id, { version: 1, visibility: "shared" });
    expect((await getPhotoAccess({ publicId: a.id }))?.sharedWithOwner).toBe(true);
    // Posting the same photos twice, or photos of another job, is refused.
    await expect(postEntry(tech, await onJob(tech, "journal:post"), { kind: "photos", photoIds: [a.id], visibility: "shop" })).rejects.toMatchObject({ code: "conflict" });
    await expect(postEntry(tech, await onJob(tech, "journal:post"), { kind: "photos", photoIds: ["A".repeat(22)], visibility: "shop" })).rejects.toMatchObject({ code: "not_found" });
  });

  it("a status jump the rules don't allow, or from a stale status, is refused and writes nothing", async () => {
    const count = async () => Number((await k("job_status_changes").where({ job_id: jobId }).count({ n: "*" }).first())?.n);
    const before = await count();
    const status = String((await k("jobs").where({ id: jobId }).first("status"))!.status) as "checked_in";
    await expect(changeJobStatus(tech, await onJob(tech, "job:change-status"), { from: status, to: "picked_up", note: null })).rejects.toMatchObject({ code: "invalid", message: expect.stringMatching(/can't go straight to "Collected"/) });
    await expect(changeJobStatus(tech, await onJob(tech, "job:change-status"), { from: "ready", to: "picked_up", note: null })).rejects.toMatchObject({ code: "conflict" });
    await expect(access(owner, "job", publicId, "job:change-status")).rejects.toMatchObject({ code: "forbidden" });
    expect(await count()).toBe(before);
    expect((await k("jobs").where({ id: jobId }).first("status"))!.status).toBe(status);
  });

  it("status moves: two people pressing at once give one move, one history row and one entry", async () => {
    const results = await Promise.all([1, 2, 3].map(() => moveJobStatus({ shopId: shop.id, jobId, from: "checked_in", to: "inspecting", userId: tech.userId, note: null })));
    expect(results.filter(Boolean)).toHaveLength(1);
    expect(await k("job_status_changes").where({ job_id: jobId, to_status: "inspecting" })).toHaveLength(1);
    const statusEntries = await k("journal_entries").where({ job_id: jobId, kind: "status" });
    expect(statusEntries).toHaveLength(1);
    expect(statusEntries[0]!.visibility).toBe("shared");
    // A status entry is a record: no edit, no hiding, no delete.
    for (const change of [{ caption: "x" }, { visibility: "shop" as const }, { delete: true as const }]) {
      await expect(changeEntry({ shopId: shop.id, jobId, entryId: Number(statusEntries[0]!.id), userId: tech.userId, mayModerate: true, expectedVersion: 1, change })).rejects.toMatchObject({
        code: "invalid",
      });
    }
  });
});

describe("timeline queries", () => {
  let k: Knex;
  beforeAll(() => {
    k = testKnex();
  });
  afterAll(async () => k?.destroy());

  async function jobWithEntries(count: number) {
    const shop = await makeShop(k, { label: `timeline-${count}`, roles: ["technician"] });
    const { jobIds } = await makeCustomerWithJobs(k, shop.id, { name: "Ivo Penn", statuses: ["in_progress"] });
    const jobId = jobIds[0]!;
    const userId = shop.staff.technician!.id;
    const rows = Array.from({ length: count }, (_, i) => ({
      shop_id: shop.id,
      job_id: jobId,
      kind: i % 3 === 0 ? "photos" : i % 5 === 1 ? "clip" : "note",
      visibility: i % 2 ? ("shared" as const) : ("shop" as const),
      author_user_id: userId,
      body: JSON.stringify(note(`entry ${i}`)),
    }));
    for (let i = 0; i < rows.length; i += 200) await k("journal_entries").insert(rows.slice(i, i + 200));
    const photoEntries = await k("journal_entries").where({ job_id: jobId, kind: "photos" }).select("id");
    const photos = photoEntries.flatMap((e, n) =>
      [0, 1].map((position) => ({
        public_id: `p${jobId}x${n}y${position}`.padEnd(22, "0").slice(0, 22),
        shop_id: shop.id,
        job_id: jobId,
        entry_id: e.id,
        position,
        display_key: "shops/1/photos/x/display.jpg",
        thumb_key: "shops/1/photos/x/thumb.jpg",
        width: 10,
        height: 10,
        bytes: 10,
      })),
    );
    for (let i = 0; i < photos.length; i += 200) await k("photos").insert(photos.slice(i, i + 200));
    // Clips, ready, each with two moments except every other one.
    const clipEntries = await k("journal_entries").where({ job_id: jobId, kind: "clip" }).orderBy("id").select("id");
    for (const [n, e] of clipEntries.entries()) {
      const [clipId] = await k("clips").insert({
        public_id: `c${jobId}x${n}z`.padEnd(22, "0").slice(0, 22),
        shop_id: shop.id,
        job_id: jobId,
        entry_id: e.id,
        bytes: 10,
        upload_id: `up-${jobId}-${n}`,
        playback_id: `pb-${jobId}-${n}`,
        status: "ready",
        duration_seconds: 30,
      });
      if (n % 2 === 0) await k("clip_moments").insert([40, 10].map((atMs) => ({ shop_id: shop.id, clip_id: clipId, at_ms: atMs * 100, label: `at ${atMs}` })));
    }
    // Someone the owner invited, signed in by link: the reader whose access costs the most queries.
    const [followerId] = await k("users").insert({ email: `follower.${shop.slug}@mail.test`, name: "Tam Ode" });
    await k("job_subscribers").insert({ shop_id: shop.id, job_id: jobId, email: `follower.${shop.slug}@mail.test`, user_id: followerId, role: "follower" });
    const publicId = String((await k("jobs").where({ id: jobId }).first("public_id"))!.public_id);
    return { shopId: shop.id, jobId, publicId, followerId: Number(followerId) };
  }

  async function countQueries(run: () => Promise<unknown>) {
    let n = 0;
    const count = () => n++;
    db().on("query", count);
    try {
      await run();
    } finally {
      db().off("query", count);
    }
    return n;
  }

  it("reads any number of entries with the same, small number of queries", async () => {
    const small = await jobWithEntries(10);
    const large = await jobWithEntries(500);
    const read = (j: { shopId: number; jobId: number }, limit: number) => () => listTimeline({ shopId: j.shopId, jobId: j.jobId, audience: "shop", order: "desc", limit });
    const qSmall = await countQueries(read(small, 100));
    const qLarge = await countQueries(read(large, 100));
    const qAll = await countQueries(read(large, 500));
    expect(qSmall).toBe(qLarge);
    expect(qAll).toBe(qSmall);
    expect(qLarge).toBeLessThanOrEqual(3); // DESIGN.md §5: ≤ 6 per timeline request
    const page = await listTimeline({ shopId: large.shopId, jobId: large.jobId, audience: "shop", order: "desc", limit: 500 });
    expect(page.entries).toHaveLength(500);
    expect(page.entries.filter((e) => e.kind === "photos").every((e) => e.photos.length === 2)).toBe(true);
    const clips = page.entries.filter((e) => e.kind === "clip").map((e) => e.clip);
    expect(clips.length).toBeGreaterThan(0);
    expect(clips.every((c) => c?.status === "ready" && c.src === `/api/clips/${c.id}/video.mp4`)).toBe(true);
  });

  it("a clip's moments come with it, earliest first, in the same query", async () => {
    const j = await jobWithEntries(12);
    const page = await listTimeline({ shopId: j.shopId, jobId: j.jobId, audience: "shop", order: "asc", limit: 12 });
    const clips = page.entries.filter((e) => e.kind === "clip").map((e) => e.clip!);
    expect(clips).toHaveLength(2); // entries 1 and 11 (entry 6 is photos)
    expect(clips.map((c) => c.moments)).toEqual([
      [
        { atMs: 1000, label: "at 10" },
        { atMs: 4000, label: "at 40" },
      ],
      [],
    ]);
  });

  it("a whole timeline request, session and access included, is at most six queries at 10 or 500 entries", async () => {
    const small = await jobWithEntries(10);
    const large = await jobWithEntries(500);
    // What GET /api/jobs/:job/timeline does (lib/route.ts): the session and roles (getActor;
    // the JWT itself is read without the database), the job resolver, then the page.
    const request = (j: Awaited<ReturnType<typeof jobWithEntries>>, sessionId: string) => async () => {
      const live = await getActorBySession({ userId: j.followerId, sessionId });
      const found = await access(live!.actor, "job", j.publicId, "job:view");
      return readTimeline(live!.actor, found, { order: "desc", limit: 100 });
    };
    const sessions = await Promise.all([small, large].map((j) => startSession({ userId: j.followerId, method: "link", maxAgeSeconds: 3600 })));
    const [qSmall, qLarge] = [await countQueries(request(small, sessions[0]!)), await countQueries(request(large, sessions[1]!))];
    expect(qSmall).toBe(qLarge);
    expect(qLarge).toBeLessThanOrEqual(6); // DESIGN.md §5: ≤ 6 per timeline request
    // The follower's first page holds photos and clips with moments: every query of the path ran.
    const page = await request(large, sessions[1]!)();
    expect(page.audience).toBe("follower");
    expect(page.entries.some((e) => e.kind === "photos" && e.photos.length === 2)).toBe(true);
    expect(page.entries.some((e) => e.kind === "clip" && (e.clip?.moments?.length ?? 0) > 0)).toBe(true);
  });

  it("pages with a cursor in both directions without gaps or repeats", async () => {
    const j = await jobWithEntries(25);
    for (const order of ["asc", "desc"] as const) {
      const seen: number[] = [];
      let after: number | null = null;
      do {
        const page: Awaited<ReturnType<typeof listTimeline>> = await listTimeline({ ...j, audience: "owner", order, after, limit: 5 });
        seen.push(...page.entries.map((e) => e.id));
        after = page.next;
      } while (after != null);
      expect(seen).toHaveLength(12); // the odd-numbered entries are shared
      expect(new Set(seen).size).toBe(12);
      const sorted = [...seen].sort((a, b) => (order === "asc" ? a - b : b - a));
      expect(seen).toEqual(sorted);
    }
  });
});
