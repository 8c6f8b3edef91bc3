import type { Knex } from "knex";

// Issue 19, parts flow into the price. One parts record per priced finding line:
// - job_parts.finding_line_id: the part line it was created from or picked by (unique: one part
//   per line). SET NULL when a draft line is deleted; the writer removes or unlinks the part first.
// - job_parts.owner_answer: null for a part not from a line (the older rule applies: no_ok_needed
//   or its finding approved); "pending" until the owner answers the line, then "approved"
//   (the part may wait the job) or "declined" (it never does, and never reaches the invoice).
// - job_parts.sell_minor / price_reason: the unit sell price the line shows the owner (cost_minor
//   stays staff-only) and why it differs from the shop's markup rule, when it does.
// - approval_requests.line_ids: the finding line id behind each snapshot line, in order, so an
//   answer reaches the right parts. Kept outside the snapshot: the owner's sealed text is unchanged.
// - shop_parts_markup: the shop's markup rule (lib/parts-pricing.ts); no row: prices are typed.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("job_parts", (t) => {
    t.bigInteger("finding_line_id").unsigned().nullable().unique();
    t.enum("owner_answer", ["pending", "approved", "declined"]).nullable();
    t.integer("sell_minor").unsigned().nullable();
    t.string("price_reason", 200).nullable();
    t.foreign(["finding_line_id"]).references(["id"]).inTable("finding_lines").onDelete("SET NULL");
  });
  await knex.schema.alterTable("approval_requests", (t) => {
    t.json("line_ids").nullable();
  });
  await knex.schema.createTable("shop_parts_markup", (t) => {
    t.integer("shop_id").unsigned().primary().references("shops.id").onDelete("CASCADE");
    t.json("rule").notNullable();
    t.timestamp("updated_at").notNullable().defaultTo(knex.fn.now());
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("shop_parts_markup");
  await knex.schema.alterTable("approval_requests", (t) => {
    t.dropColumn("line_ids");
  });
  await knex.schema.alterTable("job_parts", (t) => {
    t.dropForeign(["finding_line_id"]);
    t.dropUnique(["finding_line_id"]);
    t.dropColumn("finding_line_id");
    t.dropColumn("owner_answer");
    t.dropColumn("sell_minor");
    t.dropColumn("price_reason");
  });
}
