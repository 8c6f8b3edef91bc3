// Database chores for scripts/start.mjs, scripts/test.mjs and people:
//   tsx db/cli.ts migrate | rollback-all | seed-if-empty | status
import knex from "knex";
import config from "../knexfile";
import { seedIfEmpty } from "./seeds/demo";

async function main(command: string | undefined) {
  const db = knex(config);
  try {
    switch (command) {
      case "migrate": {
        const [batch, names] = await db.migrate.latest();
        console.log(names.length ? `migrations: batch ${batch} ran ${names.length}` : "migrations: up to date");
        break;
      }
      case "rollback-all": {
        const [, names] = await db.migrate.rollback(undefined, true);
        console.log(`migrations: rolled back ${names.length}`);
        break;
      }
      case "seed-if-empty": {
        const seeded = await seedIfEmpty(db);
        console.log(seeded ? "demo data: seeded the demo shops" : "demo data: the database already has shops; left as it is");
        break;
      }
      case "status": {
        const [done, pending] = await db.migrate.list();
        console.log({ done: done.length, pending: pending.length });
        break;
      }
      default:
        throw new Error(`unknown command "${command ?? ""}"; use migrate, rollback-all, seed-if-empty or status`);
    }
  } finally {
    await db.destroy();
  }
}

main(process.argv[2]).catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : error);
  process.exit(1);
});
