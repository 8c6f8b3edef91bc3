import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import type { Knex } from "knex";
import { transaction } from "@/db/transaction";
import type { Actor } from "@/lib/permissions";
import { access } from "@/lib/server/access";
import { postEntry } from "@/lib/server/journal";
import { makeCustomerWithJobs, makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";

// Two people writing to one job at once both succeed (DESIGN.md §6): the lock order of
// insertEntry removes the deadlock, and `transaction` retries what a real deadlock still loses.

const note = (text: string) => ({ type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text }] }] });

describe("concurrent writes", () => {
  let k: Knex;
  let shop: Awaited<ReturnType<typeof makeShop>>;
  let jobIds: number[];
  let publicId: string;
  let tech: Actor;
  let writer: Actor;

  const staff = (role: "technician" | "service_writer"): Actor => ({
    userId: shop.staff[role]!.id,
    email: shop.staff[role]!.email,
    name: role,
    memberships: [{ shopId: shop.id, shopSlug: shop.slug, shopName: shop.slug, role }],
  });

  beforeAll(async () => {
    k = testKnex();
    shop = await makeShop(k, { label: "concurrent", roles: ["technician", "service_writer"] });
    ({ jobIds } = await makeCustomerWithJobs(k, shop.id, { name: "Ivo Brandt", statuses: ["in_progress", "in_progress"] }));
    publicId = String((await k("jobs").where({ id: jobIds[0]! }).first("public_id"))!.public_id);
    tech = staff("technician");
    writer = staff("service_writer");
  });
  afterAll(async () => {
    vi.restoreAllMocks();
    await k?.destroy();
  });

  it("20 notes posted at once to one job by two staff all land, without a single lost deadlock, round after round", async () => {
    const retries = vi.spyOn(console, "warn");
    for (let round = 1; round <= 3; round++) {
      // The same server-side call the POST /api/jobs/:job/entries route makes, after its access check.
      const posts = Array.from({ length: 20 }, async (_, i) => {
        const actor = i % 2 ? tech : writer;
        const acc = await access(actor, "job", publicId, "journal:post");
        // Shared notes also queue the followers' digest row in the same transaction.
        return postEntry(actor, acc, { kind: "note", note: note(`round ${round}, note ${i}`), visibility: i % 4 < 2 ? "shared" : "shop" });
      });
      const settled = await Promise.allSettled(posts);
      const failed = settled.filter((s) => s.status === "rejected").map((s) => String((s as PromiseRejectedResult).reason));
      expect(failed).toEqual([]);
      const ids = settled.map((s) => (s as PromiseFulfilledResult<{ id: number }>).value.id);
      expect(new Set(ids).size).toBe(20);
      const stored = await k("journal_entries").where({ job_id: jobIds[0]!, kind: "note" }).whereIn("id", ids).count({ n: "*" });
      expect(Number(stored[0]!.n)).toBe(20);
    }
    expect(await k("journal_entries").where({ job_id: jobIds[0]! }).count({ n: "*" }).then((r) => Number(r[0]!.n))).toBe(60);
    // Not one transaction had to be retried: the deadlock is gone by design, not papered over.
    expect(retries.mock.calls.filter((c) => String(c[0]).startsWith("database:"))).toEqual([]);
    retries.mockRestore();
  });

  it("a transaction that really loses a deadlock is run again and both writers succeed", async () => {
    const [a, b] = jobIds as [number, number];
    let release!: () => void;
    const bothHoldOne = new Promise<void>((resolve) => (release = resolve));
    let holding = 0;
    let runs = 0;
    // Opposite lock orders on purpose: A locks job a then b, B locks b then a.
    const crossing = (first: number, second: number) =>
      transaction(async (tx) => {
        runs++;
        await tx("jobs").where({ id: first }).update({ concern: `locked ${first} first` });
        if (++holding === 2) release();
        await bothHoldOne;
        await tx("jobs").where({ id: second }).update({ concern: `then ${second}` });
        return first;
      });
    const retries = vi.spyOn(console, "warn").mockImplementation(() => undefined);
    expect(await Promise.all([crossing(a, b), crossing(b, a)])).toEqual([a, b]);
    // MariaDB picked one victim (1213); the helper ran it once more.
    expect(runs).toBe(3);
    expect(retries.mock.calls.some((c) => String(c[0]).includes("ER_LOCK_DEADLOCK"))).toBe(true);
    retries.mockRestore();
  });

  it("gives up after 4 attempts and lets the conflict through; other errors are not retried", async () => {
    vi.spyOn(console, "warn").mockImplementation(() => undefined);
    let runs = 0;
    const lost = Object.assign(new Error("Deadlock found when trying to get lock; try restarting transaction"), { code: "ER_LOCK_DEADLOCK", errno: 1213 });
    await expect(
      transaction(async () => {
        runs++;
        throw lost;
      }),
    ).rejects.toBe(lost);
    expect(runs).toBe(4);

    runs = 0;
    await expect(
      transaction(async (tx) => {
        runs++;
        await tx.raw("SELECT * FROM no_such_table_here");
      }),
    ).rejects.toMatchObject({ code: "ER_NO_SUCH_TABLE" });
    expect(runs).toBe(1);
  });
});
