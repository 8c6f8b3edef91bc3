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

const healthHolder = globalThis as unknown as { benchsideHealthDb?: Knex };

/**
 * A pool of one connection for the health check only (db/queries/health.ts): "does the database
 * answer?" must not wait in line behind the app's queries, or a busy pool (every connection
 * taken under load) would look like a database that is down and turn pages into 503s.
 */
export function healthDb(): Knex {
  if (!healthHolder.benchsideHealthDb) {
    const config = knexConfig(databaseUrlFromEnv());
    healthHolder.benchsideHealthDb = knex({ ...config, acquireConnectionTimeout: 2000, pool: { ...config.pool, min: 0, max: 1 } });
  }
  return healthHolder.benchsideHealthDb;
}
