// `npm run restore -- BACKUP_FOLDER [--database NAME] [--force] [--skip-photos]`: loads a backup made
// by `npm run backup` into the app's database (or into NAME, created when missing) and puts the
// stored photos back into the storage folder. A database that already has tables is replaced only
// with --force (stop the app first). Clip media is not in a backup (README.md).
import fs from "node:fs";
import path from "node:path";
import { SetupError, say } from "./lib/setup.mjs";
import { createPrivateDatabase, listFiles, quoteName, resolveTarget, runTool, sql, withDatabase } from "./lib/backup.mjs";

const USAGE = "Usage: npm run restore -- BACKUP_FOLDER [--database NAME] [--force] [--skip-photos]";

function parseArgs(argv) {
  const out = { folder: null, database: null, force: false, skipPhotos: false };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === "--force") out.force = true;
    else if (a === "--skip-photos") out.skipPhotos = true;
    else if (a === "--database") out.database = argv[++i] ?? null;
    else if (a.startsWith("--database=")) out.database = a.slice("--database=".length);
    else if (!a.startsWith("--") && !out.folder) out.folder = path.resolve(a);
    else throw new SetupError(`Unknown argument "${a}". ${USAGE}`);
  }
  if (!out.folder) throw new SetupError(USAGE);
  return out;
}

async function main() {
  const args = parseArgs(process.argv.slice(2));
  const manifestFile = path.join(args.folder, "manifest.json");
  if (!fs.existsSync(manifestFile)) throw new SetupError(`${args.folder} is not a backup made by \`npm run backup\` (no manifest.json).`);
  const manifest = JSON.parse(fs.readFileSync(manifestFile, "utf8"));
  const dump = path.join(args.folder, manifest.database?.file ?? "database.sql");
  if (manifest.format !== 1 || !fs.existsSync(dump)) throw new SetupError(`${args.folder} is incomplete or of an unknown format.`);

  const target = resolveTarget();
  const name = args.database ?? target.database;
  // Embedded in SQL below: only plain names.
  if (!/^[A-Za-z0-9_]{1,64}$/.test(name)) throw new SetupError(`"${name}" is not a database name this restores into (letters, digits, _).`);

  await withDatabase(target, async (cnf) => {
    const exists = (await sql(cnf, `SELECT COUNT(*) FROM information_schema.schemata WHERE schema_name = '${name}'`))[0][0] === "1";
    if (!exists) {
      say("restore", `creating database ${name}`);
      if (target.private) createPrivateDatabase(target, name);
      else
        await sql(cnf, `CREATE DATABASE ${quoteName(name)} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`).catch((error) => {
          throw new SetupError(`Could not create database ${name} (${error.message}); create it, grant the app's user all rights on it, and run this again.`);
        });
    }
    const present = await sql(cnf, `SELECT table_name, table_type FROM information_schema.tables WHERE table_schema = '${name}'`);
    if (present.length) {
      if (!args.force) {
        throw new SetupError(
          `Database ${name} already has ${present.length} table(s). Restore into a fresh one with --database NEW_NAME, or stop the app and add --force to replace its contents.`,
        );
      }
      say("restore", `replacing the ${present.length} table(s) of ${name} (--force)`);
      const views = present.filter(([, type]) => type === "VIEW").map(([t]) => quoteName(t));
      const tables = present.filter(([, type]) => type !== "VIEW").map(([t]) => quoteName(t));
      const drops = [views.length ? `DROP VIEW IF EXISTS ${views.join(", ")}` : "", tables.length ? `DROP TABLE IF EXISTS ${tables.join(", ")}` : ""].filter(Boolean);
      await sql(cnf, `SET FOREIGN_KEY_CHECKS = 0; ${drops.join("; ")}`, name);
    }
    say("restore", `loading ${path.basename(dump)} into ${name}`);
    await runTool("mariadb", cnf, [`--database=${name}`, "--default-character-set=utf8mb4"], { stdinFile: dump });
    const restored = new Set((await sql(cnf, "SELECT table_name FROM information_schema.tables WHERE table_schema = DATABASE()", name)).map(([t]) => t));
    const missing = (manifest.database.tables ?? []).filter((t) => !restored.has(t));
    if (missing.length) throw new SetupError(`The load left out table(s) ${missing.join(", ")}; check the dump.`);
    say("restore", `database ${name}: ${restored.size} table(s) restored`);
  });

  const copied = path.join(args.folder, "storage");
  if (!manifest.storage?.included) {
    say("restore", `this backup holds no photos: they were in the S3 bucket "${manifest.storage?.bucket ?? "?"}"; restore that bucket with the provider's tools`);
  } else if (args.skipPhotos) {
    say("restore", "photos left as they are (--skip-photos)");
  } else if (target.storage.driver === "s3") {
    say("restore", `the app stores photos in S3 now: upload the folder ${copied} to the bucket "${target.storage.bucket}" with the provider's tools`);
  } else if (fs.existsSync(copied)) {
    // Keys are unique (random ids), so copying over what is there only adds or repairs files.
    fs.mkdirSync(target.storage.dir, { recursive: true });
    fs.cpSync(copied, target.storage.dir, { recursive: true, force: true, preserveTimestamps: true });
    say("restore", `put back ${listFiles(copied).files.length} stored file(s) into ${target.storage.dir}`);
  }

  console.log(`\n  Restored ${path.basename(args.folder)} into database ${name}.`);
  if (name !== target.database) {
    const url = new URL(target.url);
    if (url.password) url.password = "PASSWORD";
    url.pathname = `/${name}`;
    console.log(`  The app uses ${target.database}; to run it on the restored copy, set DATABASE_URL=${url.toString()} (with the password).`);
  }
  console.log("  Clip media was not in the backup: clips play again only while the video service still has them.\n");
}

main().catch((error) => {
  console.error(error instanceof SetupError ? error.message : error);
  process.exit(1);
});
