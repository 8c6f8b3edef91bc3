import type { Knex } from "knex";

// Issue 18 §2: a torque record keeps what is needed to judge it, not only what was typed. The
// tolerance it is judged by (default from the wrench's ISO 6789-1 class, lib/torque-check.ts), the
// wrench class, and whether the passes and the check pass were done — recorded, never assumed.
// Rows written before this stay null: views read them as "not recorded". The shop's bench settings
// name the wrench it usually tightens with, whose class gives a new record's default tolerance.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("shop_bench_settings", (t) => {
    t.string("wrench_class", 16).notNullable().defaultTo("type2_4");
  });
  await knex.schema.alterTable("torque_records", (t) => {
    t.decimal("tolerance_pct", 5, 2).unsigned().nullable();
    t.string("wrench_class", 16).nullable();
    t.boolean("passes_done").nullable();
    t.boolean("check_pass_done").nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("shop_bench_settings", (t) => {
    t.dropColumn("wrench_class");
  });
  await knex.schema.alterTable("torque_records", (t) => {
    t.dropColumn("tolerance_pct");
    t.dropColumn("wrench_class");
    t.dropColumn("passes_done");
    t.dropColumn("check_pass_done");
  });
}
