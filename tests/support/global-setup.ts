import knex from "knex";
import type { TestProject } from "vitest/node";
import { knexConfig } from "../../db/config";

declare module "vitest" {
  export interface ProvidedContext {
    databaseUrl: string | null;
  }
}

// VITEST_DB_NAME lets two runs share one MariaDB without dropping each other's database.
const NAME = process.env.VITEST_DB_NAME ?? "benchside_test_vitest";

/** One migrated database for the integration tests of this run; each test file makes its own shops in it. */
export default async function setup(project: TestProject) {
  const base = process.env.TEST_DATABASE_URL_BASE;
  if (!base) {
    project.provide("databaseUrl", null);
    return;
  }
  const admin = knex({ client: "mysql2", connection: base });
  await admin.raw(`DROP DATABASE IF EXISTS \`${NAME}\``);
  await admin.raw(`CREATE DATABASE \`${NAME}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  const url = `${base}/${NAME}`;
  const db = knex(knexConfig(url));
  await db.migrate.latest();
  await db.destroy();
  project.provide("databaseUrl", url);
  return async () => {
    await admin.raw(`DROP DATABASE IF EXISTS \`${NAME}\``);
    await admin.destroy();
  };
}
