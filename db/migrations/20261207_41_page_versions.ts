import type { Knex } from "knex";
import { pageVersionRules, pageVersionTriggerSql, dropPageVersionTriggers } from "../page-versions";

// Page versions (issue 17, db/page-versions.ts): counters per job, per shop and for the instance,
// moved by triggers on every table a page shows, so a rendered job page is served again only while
// nothing it shows has changed.

export async function up(knex: Knex): Promise<void> {
  await knex.raw(`CREATE TABLE page_versions (
    scope ENUM('job', 'shop', 'all') NOT NULL,
    ref INT UNSIGNED NOT NULL,
    version BIGINT UNSIGNED NOT NULL,
    PRIMARY KEY (scope, ref)
  ) ENGINE=InnoDB`);
  for (const rule of await pageVersionRules(knex)) {
    for (const sql of pageVersionTriggerSql(rule)) await knex.raw(sql);
  }
}

export async function down(knex: Knex): Promise<void> {
  for (const rule of await pageVersionRules(knex)) await dropPageVersionTriggers(knex, rule.table);
  await knex.schema.dropTable("page_versions");
}
