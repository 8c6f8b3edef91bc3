import "server-only";
import { healthDb } from "@/db/client";

/**
 * The cheapest round trip to the database, for the health check: resolves when MariaDB answers.
 * On its own connection (healthDb), so a pool busy with the app's queries doesn't count as down.
 */
export async function pingDatabase(): Promise<void> {
  await healthDb().raw("SELECT 1");
}
