// `npm run backup [-- FOLDER]`: one consistent copy of the shop's data in a new timestamped folder
// (under .data/backups/ unless FOLDER is given): the database as an SQL dump taken in one
// transaction (mariadb-dump --single-transaction: a snapshot, without stopping the app) and the
// photo storage folder. Clip media lives in the video service and is not in it (README.md).
import fs from "node:fs";
import path from "node:path";
import { ROOT, SetupError, say } from "./lib/setup.mjs";
import { listFiles, resolveTarget, runTool, sql, withDatabase } from "./lib/backup.mjs";

async function main() {
  const parent = path.resolve(process.argv[2] ?? path.join(ROOT, ".data", "backups"));
  const target = resolveTarget();
  const stamp = new Date().toISOString().replace(/\.\d+Z$/, "Z").replace(/:/g, "-");
  const final = path.join(parent, `benchside-${stamp}`);
  if (fs.existsSync(final)) throw new SetupError(`${final} already exists; wait a second and run it again.`);
  // Built under another name and renamed when complete, so a half-made backup never looks like one.
  const work = `${final}.partial`;
  fs.mkdirSync(work, { recursive: true, mode: 0o700 });
  try {
    const dumped = await withDatabase(target, async (cnf) => {
      say("backup", `dumping database ${target.database} at ${target.url.host}`);
      const [[server]] = await sql(cnf, "SELECT VERSION()");
      // Database first, files second: the app writes a photo's files before its row, so every
      // photo the dump knows of is already on disk when the folder is copied.
      await runTool(
        "mariadb-dump",
        cnf,
        [
          "--single-transaction",
          "--routines",
          "--triggers",
          "--no-tablespaces",
          "--hex-blob",
          "--default-character-set=utf8mb4",
          "--skip-dump-date",
          "--quick",
          target.database,
        ],
        { stdoutFile: path.join(work, "database.sql") },
      );
      const tables = (await sql(cnf, "SELECT table_name FROM information_schema.tables WHERE table_schema = DATABASE() AND table_type = 'BASE TABLE' ORDER BY table_name", target.database)).map(([t]) => t);
      // A complete dump ends with mariadb-dump's "Dump completed" line.
      const tail = fs.readFileSync(path.join(work, "database.sql"), "utf8").slice(-200);
      if (!tail.includes("Dump completed")) throw new SetupError("The dump stopped before its end; nothing was kept.");
      return { server, tables };
    });

    let storage;
    if (target.storage.driver === "s3") {
      storage = { driver: "s3", bucket: target.storage.bucket, included: false };
      say("backup", `photos are in the S3 bucket "${target.storage.bucket}": back it up with the storage provider's own tools (versioning or replication); this backup holds the database only`);
    } else {
      const { files, bytes } = listFiles(target.storage.dir);
      if (files.length) fs.cpSync(target.storage.dir, path.join(work, "storage"), { recursive: true, preserveTimestamps: true });
      storage = { driver: "local", from: target.storage.dir, included: true, files: files.length, bytes };
      say("backup", `copied ${files.length} stored file(s), ${(bytes / 1048576).toFixed(1)} MiB, from ${path.relative(ROOT, target.storage.dir) || target.storage.dir}`);
    }

    fs.writeFileSync(
      path.join(work, "manifest.json"),
      JSON.stringify(
        {
          format: 1,
          createdAt: new Date().toISOString(),
          database: { name: target.database, host: target.url.host, server: dumped.server, tables: dumped.tables, file: "database.sql" },
          storage,
          notIncluded: ["clip media (it lives in the video service)", "secrets and .env (keep them apart from backups)"],
        },
        null,
        2,
      ),
    );
    fs.renameSync(work, final);
  } catch (error) {
    fs.rmSync(work, { recursive: true, force: true });
    throw error;
  }
  console.log(`\n  Backup written to ${final}`);
  console.log(`  Restore it with: npm run restore -- ${path.relative(ROOT, final) || final}\n`);
}

main().catch((error) => {
  console.error(error instanceof SetupError ? error.message : error);
  process.exit(1);
});
