import type { Knex } from "knex";

// The job board at a busy shop's scale (issue 17): every sort and quick filter of listJobs
// (db/queries/jobs.ts) reads one index range of a shop's jobs in the order the page shows.
//
// - promised_undated (STORED generated): "undated jobs last, whichever way" as a plain column, so
//   the promised-date order is an index order (an `IS NULL` expression first is not).
// - customer_name: a copy of the owner's name on the job, for the owner sort and name-prefix search
//   without a join. Triggers keep it, whoever writes (check-in, edits, merges, seeds, fixtures), so
//   no application writer has to remember it.
// - The board's tie-break is the job number, newest first, in both directions; an index serves one
//   direction pair only, hence an ascending and a descending index per sort (MariaDB ≥ 10.8 keeps
//   DESC key parts).
// - FULLTEXT on owners' names and on machines' make, model and serial, built without a stopword
//   list (a name such as "Will" or "The" must be found); words under innodb_ft_min_token_size
//   (3) are left to the prefix searches.

const JOB_INDEXES: [name: string, columns: string][] = [
  ["jobs_board_updated_desc", "shop_id, updated_at DESC, number DESC"],
  ["jobs_board_updated_asc", "shop_id, updated_at, number DESC"],
  ["jobs_board_status_desc", "shop_id, status DESC, number DESC"],
  ["jobs_board_status_asc", "shop_id, status, number DESC"],
  ["jobs_board_promised_desc", "shop_id, promised_undated, promised_on DESC, number DESC"],
  ["jobs_board_promised_asc", "shop_id, promised_undated, promised_on, number DESC"],
  ["jobs_board_customer_desc", "shop_id, customer_name DESC, number DESC"],
  ["jobs_board_customer_asc", "shop_id, customer_name, number DESC"],
  // A status filter or a technician's jobs in the default order (last change first).
  ["jobs_board_status_updated", "shop_id, status, updated_at DESC, number DESC"],
  ["jobs_board_technician_updated", "shop_id, technician_user_id, updated_at DESC, number DESC"],
];

const NAME_OF = "(SELECT c.name FROM customers c WHERE c.id = NEW.customer_id)";

export async function up(knex: Knex): Promise<void> {
  await knex.raw("ALTER TABLE jobs ADD COLUMN promised_undated TINYINT(1) AS (promised_on IS NULL) STORED");
  await knex.raw("ALTER TABLE jobs ADD COLUMN customer_name VARCHAR(120) NOT NULL DEFAULT '' AFTER customer_id");
  await knex.raw(`CREATE TRIGGER jobs_customer_name_insert BEFORE INSERT ON jobs FOR EACH ROW SET NEW.customer_name = ${NAME_OF}`);
  await knex.raw(
    `CREATE TRIGGER jobs_customer_name_update BEFORE UPDATE ON jobs FOR EACH ROW
     BEGIN IF NOT (NEW.customer_id <=> OLD.customer_id) THEN SET NEW.customer_name = ${NAME_OF}; END IF; END`,
  );
  await knex.raw(
    `CREATE TRIGGER customers_name_to_jobs AFTER UPDATE ON customers FOR EACH ROW
     BEGIN IF NOT (NEW.name <=> OLD.name) THEN UPDATE jobs SET customer_name = NEW.name WHERE shop_id = NEW.shop_id AND customer_id = NEW.id; END IF; END`,
  );
  await knex.raw("UPDATE jobs j JOIN customers c ON c.id = j.customer_id SET j.customer_name = c.name");
  for (const [name, columns] of JOB_INDEXES) await knex.raw(`CREATE INDEX ${name} ON jobs (${columns})`);

  await knex.raw("SET STATEMENT innodb_ft_enable_stopword = OFF FOR ALTER TABLE customers ADD FULLTEXT INDEX customers_name_fulltext (name)");
  await knex.raw("SET STATEMENT innodb_ft_enable_stopword = OFF FOR ALTER TABLE machines ADD FULLTEXT INDEX machines_text_fulltext (make, model, serial)");
  // Short searches (one or two letters) go by prefix: make and model need their own ranges.
  await knex.raw("CREATE INDEX machines_shop_make ON machines (shop_id, make)");
  await knex.raw("CREATE INDEX machines_shop_model ON machines (shop_id, model)");
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw("DROP INDEX machines_shop_model ON machines");
  await knex.raw("DROP INDEX machines_shop_make ON machines");
  await knex.raw("DROP INDEX machines_text_fulltext ON machines");
  await knex.raw("DROP INDEX customers_name_fulltext ON customers");
  for (const [name] of [...JOB_INDEXES].reverse()) await knex.raw(`DROP INDEX ${name} ON jobs`);
  await knex.raw("DROP TRIGGER customers_name_to_jobs");
  await knex.raw("DROP TRIGGER jobs_customer_name_update");
  await knex.raw("DROP TRIGGER jobs_customer_name_insert");
  await knex.raw("ALTER TABLE jobs DROP COLUMN customer_name");
  await knex.raw("ALTER TABLE jobs DROP COLUMN promised_undated");
}
