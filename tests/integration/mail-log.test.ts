import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import type { MailFake } from "@/fakes/mail/server";
import { subscribeOwner } from "@/db/queries/following";
import { listJobMessages } from "@/db/queries/mail-log";
import { enqueueMail, listOutboxProblems } from "@/db/queries/outbox";
import type { FindingInput } from "@/lib/schemas/approvals";
import { access } from "@/lib/server/access";
import { sendRequest } from "@/lib/server/approvals";
import { createFinding } from "@/lib/server/findings";
import { postEntry } from "@/lib/server/journal";
import { runOutboxOnce } from "@/lib/server/outbox-worker";
import { sweepNotifications } from "@/lib/server/notify-sweep";
import { freshDatabase } from "../support/db";
import { freshMailWorld } from "../support/mail-world";
import { ownerWithJobs, staffActor } from "../support/authorised-work";
import { makeShop } from "../support/fixtures";
import { listMail } from "../support/mailbox";

// What the owner reads and what the desk can check: a shared note with lists reaches the owner's
// mail as lists (through the real writer, the sweep and the outbox), and every mail about a job is
// in that job's sent log, and in no other job's or shop's. A database of its own: the sweep and
// the worker take every due row they can see.

const APP = "https://app.benchside.test";
const minutes = (n: number) => new Date(Date.now() + n * 60_000);
const pool = globalThis as { benchsideDb?: Knex };

let fresh: Awaited<ReturnType<typeof freshDatabase>>;
let k: Knex;
let fake: MailFake;
type Shop = Awaited<ReturnType<typeof makeShop>>;
let shopA: Shop;
let shopB: Shop;
let a: Awaited<ReturnType<typeof ownerWithJobs>>;
let b: Awaited<ReturnType<typeof ownerWithJobs>>;

const text = (value: string, marks?: unknown[]) => ({ type: "text", text: value, ...(marks ? { marks } : {}) });
const para = (...content: unknown[]) => ({ type: "paragraph", content });
const item = (value: string) => ({ type: "listItem", content: [para(text(value))] });
const listNote = {
  type: "doc",
  content: [
    { type: "heading", attrs: { level: 2 }, content: [text("Carburettor")] },
    para(text("Float bowl was "), text("varnished", [{ type: "bold" }]), text(".")),
    { type: "bulletList", content: [item("Jets cleaned"), item("New bowl gasket")] },
    { type: "orderedList", attrs: { start: 1, type: null }, content: [item("Refit the carb"), item("Test ride")] },
  ],
};

async function sendAll() {
  for (let run = await runOutboxOnce({ backoffBaseMs: 0 }); run.claimed > 0; run = await runOutboxOnce({ backoffBaseMs: 0 }));
}

beforeAll(async () => {
  ({ fresh, k, fake } = await freshMailWorld("mail-log", APP));
  shopA = await makeShop(k, { label: "maillog-a", roles: ["owner", "service_writer", "technician"] });
  shopB = await makeShop(k, { label: "maillog-b", roles: ["owner", "technician"] });
  a = await ownerWithJobs(k, shopA, 2, "Vera Lindgren");
  b = await ownerWithJobs(k, shopB, 1, "Ines Marlow");
  for (const [shop, made] of [[shopA, a], [shopB, b]] as const) {
    for (const job of made.jobs) await subscribeOwner({ shopId: shop.id, jobId: job.id, email: made.owner.email, userId: made.owner.userId });
  }
});
afterAll(async () => {
  await pool.benchsideDb?.destroy();
  await fake?.close();
  await fresh?.drop();
});

describe("a shared note in the owner's progress e-mail", () => {
  it("keeps its heading, lists and bold in the HTML and the text part of the queued mail", async () => {
    const tech = staffActor(shopA, "technician");
    const job = a.jobs[0]!;
    await postEntry(tech, await access(tech, "job", job.publicId, "journal:post"), { kind: "note", note: listNote, visibility: "shared" });
    expect((await sweepNotifications({ now: minutes(16) })).progress).toBe(1);

    const row = await k("outbox").where({ shop_id: shopA.id, job_id: job.id, kind: "progress" }).first();
    expect(row?.to_email).toBe(a.owner.email);
    const html = String(row!.html);
    expect(html).toMatch(/<h2 [^>]*>Carburettor<\/h2>/);
    expect(html).toMatch(/<ul [^>]*><li [^>]*><p [^>]*>Jets cleaned<\/p><\/li><li [^>]*><p [^>]*>New bowl gasket<\/p><\/li><\/ul>/);
    expect(html).toMatch(/<ol [^>]*><li [^>]*><p [^>]*>Refit the carb<\/p><\/li><li [^>]*><p [^>]*>Test ride<\/p><\/li><\/ol>/);
    expect(html).toContain("<strong>varnished</strong>");
    // Not the old one-line excerpt.
    expect(html).not.toContain("Jets cleaned New bowl gasket");
    expect(String(row!.text)).toContain("Carburettor\n\nFloat bowl was varnished.\n\n- Jets cleaned\n- New bowl gasket\n\n1. Refit the carb\n2. Test ride");

    // And as the owner receives it from the mail service.
    await sendAll();
    const [mail] = await listMail(fake.url, { to: a.owner.email });
    expect(mail?.text).toContain("- Jets cleaned\n- New bowl gasket");
    expect(mail?.html).toContain("<strong>varnished</strong>");
  });
});

