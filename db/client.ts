import "server-only";
import knex, { type Knex } from "knex";
import { databaseUrlFromEnv, knexConfig } from "./config";

// One pool per process; kept on globalThis so a dev-server reload does not open another.
const holder = globalThis as unknown as { benchsideDb?: Knex };

/** The app's connection pool (DATABASE_URL). Only db/ uses it; other code calls db/queries. */
export function db(): Knex {
  holder.benchsideDb ??= knex(knexConfig(databaseUrlFromEnv()));
  return holder.benchsideDb;
}
