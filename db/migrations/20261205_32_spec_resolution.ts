import type { Knex } from "knex";

// Issue 18: a spec in the shop's library keeps the resolution it was typed with, as a reading
// does (migration 25): "0.10" stays 0.10 when listed and when it pre-fills a reading's limits.
// DECIMAL(16,6) keeps the number, these keep how many decimals were typed. Rows written before
// stay null and are shown as before (no trailing zeros).
// A teardown step's torque also gets loosen-and-retorque with its sequence and what "other" was on
// the threads, as a torque record has them (migration 27); steps written before stay null.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("spec_entries", (t) => {
    t.tinyint("value_decimals").unsigned().nullable();
    t.tinyint("min_decimals").unsigned().nullable();
    t.tinyint("max_decimals").unsigned().nullable();
  });
  await knex.schema.alterTable("teardown_steps", (t) => {
    t.string("torque_lubrication_other", 60).nullable();
    t.boolean("torque_loosen_retorque").nullable();
    t.string("torque_retorque_sequence", 300).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("teardown_steps", (t) => {
    t.dropColumn("torque_lubrication_other");
    t.dropColumn("torque_loosen_retorque");
    t.dropColumn("torque_retorque_sequence");
  });
  await knex.schema.alterTable("spec_entries", (t) => {
    t.dropColumn("value_decimals");
    t.dropColumn("min_decimals");
    t.dropColumn("max_decimals");
  });
}
