import { execFile } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import knex, { type Knex } from "knex";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { knexConfig } from "@/db/config";
import { seedIfEmpty } from "@/db/seeds/demo";
import { freshDatabase } from "../support/db";

// `npm run backup` and `npm run restore` (the scripts themselves, as a person runs them) against
// an external DATABASE_URL: the demo seed is backed up, restored into a fresh database, and every
// table's CHECKSUM TABLE and every stored file must come back identical.

const run = promisify(execFile);
const ROOT = path.resolve(__dirname, "..", "..");

/** CHECKSUM TABLE of every base table, by name. */
async function checksums(k: Knex): Promise<Record<string, string>> {
  const [tables] = (await k.raw("SELECT table_name AS t FROM information_schema.tables WHERE table_schema = DATABASE() AND table_type = 'BASE TABLE' ORDER BY table_name")) as [{ t: string }[]];
  const [rows] = (await k.raw(`CHECKSUM TABLE ${tables.map((r) => `\`${r.t}\``).join(", ")}`)) as [{ Table: string; Checksum: string | number | null }[]];
  return Object.fromEntries(rows.map((r) => [r.Table.split(".").pop()!, String(r.Checksum)]));
}

const digest = (file: string) => crypto.createHash("sha256").update(fs.readFileSync(file)).digest("hex");
function filesOf(dir: string): Record<string, string> {
  const out: Record<string, string> = {};
  for (const e of fs.readdirSync(dir, { recursive: true, withFileTypes: true })) {
    if (e.isFile()) out[path.relative(dir, path.join(e.parentPath, e.name))] = digest(path.join(e.parentPath, e.name));
  }
  return out;
}

describe("backup and restore", () => {
  let source: Awaited<ReturnType<typeof freshDatabase>>;
  let restoredName: string;
  let restored: Knex | undefined;
  let tmp: string;

  beforeAll(async () => {
    source = await freshDatabase();
    await source.knex.migrate.latest();
    expect(await seedIfEmpty(source.knex)).toBe(true);
    tmp = fs.mkdtempSync(path.join(os.tmpdir(), "benchside-backup-"));
    // Stored photos as the local driver keeps them (key = relative path), binary content.
    for (const key of ["shops/1/photos/ab12/display.jpg", "shops/1/photos/ab12/thumb.jpg", "shops/2/logo/cd34.png"]) {
      fs.mkdirSync(path.dirname(path.join(tmp, "storage", key)), { recursive: true });
      fs.writeFileSync(path.join(tmp, "storage", key), crypto.randomBytes(4096));
    }
    restoredName = `${new URL(source.url).pathname.slice(1)}_restored`;
  }, 120_000);

  afterAll(async () => {
    if (restored) {
      await restored.raw(`DROP DATABASE IF EXISTS \`${restoredName}\``);
      await restored.destroy();
    }
    await source?.drop();
    if (tmp) fs.rmSync(tmp, { recursive: true, force: true });
  });

  it("restores the seeded shop into a fresh database with identical table checksums and photos", async () => {
    const env = { ...process.env, DATABASE_URL: source.url, STORAGE_DRIVER: "local", STORAGE_DIR: path.join(tmp, "storage") };
    const backup = await run("node", [path.join(ROOT, "scripts/backup.mjs"), path.join(tmp, "backups")], { env, cwd: ROOT });
    const [folder] = fs.readdirSync(path.join(tmp, "backups"));
    expect(folder).toMatch(/^benchside-\d{4}-\d\d-\d\dT\d\d-\d\d-\d\dZ$/);
    expect(backup.stdout).toContain(folder);
    const made = path.join(tmp, "backups", folder!);
    const manifest = JSON.parse(fs.readFileSync(path.join(made, "manifest.json"), "utf8"));
    expect(manifest.storage).toMatchObject({ driver: "local", included: true, files: 3 });
    expect(fs.readFileSync(path.join(made, "database.sql"), "utf8")).toContain("Dump completed");

    // The source changes after the backup: the restore must bring back the state at backup time.
    const before = await checksums(source.knex);
    expect(Object.keys(before).length).toBeGreaterThan(20);
    await source.knex("shops").update({ name: "Renamed after the backup" });
    expect((await checksums(source.knex)).shops).not.toBe(before.shops);

    // Into a database that doesn't exist yet, photos into an empty storage folder.
    const restoreEnv = { ...env, STORAGE_DIR: path.join(tmp, "restored-storage") };
    await run("node", [path.join(ROOT, "scripts/restore.mjs"), made, "--database", restoredName], { env: restoreEnv, cwd: ROOT });
    const url = new URL(source.url);
    url.pathname = `/${restoredName}`;
    restored = knex(knexConfig(url.toString()));
    expect(await checksums(restored)).toEqual(before);
    expect(filesOf(path.join(tmp, "restored-storage"))).toEqual(filesOf(path.join(tmp, "storage")));

    // A database with tables is not overwritten by accident…
    const refused = await run("node", [path.join(ROOT, "scripts/restore.mjs"), made, "--database", restoredName], { env: restoreEnv, cwd: ROOT }).then(
      () => null,
      (e: { code: number; stderr: string }) => e,
    );
    expect(refused?.code).toBe(1);
    expect(refused?.stderr).toContain("already has");
    // …but replaced on purpose, here the changed source itself, back to the backed-up state.
    await run("node", [path.join(ROOT, "scripts/restore.mjs"), made, "--force", "--skip-photos"], { env, cwd: ROOT });
    expect(await checksums(source.knex)).toEqual(before);
  }, 120_000);
});
