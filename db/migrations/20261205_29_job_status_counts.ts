import type { Knex } from "knex";

// The job board's count without reading the shop's jobs (issue 17): how many jobs each shop has
// in each status, kept by triggers on jobs whoever writes them (check-in, status moves, merges,
// seeds, fixtures). The unfiltered board and a status-only filter read a handful of these rows
// instead of counting 50,000 index entries; filters that need the jobs themselves (search, quick
// filters, technician) still count them.

const MOVE = (shop: string, status: string, by: string) =>
  `INSERT INTO job_status_counts (shop_id, status, n) VALUES (${shop}, ${status}, ${by}) ON DUPLICATE KEY UPDATE n = n + (${by})`;

export async function up(knex: Knex): Promise<void> {
  const statuses = (await knex.raw("SHOW COLUMNS FROM jobs LIKE 'status'"))[0][0].Type as string; // enum('…',…)
  await knex.raw(`CREATE TABLE job_status_counts (
    shop_id INT UNSIGNED NOT NULL,
    status ${statuses} NOT NULL,
    n INT NOT NULL DEFAULT 0,
    PRIMARY KEY (shop_id, status),
    CONSTRAINT job_status_counts_shop_foreign FOREIGN KEY (shop_id) REFERENCES shops (id) ON DELETE CASCADE
  ) ENGINE=InnoDB`);
  await knex.raw(`CREATE TRIGGER jobs_count_insert AFTER INSERT ON jobs FOR EACH ROW ${MOVE("NEW.shop_id", "NEW.status", "1")}`);
  await knex.raw(
    `CREATE TRIGGER jobs_count_update AFTER UPDATE ON jobs FOR EACH ROW
     BEGIN
       IF NOT (NEW.status <=> OLD.status AND NEW.shop_id <=> OLD.shop_id) THEN
         -- Both counter rows in one order whichever way the job moves, so two jobs moving in
         -- opposite directions at once wait for each other instead of deadlocking.
         IF (OLD.shop_id, OLD.status + 0) < (NEW.shop_id, NEW.status + 0) THEN
           ${MOVE("OLD.shop_id", "OLD.status", "-1")};
           ${MOVE("NEW.shop_id", "NEW.status", "1")};
         ELSE
           ${MOVE("NEW.shop_id", "NEW.status", "1")};
           ${MOVE("OLD.shop_id", "OLD.status", "-1")};
         END IF;
       END IF;
     END`,
  );
  await knex.raw(`CREATE TRIGGER jobs_count_delete AFTER DELETE ON jobs FOR EACH ROW ${MOVE("OLD.shop_id", "OLD.status", "-1")}`);
  await knex.raw("INSERT INTO job_status_counts (shop_id, status, n) SELECT shop_id, status, COUNT(*) FROM jobs GROUP BY shop_id, status");
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw("DROP TRIGGER jobs_count_delete");
  await knex.raw("DROP TRIGGER jobs_count_update");
  await knex.raw("DROP TRIGGER jobs_count_insert");
  await knex.schema.dropTable("job_status_counts");
}
