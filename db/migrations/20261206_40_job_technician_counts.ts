import type { Knex } from "knex";

// The board's count for one technician's jobs without reading them (issue 17), as migration 29
// does for statuses: how many of a shop's jobs each technician has in each status, kept by
// triggers on jobs whoever writes them. The technician filter (alone or with statuses) reads a
// handful of these rows instead of counting the technician's whole history (6,000 index entries
// for one of six technicians at a 50,000-job shop). Jobs with nobody assigned have no row: the
// board never filters on "nobody".
//
// A user removed from the database sets their jobs' technician to NULL through the foreign key,
// which fires no trigger: their rows stay behind, for an id the board can no longer be asked about.

const MOVE = (shop: string, tech: string, status: string, by: string) =>
  `INSERT INTO job_technician_counts (shop_id, technician_user_id, status, n) VALUES (${shop}, ${tech}, ${status}, ${by}) ON DUPLICATE KEY UPDATE n = n + (${by})`;
const ADD = (row: "NEW" | "OLD", by: string) => `IF ${row}.technician_user_id IS NOT NULL THEN ${MOVE(`${row}.shop_id`, `${row}.technician_user_id`, `${row}.status`, by)}; END IF`;

export async function up(knex: Knex): Promise<void> {
  const statuses = (await knex.raw("SHOW COLUMNS FROM jobs LIKE 'status'"))[0][0].Type as string; // enum('…',…)
  await knex.raw(`CREATE TABLE job_technician_counts (
    shop_id INT UNSIGNED NOT NULL,
    technician_user_id INT UNSIGNED NOT NULL,
    status ${statuses} NOT NULL,
    n INT NOT NULL DEFAULT 0,
    PRIMARY KEY (shop_id, technician_user_id, status),
    CONSTRAINT job_technician_counts_shop_foreign FOREIGN KEY (shop_id) REFERENCES shops (id) ON DELETE CASCADE
  ) ENGINE=InnoDB`);
  await knex.raw(`CREATE TRIGGER jobs_technician_count_insert AFTER INSERT ON jobs FOR EACH ROW BEGIN ${ADD("NEW", "1")}; END`);
  await knex.raw(
    `CREATE TRIGGER jobs_technician_count_update AFTER UPDATE ON jobs FOR EACH ROW
     BEGIN
       IF NOT (NEW.technician_user_id <=> OLD.technician_user_id AND NEW.status <=> OLD.status AND NEW.shop_id <=> OLD.shop_id) THEN
         -- Both counter rows in one order whichever way the job moves (as in migration 29), so two
         -- jobs moving in opposite directions at once wait for each other instead of deadlocking.
         IF (OLD.shop_id, COALESCE(OLD.technician_user_id, 0), OLD.status + 0) < (NEW.shop_id, COALESCE(NEW.technician_user_id, 0), NEW.status + 0) THEN
           ${ADD("OLD", "-1")};
           ${ADD("NEW", "1")};
         ELSE
           ${ADD("NEW", "1")};
           ${ADD("OLD", "-1")};
         END IF;
       END IF;
     END`,
  );
  await knex.raw(`CREATE TRIGGER jobs_technician_count_delete AFTER DELETE ON jobs FOR EACH ROW BEGIN ${ADD("OLD", "-1")}; END`);
  await knex.raw(
    `INSERT INTO job_technician_counts (shop_id, technician_user_id, status, n)
     SELECT shop_id, technician_user_id, status, COUNT(*) FROM jobs WHERE technician_user_id IS NOT NULL GROUP BY shop_id, technician_user_id, status`,
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw("DROP TRIGGER jobs_technician_count_delete");
  await knex.raw("DROP TRIGGER jobs_technician_count_update");
  await knex.raw("DROP TRIGGER jobs_technician_count_insert");
  await knex.schema.dropTable("job_technician_counts");
}
