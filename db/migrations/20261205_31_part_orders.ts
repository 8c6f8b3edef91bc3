import type { Knex } from "knex";

// Issue 19, the ordering half: parts go on supplier orders, cores and special-order deposits.
// - part_orders: one supplier order (reference, ordered / expected dates) holding one or more parts
//   of one shop, possibly for different jobs; received_at once the desk marked it all in.
// - job_parts.order_id: the order a part is on (single column so the order can be deleted and
//   the part stays, as finding_id does); the writer checks the order is of the part's shop.
// - job_parts.core_charge_minor / core_returned_at: the core charge on a part, refunded when the
//   old part goes back (a credit the invoice takes; see lib/server/part-orders.ts).
// - job_parts.special_order / deposit_id: a special-order part and the deposit asked before ordering.
// - job_part_events.note / from_job_id: why a change happened ("back-ordered", "moved from job …").
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("part_orders", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable().references("shops.id").onDelete("CASCADE");
    t.string("supplier", 120).notNullable();
    t.string("reference", 80).nullable();
    t.date("ordered_on").notNullable();
    t.date("expected_on").nullable();
    t.timestamp("received_at", { precision: 3 }).nullable();
    t.integer("created_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.unique(["shop_id", "id"]);
  });
  await knex.schema.alterTable("job_parts", (t) => {
    t.bigInteger("order_id").unsigned().nullable();
    t.integer("core_charge_minor").unsigned().nullable();
    t.timestamp("core_returned_at", { precision: 3 }).nullable();
    t.boolean("special_order").notNullable().defaultTo(false);
    t.bigInteger("deposit_id").unsigned().nullable();
    t.foreign(["order_id"]).references(["id"]).inTable("part_orders").onDelete("SET NULL");
    t.foreign(["deposit_id"]).references(["id"]).inTable("deposit_requests").onDelete("SET NULL");
    // "Parts on order" across the shop, late first.
    t.index(["shop_id", "status", "expected_on"]);
  });
  await knex.schema.alterTable("job_part_events", (t) => {
    t.string("note", 200).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("job_part_events", (t) => {
    t.dropColumn("note");
  });
  await knex.schema.alterTable("job_parts", (t) => {
    t.dropForeign(["order_id"]);
    t.dropForeign(["deposit_id"]);
    t.dropIndex(["shop_id", "status", "expected_on"]);
    t.dropColumn("order_id");
    t.dropColumn("core_charge_minor");
    t.dropColumn("core_returned_at");
    t.dropColumn("special_order");
    t.dropColumn("deposit_id");
  });
  await knex.schema.dropTable("part_orders");
}
