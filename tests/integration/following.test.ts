import { NextRequest } from "next/server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import type { MailFake } from "@/fakes/mail/server";
import { GET as unsubscribeGet, POST as unsubscribePost } from "@/app/u/[token]/route";
import { checkInJob } from "@/db/queries/check-in";
import { notifyNow, subscribeOwner } from "@/db/queries/following";
import { claimCustomerRecords, isCustomerAddress } from "@/db/queries/users";
import { checkInSchema } from "@/lib/schemas/check-in";
import type { Action, Actor } from "@/lib/permissions";
import { db } from "@/db/client";
import { access } from "@/lib/server/access";
import { inviteFollowerAs, setOwnFrequency } from "@/lib/server/following";
import { changeJobStatus, postEntry, readTimeline } from "@/lib/server/journal";
import { runOutboxOnce } from "@/lib/server/outbox-worker";
import { addJobPart, changeJobPartStatus } from "@/lib/server/bench-parts";
import { sweepNotifications } from "@/lib/server/notify-sweep";
import { mailThumbToken, unsubscribeToken } from "@/lib/server/signed-token";
import { freshDatabase } from "../support/db";
import { freshMailWorld } from "../support/mail-world";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { type MailMessage, listMail } from "../support/mailbox";

// A database of its own: the sweep and the worker take every due row they can see.
const APP = "https://app.benchside.test";
const OWNER = "vera.lindgren@mail.test";
const FOLLOWER = "tomas.lindgren@mail.test";
const note = (text: string) => ({ type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text }] }] });
const minutes = (n: number) => new Date(Date.now() + n * 60_000);
const pool = globalThis as { benchsideDb?: Knex };

let fresh: Awaited<ReturnType<typeof freshDatabase>>;
let k: Knex;
let fake: MailFake;
let shop: Awaited<ReturnType<typeof makeShop>>;
let jobId: number;
let publicId: string;
let owner: Actor;
let tech: Actor;

/** Sweep as if `at` were now, then send everything due. */
async function deliver(at = new Date()) {
  const swept = await sweepNotifications({ now: at });
  for (let run = await runOutboxOnce({ backoffBaseMs: 0 }); run.claimed > 0; run = await runOutboxOnce({ backoffBaseMs: 0 }));
  return swept;
}
const mailTo = async (to: string, subject: string) => (await listMail(fake.url, { to })).filter((m) => m.subject.includes(subject));
const subscriberOf = async (email: string) => (await k("job_subscribers").where({ job_id: jobId, email }).first())!;
/** The job as the owner's and staff's actions and the timeline handler find it: resolved and authorised (lib/server/access.ts). */
const onJob = (actor: Actor, permission: Action) => access(actor, "job", publicId, permission);
const post = (token: string, cookie?: string) =>
  unsubscribePost(new NextRequest(`${APP}/u/${token}`, { method: "POST", body: "List-Unsubscribe=One-Click", headers: { "content-type": "application/x-www-form-urlencoded", ...(cookie ? { cookie } : {}) } }), { params: Promise.resolve({ token }) });

beforeAll(async () => {
  ({ fresh, k, fake } = await freshMailWorld("following", APP));
  shop = await makeShop(k, { label: "following", roles: ["owner", "technician"] });
  await k("shops").where({ id: shop.id }).update({ name: "Kettle Creek Motors", email: "desk@kettle-creek.test", phone: "+1 555 010 4400" });
  const [userId] = await k("users").insert({ email: OWNER, name: "Vera Lindgren" });
  const made = await makeCustomerWithJobs(k, shop.id, { name: "Vera Lindgren", email: OWNER, userId: Number(userId), statuses: ["in_progress"] });
  jobId = made.jobIds[0]!;
  publicId = String((await k("jobs").where({ id: jobId }).first("public_id"))!.public_id);
  await subscribeOwner({ shopId: shop.id, jobId, email: OWNER, userId: Number(userId) });
  owner = { userId: Number(userId), email: OWNER, name: "Vera Lindgren", memberships: [] };
  tech = { userId: shop.staff.technician!.id, email: shop.staff.technician!.email, name: "Tech", memberships: [{ shopId: shop.id, shopSlug: shop.slug, shopName: "Kettle Creek Motors", role: "technician" }] };
});
afterAll(async () => {
  await pool.benchsideDb?.destroy();
  await fake?.close();
  await fresh?.drop();
});