describe("a job's sent log", () => {
  it("lists every mail about the job, newest first, with its state, and nothing about other jobs or shops", async () => {
    const [jobA1, jobA2] = a.jobs as [{ id: number; publicId: string }, { id: number; publicId: string }];
    const jobB = b.jobs[0]!;
    // An approval request through the real sender: its mail and its reminder name the job by public id.
    const writer = staffActor(shopA, "service_writer");
    const finding: FindingInput = {
      title: "Front pads worn",
      found: "Front pads at 1 mm.",
      whyItMatters: null,
      safety: "none",
      evidence: [],
      lines: [{ kind: "part", description: "Front pad set", qty: "1", unitPrice: "42.00", partNumber: null }],
    };
    const made = await createFinding(writer, await access(writer, "job", jobA1.publicId, "approvals:draft"), finding);
    await sendRequest(writer, await access(writer, "job", jobA1.publicId, "approvals:send"), made.id, { findingVersion: made.version });
    await k.transaction(async (tx) => {
      // Mail of the other job and shop, and of no job at all: never in this job's log.
      await enqueueMail(tx, { shopId: shopA.id, jobId: jobA2.id, kind: "ready", to: a.owner.email, subject: "Other job", html: "<p>x</p>", text: "x" });
      await enqueueMail(tx, { shopId: shopB.id, jobId: jobB.id, kind: "ready", to: b.owner.email, subject: "Other shop", html: "<p>x</p>", text: "x" });
      await enqueueMail(tx, { shopId: null, kind: "sign-in-link", to: a.owner.email, subject: "Your sign-in link", html: "<p>x</p>", text: "x" });
      // A mail that is useless by the time the worker sees it: dead-lettered.
      await enqueueMail(tx, { shopId: shopA.id, jobId: jobA1.id, kind: "ready", to: "late@mail.test", subject: "Too late", html: "<p>x</p>", text: "x", sendBefore: new Date(Date.now() - 1000) });
    });
    await sendAll();

    const log = await listJobMessages({ shopId: shopA.id, jobId: jobA1.id });
    expect(log.map((m) => [m.kind, m.subject, m.state])).toEqual([
      ["ready", "Too late", "dead"],
      ["approval-reminder", expect.stringContaining("Reminder"), "queued"], // waits for its hour
      ["approval", expect.any(String), "sent"],
      ["progress", expect.stringContaining("1 update"), "sent"],
    ]);
    expect(log.every((m) => m.channel === "email")).toBe(true);
    const [dead, reminder, approval] = log;
    expect(dead).toMatchObject({ to: "late@mail.test", sentAt: null, providerId: null, lastError: expect.stringContaining("send-before") });
    expect(reminder!.nextAttemptAt.getTime()).toBeGreaterThan(Date.now() + 60 * 60_000);
    expect(approval).toMatchObject({ to: a.owner.email, attempts: 1, lastError: null });
    expect(approval!.providerId).toMatch(/\S/);
    expect(approval!.sentAt!.getTime()).toBeGreaterThanOrEqual(approval!.queuedAt.getTime());

    expect((await listJobMessages({ shopId: shopA.id, jobId: jobA2.id })).map((m) => m.subject)).toEqual(["Other job"]);
    // Tenancy: another shop's job, asked for under this shop, gives nothing.
    expect(await listJobMessages({ shopId: shopA.id, jobId: jobB.id })).toEqual([]);
    expect(await listJobMessages({ shopId: shopB.id, jobId: jobA1.id })).toEqual([]);
    expect((await listJobMessages({ shopId: shopB.id, jobId: jobB.id })).map((m) => m.subject)).toEqual(["Other shop"]);

    // The failed-mail page links each failure to its job's log.
    const problems = await listOutboxProblems({ shopId: shopA.id });
    expect(problems.map((p) => [p.subject, p.jobNumber])).toEqual([["Too late", (await k("jobs").where({ id: jobA1.id }).first("number"))!.number]]);
  });

  it("refuses to file a mail under another shop's job", async () => {
    const jobB = b.jobs[0]!;
    const base = { kind: "ready", to: a.owner.email, subject: "Crossed", html: "<p>x</p>", text: "x" };
    await expect(k.transaction((tx) => enqueueMail(tx, { ...base, shopId: shopA.id, jobPublicId: jobB.publicId }))).rejects.toMatchObject({ code: "not_found" });
    // By id, the (shop_id, job_id) foreign key says no.
    await expect(k.transaction((tx) => enqueueMail(tx, { ...base, shopId: shopA.id, jobId: jobB.id }))).rejects.toMatchObject({ code: "ER_NO_REFERENCED_ROW_2" });
    await expect(k.transaction((tx) => enqueueMail(tx, { ...base, shopId: null, jobId: jobB.id }))).rejects.toThrow(/names its shop/);
    expect(await k("outbox").where({ subject: "Crossed" }).count({ n: "*" })).toEqual([{ n: 0 }]);
  });

  it("the migration fills in the job of mail queued before it, from the mail's key", async () => {
    const before = await k("outbox").orderBy("id").select("id", "job_id", "dedupe_key");
    // Every kind this file queued with a key that names a job: progress (subscriber) and approval (request).
    expect(before.filter((r) => r.dedupe_key && r.job_id != null).length).toBeGreaterThanOrEqual(3);
    // That one migration, whatever came after it.
    await k.migrate.down({ name: "20261204_15_outbox_job" });
    expect(await k.schema.hasColumn("outbox", "job_id")).toBe(false);
    await k.migrate.up({ name: "20261204_15_outbox_job" });
    const after = await k("outbox").orderBy("id").select("id", "job_id");
    // Keyed mail gets its job back; mail queued without a key (the test's own) stays unfiled.
    expect(after).toEqual(before.map((r) => ({ id: r.id, job_id: r.dedupe_key ? r.job_id : null })));
  });
});

