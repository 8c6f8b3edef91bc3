import type { Knex } from "knex";
import { CONTACT_PREFERENCES } from "../../lib/customers";

// How the owner likes to be reached, and the record of customer merges: when the desk folds a
// duplicate into the record it keeps, the removed row is gone, so what it held (a snapshot),
// what moved and who did it when are kept here.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("customers", (t) => {
    t.enum("contact_preference", [...CONTACT_PREFERENCES]).nullable();
  });
  await knex.schema.createTable("customer_merges", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable().references("shops.id").onDelete("CASCADE");
    t.integer("kept_customer_id").unsigned().notNullable();
    // The removed row no longer exists: no foreign key, its content is in `removed`.
    t.integer("removed_customer_id").unsigned().notNullable();
    t.json("removed").notNullable();
    t.json("moved").notNullable();
    t.integer("merged_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("merged_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.foreign(["shop_id", "kept_customer_id"]).references(["shop_id", "id"]).inTable("customers").onDelete("CASCADE");
    t.index(["shop_id", "kept_customer_id", "merged_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("customer_merges");
  await knex.schema.alterTable("customers", (t) => {
    t.dropColumn("contact_preference");
  });
}
