import type { Knex } from "knex";

// Shop settings the owner keeps on the settings page (issue 16 §2): the shop's postal address and
// opening hours, named labour rates beside the default one, and a record of every change (who,
// when, which section, the values before and after) so a disputed price can be traced to a setting.
// Money settings already live in shop_money_settings (migration 07); issued invoices and sent
// approval requests keep their own snapshot of them, so nothing here rewrites old records.

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("shops", (t) => {
    t.string("address", 300).nullable();
    // {"mon": {"open": "08:00", "close": "17:30"} | null, …}: null day = closed; null column = not given yet.
    t.json("opening_hours").nullable();
  });
  await knex.schema.alterTable("shop_money_settings", (t) => {
    // [{"name": "Diagnosis", "rateMinor": 9500}, …] beside labour_rate_minor (the default).
    t.json("labour_rates").nullable();
  });
  await knex.schema.createTable("shop_setting_changes", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable().references("shops.id").onDelete("CASCADE");
    // Kept when the person later leaves (their name goes, the change stays).
    t.integer("user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.string("section", 40).notNullable();
    t.json("before").notNullable();
    t.json("after").notNullable();
    t.timestamp("at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    // The settings page reads the shop's newest changes first.
    t.index(["shop_id", "id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("shop_setting_changes");
  await knex.schema.alterTable("shop_money_settings", (t) => {
    t.dropColumn("labour_rates");
  });
  await knex.schema.alterTable("shops", (t) => {
    t.dropColumn("opening_hours");
    t.dropColumn("address");
  });
}
