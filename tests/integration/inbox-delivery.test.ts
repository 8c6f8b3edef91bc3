// The desk inbox by e-mail, on a database of its own (the worker and the digest sweep take every
// due row they can see): each person's choice per kind (at once, morning digest, none), never a
// mail about what they did themselves, no amounts for a technician, the digest once a day, and
// mail the outbox gave up on reported to the desk (but not the desk's own mail, so no loop).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import type { MailFake } from "@/fakes/mail/server";
import { enqueueMail } from "@/db/queries/outbox";
import { transaction } from "@/db/transaction";
import { effectiveDeliveries } from "@/lib/inbox";
import type { Actor } from "@/lib/permissions";
import { DEFAULT_DELIVERY, type InboxKind } from "@/lib/shop-events";
import { access } from "@/lib/server/access";
import { recordInboxEvent } from "@/lib/server/inbox";
import { sweepInboxDigests } from "@/lib/server/inbox-digest";
import { inboxSettingsFor, markItemRead, saveInboxSettings } from "@/lib/server/inbox-view";
import { runOutboxOnce } from "@/lib/server/outbox-worker";
import { staffActor } from "../support/authorised-work";
import { freshDatabase } from "../support/db";
import { freshMailWorld } from "../support/mail-world";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { failNext, listMail } from "../support/mailbox";

const APP = "https://app.benchside.test";
const DAY = 24 * 60 * 60 * 1000;
const pool = globalThis as { benchsideDb?: Knex };

let fresh: Awaited<ReturnType<typeof freshDatabase>>;
let k: Knex;
let fake: MailFake;
let shop: Awaited<ReturnType<typeof makeShop>>;
let owner: Actor, writer: Actor, tech: Actor;
let jobId: number;

const onShop = (actor: Actor) => access(actor, "shop", shop.slug, "shop:view-board");
const choose = async (actor: Actor, choices: Partial<Record<InboxKind, "now" | "digest" | "off">>) =>
  saveInboxSettings(actor, await onShop(actor), { ...effectiveDeliveries({}), ...choices });
const record = (kind: InboxKind, extra: { actor?: Actor; amountMinor?: number; summary?: string } = {}) =>
  transaction((tx) => recordInboxEvent(tx, { shopId: shop.id, jobId, kind, actorUserId: extra.actor?.userId ?? null, summary: extra.summary ?? `A ${kind} happened`, amountMinor: extra.amountMinor, currency: extra.amountMinor ? "USD" : undefined }));
const queued = (kind: "inbox" | "inbox-digest", since = 0) => k("outbox").where({ shop_id: shop.id, kind }).where("id", ">", since).orderBy("id").select("id", "to_email", "subject", "text", "reply_to", "job_id");
const lastOutboxId = async () => Number((await k("outbox").max({ id: "id" }).first())?.id ?? 0);
async function drain() {
  for (let run = await runOutboxOnce({ backoffBaseMs: 0, backoffMaxMs: 0 }); run.claimed > 0; run = await runOutboxOnce({ backoffBaseMs: 0, backoffMaxMs: 0 }));
}

beforeAll(async () => {
  ({ fresh, k, fake } = await freshMailWorld("inbox-mail", APP));
  shop = await makeShop(k, { label: "inbox-mail", roles: ["owner", "service_writer", "technician"] });
  await k("shops").where({ id: shop.id }).update({ name: "Pine Hollow Engines", timezone: "America/Denver" });
  [owner, writer, tech] = [staffActor(shop, "owner"), staffActor(shop, "service_writer"), staffActor(shop, "technician")];
  jobId = (await makeCustomerWithJobs(k, shop.id, { name: "Dell Harrow", statuses: ["in_progress"] })).jobIds[0]!;
});
afterAll(async () => {
  await pool.benchsideDb?.destroy();
  await fake?.close();
  await fresh?.drop();
});

