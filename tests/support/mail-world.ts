import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { createMailFake } from "@/fakes/mail/server";
import { freshDatabase } from "./db";

/**
 * A migrated database of its own and a mail fake on a free port, with the environment the app's
 * mail code reads (DATABASE_URL, APP_URL, the mail service's base URL and key) pointing at them:
 * for tests that follow mail from the outbox to the mail service.
 */
export async function freshMailWorld(label: string, appUrl: string) {
  const fresh = await freshDatabase();
  await fresh.knex.migrate.latest();
  process.env.DATABASE_URL = fresh.url;
  process.env.APP_URL = appUrl;
  const fake = await createMailFake({ port: 0, dir: fs.mkdtempSync(path.join(os.tmpdir(), `bs-${label}-`)) });
  process.env.RESEND_BASE_URL = fake.url;
  process.env.RESEND_API_KEY = "re_test_key";
  return { fresh, k: fresh.knex, fake };
}
