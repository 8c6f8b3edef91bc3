import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { allocateJobNumber } from "@/db/queries/jobs";
import { makeShop } from "../support/fixtures";
import { testKnex } from "../support/db";

describe("job numbers per shop", () => {
  let db: Knex;
  beforeAll(() => {
    db = testKnex();
  });
  afterAll(async () => db?.destroy());

  it("20 check-ins at the same moment get 20 different numbers with no gaps", async () => {
    const shop = await makeShop(db, { label: "numbers" });
    const numbers = await Promise.all(Array.from({ length: 20 }, () => db.transaction((tx) => allocateJobNumber(tx, shop.id))));
    expect([...numbers].sort((a, b) => a - b)).toEqual(Array.from({ length: 20 }, (_, i) => i + 1));
  });

  it("counts each shop on its own", async () => {
    const a = await makeShop(db, { label: "numbers-a" });
    const b = await makeShop(db, { label: "numbers-b" });
    expect(await db.transaction((tx) => allocateJobNumber(tx, a.id))).toBe(1);
    expect(await db.transaction((tx) => allocateJobNumber(tx, a.id))).toBe(2);
    expect(await db.transaction((tx) => allocateJobNumber(tx, b.id))).toBe(1);
  });

  it("a rolled-back check-in gives its number back", async () => {
    const shop = await makeShop(db, { label: "numbers-rollback" });
    await expect(
      db.transaction(async (tx) => {
        await allocateJobNumber(tx, shop.id);
        throw new Error("check-in failed half way");
      }),
    ).rejects.toThrow("half way");
    expect(await db.transaction((tx) => allocateJobNumber(tx, shop.id))).toBe(1);
  });
});
