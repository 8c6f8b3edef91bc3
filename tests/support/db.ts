import crypto from "node:crypto";
import knex, { type Knex } from "knex";
import { inject } from "vitest";
import { knexConfig } from "../../db/config";

/** Points the app's db() at this run's test database. Call in beforeAll of an integration file. */
export function connectTestDatabase(): string {
  const url = inject("databaseUrl");
  if (!url) throw new Error("No test database: run integration tests with `npm test`, which starts a private MariaDB.");
  process.env.DATABASE_URL = url;
  process.env.AUTH_SECRET ??= "integration-test-secret";
  return url;
}

/** A connection to the shared test database, for fixtures and checks. */
export function testKnex(): Knex {
  return knex(knexConfig(connectTestDatabase()));
}

/** A brand-new, empty database of its own (for migration tests); drop() removes it. */
export async function freshDatabase(): Promise<{ url: string; knex: Knex; drop: () => Promise<void> }> {
  const base = new URL(connectTestDatabase());
  const name = `benchside_test_${crypto.randomBytes(4).toString("hex")}`;
  base.pathname = "";
  const admin = knex({ client: "mysql2", connection: base.toString().replace(/\/$/, "") });
  await admin.raw(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  base.pathname = `/${name}`;
  const own = knex(knexConfig(base.toString()));
  return {
    url: base.toString(),
    knex: own,
    drop: async () => {
      await own.destroy();
      await admin.raw(`DROP DATABASE IF EXISTS \`${name}\``);
      await admin.destroy();
    },
  };
}
