import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { testKnex } from "../support/db";

// Galera replicates row changes by primary key: a table without one can't be written safely on a
// cluster (README "Running past one machine"; `npm run cluster -- --test` checks it there too).
describe("every table the migrations make has a primary key", () => {
  let k: Knex;
  beforeAll(() => {
    k = testKnex(); // the run's database, migrated to the latest by the global set-up
  });
  afterAll(async () => k?.destroy());

  it("no base table lacks one", async () => {
    const [tables] = (await k.raw("SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE() AND table_type = 'BASE TABLE'")) as [{ name: string }[]];
    const [keyed] = (await k.raw("SELECT table_name AS name FROM information_schema.table_constraints WHERE table_schema = DATABASE() AND constraint_type = 'PRIMARY KEY'")) as [{ name: string }[]];
    const withKey = new Set(keyed.map((t) => t.name));
    expect(tables.length).toBeGreaterThan(50);
    expect(tables.map((t) => t.name).filter((name) => !withKey.has(name))).toEqual([]);
  });
});