describe("following a job", () => {
  it("check-in subscribes the owner to every update", async () => {
    const input = checkInSchema.parse({
      customerMode: "new", customerName: "Ines Marlow", customerEmail: "ines.marlow@mail.test", customerPhone: "", machineKind: "atv", machineYear: "2019",
      machineMake: "Tessaro", machineModel: "Ridgeline 450", machineEngineCc: "", machineSerial: "", machineHours: "", machineOdometer: "", machineOdometerUnit: "mi",
      concern: "Hard to start cold.", intakeNotes: "", promisedOn: "", technicianId: "",
    });
    const job = await checkInJob({ shopId: shop.id, userId: tech.userId, input });
    expect(await k("job_subscribers").where({ job_id: job.id }).select("email", "role", "frequency", "unsubscribed_at")).toEqual([
      { email: "ines.marlow@mail.test", role: "owner", frequency: "every", unsubscribed_at: null },
    ]);
    await deliver(minutes(16)); // its check-in update goes out now, out of the way of the tests below
  });

  it("the owner invites a follower, who gets an invitation, may ask for a sign-in link, and is linked on sign-in", async () => {
    await expect(access(tech, "job", publicId, "job:follow-manage")).rejects.toMatchObject({ code: "forbidden" });
    await expect(inviteFollowerAs(owner, await onJob(owner, "job:follow-manage"), OWNER)).rejects.toMatchObject({ code: "conflict" });
    await inviteFollowerAs(owner, await onJob(owner, "job:follow-manage"), FOLLOWER);
    await expect(inviteFollowerAs(owner, await onJob(owner, "job:follow-manage"), FOLLOWER.toUpperCase())).rejects.toMatchObject({ code: "conflict" });
    expect(await isCustomerAddress({ email: FOLLOWER })).toBe(true);
    expect((await deliver()).alerts).toBe(1);
    const [invite] = await mailTo(FOLLOWER, "invited you to follow");
    expect(invite?.subject).toMatch(/^Vera Lindgren invited you to follow the Testmake Model \w+ at Kettle Creek Motors$/);
    expect(invite?.links).toContain(`${APP}/sign-in?next=${encodeURIComponent(`/my/jobs/${publicId}`)}`);

    const user = await claimCustomerRecords({ email: FOLLOWER });
    expect((await subscriberOf(FOLLOWER)).user_id).toBe(user.id);
    const follower: Actor = { userId: user.id, email: FOLLOWER, name: user.name, memberships: [] };
    expect((await readTimeline(follower, await onJob(follower, "job:view"), { order: "desc", limit: 10, as: "owner" })).audience).toBe("follower");
  });

  it("groups 5 entries shared within the window into one e-mail per subscriber", async () => {
    const texts = ["Carb off", "Float bowl varnished", "Jets cleaned", "New bowl gasket", "Carb refitted"];
    for (const text of texts) await postEntry(tech, await onJob(tech, "journal:post"), { kind: "note", note: note(text), visibility: "shared" });
    await postEntry(tech, await onJob(tech, "journal:post"), { kind: "note", note: note("Customer haggles, quote high"), visibility: "shop" });
    expect((await deliver()).progress).toBe(0); // the window (15 minutes) hasn't passed
    expect(await mailTo(OWNER, "5 updates")).toHaveLength(0);
    expect((await deliver(minutes(16))).progress).toBe(2);
    for (const to of [OWNER, FOLLOWER]) {
      const mails = await mailTo(to, "updates from Kettle Creek Motors");
      expect(mails).toHaveLength(1);
      for (const text of texts) expect(mails[0]!.text).toContain(text);
      expect(mails[0]!.text).not.toContain("haggles");
    }
    expect((await deliver(minutes(32))).progress).toBe(0);
  });

  it("a progress e-mail's headers match RFC 8058, and it speaks for the job's own shop", async () => {
    const [mail] = (await mailTo(OWNER, "5 updates")) as MailMessage[];
    const sub = await subscriberOf(OWNER);
    const url = `${APP}/u/${unsubscribeToken(Number(sub.id))}`;
    // RFC 8058 §3.1: List-Unsubscribe holds one HTTPS URI; List-Unsubscribe-Post is exactly "List-Unsubscribe=One-Click".
    expect(mail?.headers).toEqual({ "List-Unsubscribe": `<${url}>`, "List-Unsubscribe-Post": "List-Unsubscribe=One-Click" });
    expect(url).toMatch(/^https:\/\/app\.benchside\.test\/u\/[A-Za-z0-9_-]+$/);
    expect(mail?.links).toContain(url); // the visible link is the same address
    expect(mail?.reply_to).toEqual(["desk@kettle-creek.test"]);
    expect(mail?.from).toBe('"Kettle Creek Motors" <no-reply@benchside.test>');
    expect(mail?.html).toContain("<html");
  });

  it("ready to collect goes out at once to every subscriber, even one who wants only pick-up and approvals", async () => {
    const follower: Actor = { userId: (await subscriberOf(FOLLOWER)).user_id!, email: FOLLOWER, name: "T", memberships: [] };
    await setOwnFrequency(follower, await onJob(follower, "job:follow"), "decisions");
    await changeJobStatus(tech, await onJob(tech, "job:change-status"), { from: "in_progress", to: "ready", note: null });
    expect((await deliver()).alerts).toBeGreaterThan(0);
    expect(await mailTo(FOLLOWER, "Ready to collect")).toHaveLength(1);
    const [ready] = await mailTo(OWNER, "Ready to collect");
    expect(ready?.text).toContain("+1 555 010 4400");
    expect((await deliver(minutes(16))).progress).toBe(0); // not again in the batch
  });

  it("followers never get money or decisions: not on their timeline, not in their mail", async () => {
    const [entryId] = await k("journal_entries").insert({ shop_id: shop.id, job_id: jobId, kind: "approval", visibility: "shared", body: JSON.stringify({ total: 48000 }) });
    const follower: Actor = { userId: (await subscriberOf(FOLLOWER)).user_id!, email: FOLLOWER, name: "T", memberships: [] };
    const asFollower = await readTimeline(follower, await onJob(follower, "job:view"), { order: "desc", limit: 50 });
    expect(asFollower.entries.map((e) => e.id)).not.toContain(Number(entryId));
    expect((await readTimeline(owner, await onJob(owner, "job:view"), { order: "desc", limit: 50 })).entries.map((e) => e.id)).toContain(Number(entryId));

    await db().transaction((tx) => notifyNow(tx, { shopId: shop.id, jobId, kind: "approval_request", payload: { title: "Rear pads at 1 mm: replace", link: "/my/jobs/x" } }));
    await deliver();
    const [forOwner] = await mailTo(OWNER, "needs your OK");
    const [forFollower] = await mailTo(FOLLOWER, "Waiting on the owner");
    expect(forOwner?.text).toContain("Rear pads at 1 mm");
    expect(forFollower?.text).not.toContain("Rear pads");
    expect(forFollower?.text).not.toMatch(/\$|480/);

    // The approvals module mails the owner itself and asks for the followers' notice only.
    await db().transaction((tx) => notifyNow(tx, { shopId: shop.id, jobId, kind: "approval_request", followersOnly: true, dedupeKey: "approval:second" }));
    await deliver();
    expect(await mailTo(OWNER, "needs your OK")).toHaveLength(1);
    expect(await mailTo(FOLLOWER, "Waiting on the owner")).toHaveLength(2);
  });

  it("unsubscribing with a forged token changes nothing; opening the link changes nothing; the one-click POST does, without cookies", async () => {
    const sub = await subscriberOf(OWNER);
    const good = unsubscribeToken(Number(sub.id));
    const flipped = good.slice(0, 10) + (good[10] === "A" ? "B" : "A") + good.slice(11);
    const secret = process.env.AUTH_SECRET;
    process.env.AUTH_SECRET = "someone-else's-secret";
    const otherKey = unsubscribeToken(Number(sub.id));
    process.env.AUTH_SECRET = secret;
    for (const forged of [flipped, otherKey, mailThumbToken("A".repeat(22), minutes(60)), "x".repeat(35), `${good}A`]) {
      const res = await post(forged);
      expect(res.status).toBe(400);
    }
    const opened = await unsubscribeGet(new NextRequest(`${APP}/u/${good}`), { params: Promise.resolve({ token: good }) });
    expect(opened.status).toBe(303);
    expect(opened.headers.get("location")).toBe(`${APP}/unsubscribe/${good}`);
    expect((await subscriberOf(OWNER)).unsubscribed_at).toBeNull();

    const res = await post(good);
    expect(res.status).toBe(200);
    expect(res.headers.get("location")).toBeNull();
    expect((await subscriberOf(OWNER)).unsubscribed_at).not.toBeNull();
    expect((await post(good)).status).toBe(200); // twice is fine

    await postEntry(tech, await onJob(tech, "journal:post"), { kind: "note", note: note("Test ride done"), visibility: "shared" });
    await deliver(minutes(16));
    expect(await mailTo(OWNER, "1 update")).toHaveLength(0);
    await setOwnFrequency(owner, await onJob(owner, "job:follow"), "every"); // re-subscribing from the job page
    expect((await subscriberOf(OWNER)).unsubscribed_at).toBeNull();
  });

  it("a daily subscriber gets one digest after the shop's digest hour, not one per batch", async () => {
    const follower: Actor = { userId: (await subscriberOf(FOLLOWER)).user_id!, email: FOLLOWER, name: "T", memberships: [] };
    await setOwnFrequency(follower, await onJob(follower, "job:follow"), "daily");
    await postEntry(tech, await onJob(tech, "journal:post"), { kind: "note", note: note("Chain adjusted"), visibility: "shared" });
    await postEntry(tech, await onJob(tech, "journal:post"), { kind: "note", note: note("Tyres at 18 psi"), visibility: "shared" });
    expect((await deliver()).daily).toBe(0);
    expect((await deliver(minutes(25 * 60))).daily).toBe(1);
    const [digest] = await mailTo(FOLLOWER, "Today at Kettle Creek Motors");
    expect(digest?.text).toContain("Chain adjusted");
    expect(digest?.text).toContain("Tyres at 18 psi");
    expect((await deliver(minutes(26 * 60))).daily).toBe(0);
  });
  it("the last part arriving tells the owner at once, in one e-mail, not again in the digest", async () => {
    // Back on the bench after "ready" above (a comeback before pick-up), then waiting on a part.
    await changeJobStatus(tech, await onJob(tech, "job:change-status"), { from: "ready", to: "in_progress", note: null });
    await deliver(minutes(16));
    const part = await addJobPart(tech, await onJob(tech, "parts:manage"), { job: publicId, description: "Clutch cable", partNumber: null, supplier: null, qty: "1", cost: "12.00", status: "ordered", expectedOn: null, forWork: { findingId: null, noOkNeeded: true } });
    expect(part.jobMovedTo).toBe("waiting_parts");
    await deliver(minutes(16));
    await changeJobPartStatus(tech, await onJob(tech, "parts:manage"), { part: part.id, from: "ordered", to: "received", expectedOn: null });
    expect((await deliver()).alerts).toBeGreaterThan(0);
    expect(await mailTo(OWNER, "Parts are in")).toHaveLength(1);
    await deliver(minutes(40));
    expect(await mailTo(OWNER, "Parts are in")).toHaveLength(1);
  });
});
