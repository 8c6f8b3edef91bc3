import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { connectTestDatabase } from "../support/db";

// The proxy's "does the database answer?" (lib/server/db-health.ts) asks on a connection of its
// own: with every connection of the app's pool taken by slow queries, pages must still be let
// through, not answered 503 as if the database were down.

const pools = globalThis as { benchsideDb?: { destroy: () => Promise<void> }; benchsideHealthDb?: { destroy: () => Promise<void> } };
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe("the database health check under load", () => {
  const before = process.env.DATABASE_POOL_MAX;

  beforeAll(() => {
    process.env.DATABASE_URL = connectTestDatabase();
    process.env.DATABASE_POOL_MAX = "2";
    pools.benchsideDb = undefined;
    pools.benchsideHealthDb = undefined;
  });

  afterAll(async () => {
    await pools.benchsideDb?.destroy();
    await pools.benchsideHealthDb?.destroy();
    if (before === undefined) delete process.env.DATABASE_POOL_MAX;
    else process.env.DATABASE_POOL_MAX = before;
  });

  it("a pool with every connection busy is not a database that is down", async () => {
    const { db } = await import("@/db/client");
    const { databaseAnswers, reportDatabaseUnavailable } = await import("@/lib/server/db-health");
    expect(db().client.pool.max).toBe(2);
    // (A Knex query runs once it is awaited or then-ed.)
    const busy = [1, 2].map(() => db().raw("SELECT SLEEP(2.5)").then(() => undefined));
    await sleep(300);
    // The pool is full: a third query of the app's waits for one of the two.
    const waited = Date.now();
    const third = db().raw("SELECT 1").then(() => Date.now() - waited);
    // What a request that met a failing query does; the next look asks the database again.
    reportDatabaseUnavailable();
    const asked = Date.now();
    expect(await databaseAnswers()).toBe(true);
    expect(Date.now() - asked).toBeLessThan(1000);
    expect(await third).toBeGreaterThan(1500);
    await Promise.all(busy);
  });
});
