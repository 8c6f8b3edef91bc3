import "server-only";
import knex, { type Knex } from "knex";
import { databaseUrlFromEnv, knexConfig } from "./db-config";

// One pool per process; kept on globalThis so a dev-server reload does not open another.
const holder = globalThis as unknown as { benchsideDb?: Knex };

export function db(): Knex {
  holder.benchsideDb ??= knex(knexConfig(databaseUrlFromEnv()));
  return holder.benchsideDb;
}