describe("inbox e-mail", () => {
  it("keeps each person's choices, with the defaults for kinds never chosen", async () => {
    expect((await inboxSettingsFor(tech, await onShop(tech))).deliveries).toEqual(DEFAULT_DELIVERY);
    await choose(owner, { parts_received: "now", payment_received: "digest" });
    await choose(writer, { parts_received: "off", payment_received: "off" });
    const settings = await inboxSettingsFor(owner, await onShop(owner));
    expect(settings.deliveries).toMatchObject({ parts_received: "now", payment_received: "digest", payment_failed: DEFAULT_DELIVERY.payment_failed });
    expect(settings.mayViewMoney).toBe(true);
    expect((await inboxSettingsFor(tech, await onShop(tech))).mayViewMoney).toBe(false);
  });

  it('"now" queues one mail per person who chose it, in the same transaction, never to the one who caused it', async () => {
    const since = await lastOutboxId();
    // The technician marks a part in: the owner chose "now", the writer "off", the technician did it.
    await record("parts_received", { actor: tech, summary: "2 × Drive belt received" });
    const mails = await queued("inbox", since);
    expect(mails.map((m) => m.to_email)).toEqual([owner.email]);
    expect(mails[0]).toMatchObject({ reply_to: null, subject: expect.stringMatching(/^Parts received: 2 × Drive belt received \(J-\d{4}\)$/) });
    expect(mails[0]!.text).toContain(`${APP}/shop/${shop.slug}/jobs/`);
    // A change that rolls back queues nothing.
    await expect(
      transaction(async (tx) => {
        await recordInboxEvent(tx, { shopId: shop.id, jobId, kind: "parts_received", actorUserId: null, summary: "Never" });
        throw new Error("the change failed");
      }),
    ).rejects.toThrow("the change failed");
    expect(await queued("inbox", mails[0]!.id)).toHaveLength(0);
  });

  it("a technician's mail says what happened without the amount; the desk's has it", async () => {
    const since = await lastOutboxId();
    await record("payment_failed", { amountMinor: 12_345, summary: "Online payment didn't go through: Your card was declined." });
    const mails = await queued("inbox", since);
    const byTo = new Map(mails.map((m) => [m.to_email, m]));
    expect([...byTo.keys()].sort()).toEqual([owner.email, tech.email, writer.email].sort());
    for (const desk of [owner, writer]) expect(byTo.get(desk.email)!.text).toContain("$123.45");
    const techMail = byTo.get(tech.email)!;
    expect(techMail.text).toContain("Your card was declined.");
    expect(techMail.text).not.toMatch(/\$|123\.45/);
    expect(techMail.subject).not.toMatch(/\$|123\.45/);
    await drain();
    expect((await listMail(fake.url, { to: tech.email })).some((m) => m.subject.startsWith("Payment failed:"))).toBe(true);
  });

  it('"digest" goes into the next morning mail once; read items and "off" kinds stay out', async () => {
    const since = await lastOutboxId();
    const a = await record("payment_received", { amountMinor: 5_000, summary: "Paid in full in cash on invoice INV-0001" });
    const b = await record("consent_given", { summary: "Dell Harrow agreed to the public story" });
    await markItemRead(owner, await onShop(owner), b);
    const now = new Date();
    expect(await sweepInboxDigests({ now })).toBe(3);
    const digests = await queued("inbox-digest", since);
    const byTo = new Map(digests.map((m) => [m.to_email, m]));
    expect([...byTo.keys()].sort()).toEqual([owner.email, tech.email, writer.email].sort());
    // The writer chose "off" for payments; consent still comes in the digest (the default).
    expect(byTo.get(writer.email)!.text).toContain("agreed to the public story");
    expect(byTo.get(writer.email)!.text).not.toContain("INV-0001");
    const ownerDigest = byTo.get(owner.email)!;
    expect(ownerDigest.text).toContain("Paid in full in cash on invoice INV-0001 · $50.00");
    expect(ownerDigest.text).not.toContain("agreed to the public story"); // read already
    expect(ownerDigest.subject).toMatch(/^Pine Hollow Engines: 1 new in the inbox \(\d{4}-\d{2}-\d{2}\)$/);
    const techDigest = byTo.get(tech.email)!;
    expect(techDigest.text).toContain("Paid in full in cash on invoice INV-0001");
    expect(techDigest.text).toContain("agreed to the public story");
    expect(techDigest.text).not.toContain("$50.00");
    expect(await k("inbox_digests").where({ shop_id: shop.id, user_id: owner.userId }).first("through_event_id")).toEqual({ through_event_id: Math.max(a, b) });

    // Once a day: the same morning again sends nothing, nor does the next with nothing new.
    expect(await sweepInboxDigests({ now: new Date(now.getTime() + 60_000) })).toBe(0);
    expect(await sweepInboxDigests({ now: new Date(now.getTime() + DAY) })).toBe(0);
    // Something new: the day after, in that day's digest only.
    await record("payment_received", { amountMinor: 700, summary: "Parts deposit paid in cash" });
    expect(await sweepInboxDigests({ now: new Date(now.getTime() + DAY + 60_000) })).toBe(0);
    expect(await sweepInboxDigests({ now: new Date(now.getTime() + 2 * DAY) })).toBe(2);
    const next = (await queued("inbox-digest", digests.at(-1)!.id)).find((m) => m.to_email === owner.email)!;
    expect(next.text).toContain("Parts deposit paid in cash · $7.00");
    expect(next.text).not.toContain("INV-0001");
    await drain();
    expect((await listMail(fake.url, { to: owner.email })).filter((m) => m.subject.includes("new in the inbox"))).toHaveLength(2);
  });

  it('"off" sends nothing, not at once and not in the digest', async () => {
    await choose(owner, { follower_added: "off" });
    await choose(tech, { follower_added: "off" });
    await choose(writer, { follower_added: "off" });
    const since = await lastOutboxId();
    await record("follower_added", { summary: "Dell Harrow invited a follower" });
    expect(await sweepInboxDigests({ now: new Date(Date.now() + 3 * DAY) })).toBe(0);
    expect(await k("outbox").where("id", ">", since)).toHaveLength(0);
  });

  it("mail the outbox gives up on lands in the inbox with who it was for, once; the desk's own mail never does", async () => {
    await drain();
    const events = () => k("shop_events").where({ shop_id: shop.id, kind: "mail_undeliverable" }).orderBy("id");
    const before = (await events()).length;
    await transaction((tx) => enqueueMail(tx, { shopId: shop.id, jobId, kind: "receipt", to: "dell.harrow@mail.test", subject: "Your receipt from Pine Hollow Engines", html: "<p>Thanks</p>", text: "Thanks" }));
    // A sign-in link (no shop) given up on is nobody's inbox item.
    await transaction((tx) => enqueueMail(tx, { shopId: null, kind: "sign-in", to: "someone@mail.test", subject: "Your sign-in link", html: "<p>Link</p>", text: "Link", sendBefore: new Date(Date.now() - 1000) }));
    await failNext(fake.url, 1, 422);
    const since = await lastOutboxId();
    await runOutboxOnce({ backoffBaseMs: 0 });
    const items = (await events()).slice(before);
    expect(items).toHaveLength(1);
    expect(items[0]).toMatchObject({ job_id: jobId, inbox: 1, actor_user_id: null });
    const payload: unknown = items[0]!.payload;
    expect(typeof payload === "string" ? JSON.parse(payload) : payload).toMatchObject({ summary: "To dell.harrow@mail.test: Your receipt from Pine Hollow Engines", detail: expect.stringContaining("422"), mailKind: "receipt" });
    // The desk hears at once (the default): then the mail service refuses those too — no new item.
    const notices = await queued("inbox", since);
    expect(notices.map((m) => m.to_email).sort()).toEqual([owner.email, tech.email, writer.email].sort());
    await failNext(fake.url, 3, 422);
    await drain();
    expect(await k("outbox").whereIn("id", notices.map((m) => m.id)).pluck("state")).toEqual(["dead", "dead", "dead"]);
    expect((await events()).slice(before)).toHaveLength(1);
  });
});
