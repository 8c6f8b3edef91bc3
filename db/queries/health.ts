import "server-only";
import { db } from "@/db/client";

/** The cheapest round trip to the database, for the health check: resolves when MariaDB answers. */
export async function pingDatabase(): Promise<void> {
  await db().raw("SELECT 1");
}
