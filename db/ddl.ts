import type { Knex } from "knex";

/**
 * A schema change on a table that carries a stopword-free FULLTEXT index (jobs since migration 39;
 * customers and machines from 21 to 39, for migrations of that time). Most changes rebuild an InnoDB table with a FULLTEXT index, and the rebuilt index
 * takes the server's stopword setting at that moment: without this, "will" or "about" would
 * silently stop finding owners on the board. Each statement runs with the stopword list off.
 */
export async function alterTableKeepingFulltext(knex: Knex, table: "jobs" | "customers" | "machines", change: (t: Knex.AlterTableBuilder) => void): Promise<void> {
  for (const statement of knex.schema.alterTable(table, change).toSQL()) {
    await knex.raw(`SET STATEMENT innodb_ft_enable_stopword = OFF FOR ${statement.sql}`, statement.bindings ?? []);
  }
}
