// Reading the desk inbox: read flags per person, the unread count (bounded), filters by kind and
// job, keyset paging, "mark read" and "mark all read", and a constant number of queries.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { db } from "@/db/client";
import { transaction } from "@/db/transaction";
import { UNREAD_WINDOW } from "@/lib/inbox";
import type { Actor } from "@/lib/permissions";
import { inboxQuerySchema } from "@/lib/schemas/inbox";
import type { InboxKind } from "@/lib/shop-events";
import { access } from "@/lib/server/access";
import { recordInboxEvent } from "@/lib/server/inbox";
import { inboxPageFor, markAllItemsRead, markItemRead, unreadCountFor } from "@/lib/server/inbox-view";
import { staffActor } from "../support/authorised-work";
import { testKnex } from "../support/db";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";

type Shop = Awaited<ReturnType<typeof makeShop>>;

describe("reading the desk inbox", () => {
  let k: Knex;
  let shop: Shop;
  let other: Shop;
  let writer: Actor, tech: Actor, shopOwner: Actor;
  let jobIds: number[];
  let numbers: number[];

  const onShop = (actor: Actor, s: Shop = shop) => access(actor, "shop", s.slug, "shop:view-board");
  const read = async (actor: Actor, query: Record<string, string | string[]> = {}) => inboxPageFor(actor, await onShop(actor), inboxQuerySchema.parse(query));
  /** An item the way a writer records one (caused by nobody on the staff). */
  const item = (kind: InboxKind, jobId: number | null, summary: string, s: Shop = shop) => transaction((tx) => recordInboxEvent(tx, { shopId: s.id, jobId, kind, actorUserId: null, summary }));

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "inbox-read", roles: ["owner", "service_writer", "technician"] });
    other = await makeShop(k, { label: "inbox-other", roles: ["owner"] });
    [writer, tech, shopOwner] = [staffActor(shop, "service_writer"), staffActor(shop, "technician"), staffActor(shop, "owner")];
    // Everyone on "off" for these kinds: reading is what is tested here, not mail.
    for (const who of [writer, tech, shopOwner]) {
      await k("inbox_preferences").insert(["follower_added", "parts_received", "consent_given"].map((kind) => ({ user_id: who.userId, shop_id: shop.id, kind, delivery: "off" as const })));
    }
    jobIds = (await makeCustomerWithJobs(k, shop.id, { name: "Cal Ostrander", statuses: ["in_progress", "in_progress"] })).jobIds;
    numbers = await Promise.all(jobIds.map(async (id) => Number((await k("jobs").where({ id }).first("number"))!.number)));
  });
  afterAll(async () => k?.destroy());

  it("keeps read state per person, counts unread, and marks one read idempotently", async () => {
    const a = await item("follower_added", jobIds[0]!, "Someone invited a follower");
    const b = await item("parts_received", jobIds[1]!, "1 × Chain received");
    expect(await unreadCountFor(writer, await onShop(writer))).toBe(2);
    await markItemRead(writer, await onShop(writer), a);
    await markItemRead(writer, await onShop(writer), a); // twice: the same
    expect(await k("inbox_reads").where({ user_id: writer.userId, event_id: a })).toHaveLength(1);
    const mine = await read(writer);
    expect(mine.unread).toBe(1);
    expect(mine.items.map((i) => [i.id, i.read])).toEqual([
      [b, false],
      [a, true],
    ]);
    // The technician's inbox is untouched.
    expect((await read(tech)).items.map((i) => i.read)).toEqual([false, false]);
    // Items link to their job by number.
    expect(mine.items[0]!.job).toEqual({ number: numbers[1], machine: expect.stringContaining("Testmake") });
    // Another shop's item is "no such item" here, and reads nothing.
    const foreign = await item("follower_added", null, "Not yours", other);
    await expect(markItemRead(writer, await onShop(writer), foreign)).rejects.toMatchObject({ code: "not_found" });
    await expect(markItemRead(writer, await onShop(writer), 999_999_999)).rejects.toMatchObject({ code: "not_found" });
    await markAllItemsRead(writer, await onShop(writer), { through: b, kinds: [] });
    await markAllItemsRead(tech, await onShop(tech), { through: b, kinds: [] });
    await markAllItemsRead(shopOwner, await onShop(shopOwner), { through: b, kinds: [] });
  });

  it("filters by kind (one or several) and by job number, and shows unread only on request", async () => {
    const parts = await item("parts_received", jobIds[0]!, "2 × Sprocket received");
    const consent = await item("consent_given", jobIds[1]!, "Cal agreed");
    const follower = await item("follower_added", jobIds[1]!, "Cal invited a follower");
    const ids = async (query: Record<string, string | string[]>) => (await read(shopOwner, query)).items.map((i) => i.id);
    expect((await ids({ kind: "parts_received" }))[0]).toBe(parts);
    expect((await ids({ kind: "consent_given,follower_added" })).slice(0, 2)).toEqual([follower, consent]);
    expect(await ids({ kind: ["consent_given", "follower_added"] })).toEqual(await ids({ kind: "consent_given,follower_added" }));
    // Job numbers as people write them.
    const onJob = await ids({ job: `J-${String(numbers[1]).padStart(4, "0")}` });
    expect(onJob.slice(0, 2)).toEqual([follower, consent]);
    expect(onJob).not.toContain(parts);
    expect(await ids({ job: String(numbers[1]), kind: "consent_given" })).toEqual([consent]);
    expect(await ids({ job: "9999" })).toEqual([]);
    await markItemRead(shopOwner, await onShop(shopOwner), consent);
    expect(await ids({ unread: "1" })).toEqual([follower, parts]);
    expect(() => inboxQuerySchema.parse({ kind: "status_moved" })).toThrow(/Unknown kind/);
    expect(() => inboxQuerySchema.parse({ job: "next week" })).toThrow();
  });

  it("pages with a cursor, newest first, without gaps or repeats", async () => {
    const made: number[] = [];
    for (let i = 0; i < 30; i++) made.push(await item("follower_added", jobIds[0]!, `Follower ${i}`));
    const seen: number[] = [];
    let before: number | null = null;
    do {
      const page: Awaited<ReturnType<typeof read>> = await read(writer, { kind: "follower_added", job: String(numbers[0]), ...(before ? { before: String(before) } : {}) });
      seen.push(...page.items.map((i) => i.id));
      before = page.next;
    } while (before);
    const expected = (await k("shop_events").where({ shop_id: shop.id, kind: "follower_added", job_id: jobIds[0]! }).orderBy("id", "desc").pluck("id")).map(Number);
    expect(seen).toEqual(expected);
    expect(seen.slice(0, 30)).toEqual([...made].reverse());
  });

  it("marks all read up to the newest it was shown, within the filter; a later item stays unread", async () => {
    const shown = await item("parts_received", jobIds[1]!, "1 × Air filter received");
    const otherKind = await item("consent_given", jobIds[1]!, "Cal agreed again");
    const later = await item("parts_received", jobIds[1]!, "1 × Oil filter received");
    const count = await markAllItemsRead(tech, await onShop(tech), { through: otherKind, kinds: ["parts_received"], jobNumber: numbers[1] });
    expect(count).toBeGreaterThanOrEqual(1);
    const flags = new Map((await read(tech, { job: String(numbers[1]) })).items.map((i) => [i.id, i.read]));
    expect([flags.get(shown), flags.get(otherKind), flags.get(later)]).toEqual([true, false, false]);
    // Again: nothing more to mark.
    expect(await markAllItemsRead(tech, await onShop(tech), { through: otherKind, kinds: ["parts_received"], jobNumber: numbers[1] })).toBe(0);
  });

  it("reads a page in the same number of queries whatever its length", async () => {
    const count = async (run: () => Promise<unknown>) => {
      let n = 0;
      const tick = () => n++;
      db().on("query", tick);
      try {
        await run();
      } finally {
        db().off("query", tick);
      }
      return n;
    };
    const found = await onShop(writer);
    const few = await count(() => inboxPageFor(writer, found, inboxQuerySchema.parse({ kind: "consent_given" })));
    const many = await count(() => inboxPageFor(writer, found, inboxQuerySchema.parse({})));
    expect(few).toBe(many);
    expect(many).toBe(2); // the page, and the unread count
  });

  it("counts unread among the newest items only, so the badge costs the same for any history", async () => {
    const big = await makeShop(k, { label: "inbox-big", roles: ["service_writer"] });
    const desk = staffActor(big, "service_writer");
    const rows = Array.from({ length: UNREAD_WINDOW + 20 }, (_, i) => ({ shop_id: big.id, job_id: null, kind: "follower_added", inbox: true, payload: JSON.stringify({ summary: `Old ${i}` }) }));
    for (let i = 0; i < rows.length; i += 200) await k("shop_events").insert(rows.slice(i, i + 200));
    expect(await unreadCountFor(desk, await onShop(desk, big))).toBe(UNREAD_WINDOW);
    const newest = Number((await k("shop_events").where({ shop_id: big.id }).max({ id: "id" }).first())!.id);
    await markAllItemsRead(desk, await onShop(desk, big), { through: newest, kinds: [] });
    expect(await unreadCountFor(desk, await onShop(desk, big))).toBe(0);
  });
});
