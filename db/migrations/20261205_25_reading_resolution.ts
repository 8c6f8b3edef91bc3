import type { Knex } from "knex";

// Issue 18: a reading keeps its resolution. "0.20 mm" and "0.2 mm" are the same number but not
// the same measurement: the trailing zero says the instrument reads to 0.01 mm. DECIMAL(16,6)
// keeps the number, these keep how many decimals were typed for the value and each limit.
// Rows written before stay null and are shown as before (no trailing zeros).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("readings", (t) => {
    t.tinyint("value_decimals").unsigned().nullable();
    t.tinyint("min_decimals").unsigned().nullable();
    t.tinyint("max_decimals").unsigned().nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("readings", (t) => {
    t.dropColumn("value_decimals");
    t.dropColumn("min_decimals");
    t.dropColumn("max_decimals");
  });
}
