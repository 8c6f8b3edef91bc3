import type { Knex } from "knex";

// The board's search at a busy shop's scale (issue 17). A word such as a make ("Corvane") can
// match one job in eight: the search then read the hits of one FULLTEXT index (owners) and of
// another (machines), joined each to its job, and merged every branch through a de-duplicating
// UNION, all per hit. The job now carries the machine's make, model and serial beside the owner's
// name (migration 21), with one FULLTEXT index over the four, so a word search is one index
// range on jobs whose rows already hold the board's sort columns: no join, no merge of the big
// branch. (It also finds "Ilsa Corvane", an owner and a make, which the two indexes could not.)
//
// As with customer_name, triggers keep the copies, whoever writes (check-in, machine edits,
// merges, seeds, fixtures). A serial the machine doesn't have is '' on the job, so `NOT LIKE`
// needs no NULL case. The two earlier FULLTEXT indexes and the make/model prefix indexes served
// the board's search alone; they go (fewer indexes to keep on every write), and come back on down.

const COPY = {
  make: "(SELECT m.make FROM machines m WHERE m.id = NEW.machine_id)",
  model: "(SELECT m.model FROM machines m WHERE m.id = NEW.machine_id)",
  serial: "(SELECT COALESCE(m.serial, '') FROM machines m WHERE m.id = NEW.machine_id)",
};
const SET_COPY = `SET NEW.machine_make = ${COPY.make}, NEW.machine_model = ${COPY.model}, NEW.machine_serial = ${COPY.serial}`;

export async function up(knex: Knex): Promise<void> {
  await knex.raw(
    `ALTER TABLE jobs
       ADD COLUMN machine_make VARCHAR(60) NOT NULL DEFAULT '' AFTER machine_id,
       ADD COLUMN machine_model VARCHAR(80) NOT NULL DEFAULT '' AFTER machine_make,
       ADD COLUMN machine_serial VARCHAR(64) NOT NULL DEFAULT '' AFTER machine_model`,
  );
  await knex.raw(`CREATE TRIGGER jobs_machine_text_insert BEFORE INSERT ON jobs FOR EACH ROW ${SET_COPY}`);
  await knex.raw(
    `CREATE TRIGGER jobs_machine_text_update BEFORE UPDATE ON jobs FOR EACH ROW
     BEGIN IF NOT (NEW.machine_id <=> OLD.machine_id) THEN ${SET_COPY}; END IF; END`,
  );
  await knex.raw(
    `CREATE TRIGGER machines_text_to_jobs AFTER UPDATE ON machines FOR EACH ROW
     BEGIN
       IF NOT (NEW.make <=> OLD.make AND NEW.model <=> OLD.model AND NEW.serial <=> OLD.serial) THEN
         UPDATE jobs SET machine_make = NEW.make, machine_model = NEW.model, machine_serial = COALESCE(NEW.serial, '')
          WHERE shop_id = NEW.shop_id AND machine_id = NEW.id;
       END IF;
     END`,
  );
  await knex.raw("UPDATE jobs j JOIN machines m ON m.id = j.machine_id SET j.machine_make = m.make, j.machine_model = m.model, j.machine_serial = COALESCE(m.serial, '')");
  await knex.raw("CREATE INDEX jobs_search_serial ON jobs (shop_id, machine_serial)");
  await knex.raw("CREATE INDEX jobs_search_make ON jobs (shop_id, machine_make)");
  await knex.raw("CREATE INDEX jobs_search_model ON jobs (shop_id, machine_model)");
  // Without a stopword list, as before: a name such as "Will" or "The" must be found.
  await knex.raw(
    "SET STATEMENT innodb_ft_enable_stopword = OFF FOR ALTER TABLE jobs ADD FULLTEXT INDEX jobs_search_fulltext (customer_name, machine_make, machine_model, machine_serial)",
  );
  await knex.raw("DROP INDEX machines_shop_model ON machines");
  await knex.raw("DROP INDEX machines_shop_make ON machines");
  await knex.raw("DROP INDEX machines_text_fulltext ON machines");
  await knex.raw("DROP INDEX customers_name_fulltext ON customers");
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw("SET STATEMENT innodb_ft_enable_stopword = OFF FOR ALTER TABLE customers ADD FULLTEXT INDEX customers_name_fulltext (name)");
  await knex.raw("SET STATEMENT innodb_ft_enable_stopword = OFF FOR ALTER TABLE machines ADD FULLTEXT INDEX machines_text_fulltext (make, model, serial)");
  await knex.raw("CREATE INDEX machines_shop_make ON machines (shop_id, make)");
  await knex.raw("CREATE INDEX machines_shop_model ON machines (shop_id, model)");
  await knex.raw("DROP INDEX jobs_search_fulltext ON jobs");
  await knex.raw("DROP INDEX jobs_search_model ON jobs");
  await knex.raw("DROP INDEX jobs_search_make ON jobs");
  await knex.raw("DROP INDEX jobs_search_serial ON jobs");
  await knex.raw("DROP TRIGGER machines_text_to_jobs");
  await knex.raw("DROP TRIGGER jobs_machine_text_update");
  await knex.raw("DROP TRIGGER jobs_machine_text_insert");
  await knex.raw("ALTER TABLE jobs DROP COLUMN machine_serial, DROP COLUMN machine_model, DROP COLUMN machine_make");
}
