import type { Knex } from "knex";

// Issue 19: a priced finding line the owner approved whose part then left the job (moved to
// another job that needed it sooner, "this job no longer needs it") is withdrawn: it stays in the
// approval record, but it is no longer billed, no longer counts in what the owner authorised, and
// the invoice and its record say so. Who withdrew it, when and why are kept on the line. A finding
// saved again (only while the owner hasn't answered it) clears them: its lines then stand again.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("finding_lines", (t) => {
    t.timestamp("withdrawn_at", { precision: 3 }).nullable();
    t.integer("withdrawn_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.string("withdrawn_reason", 300).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("finding_lines", (t) => {
    t.dropForeign(["withdrawn_by_user_id"]);
    t.dropColumn("withdrawn_by_user_id");
    t.dropColumn("withdrawn_at");
    t.dropColumn("withdrawn_reason");
  });
}
