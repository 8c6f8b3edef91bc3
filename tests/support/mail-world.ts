import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import type { Knex } from "knex";
import { createMailFake } from "@/fakes/mail/server";
import { freshDatabase } from "./db";

type Fresh = Awaited<ReturnType<typeof freshDatabase>>;

/**
 * A migrated database of its own, with the environment the app's code reads (DATABASE_URL,
 * APP_URL) pointing at it: for tests that read the outbox or run the app's pool directly.
 */
export async function freshAppDatabase(appUrl: string) {
  const fresh = await freshDatabase();
  await fresh.knex.migrate.latest();
  process.env.DATABASE_URL = fresh.url;
  process.env.APP_URL = appUrl;
  return { fresh, k: fresh.knex };
}

/** The same, and a mail fake on a free port that the app's mail code sends to. */
export async function freshMailWorld(label: string, appUrl: string) {
  const { fresh, k } = await freshAppDatabase(appUrl);
  const fake = await createMailFake({ port: 0, dir: fs.mkdtempSync(path.join(os.tmpdir(), `bs-${label}-`)) });
  process.env.RESEND_BASE_URL = fake.url;
  process.env.RESEND_API_KEY = "re_test_key";
  return { fresh, k, fake };
}

/** Closes the app's pool (opened by the code under test) and drops the database. */
export async function dropAppDatabase(fresh: Fresh | undefined): Promise<void> {
  await (globalThis as { benchsideDb?: Knex }).benchsideDb?.destroy();
  await fresh?.drop();
}
