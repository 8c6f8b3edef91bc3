import type { Knex } from "knex";

// A shop can take someone off its staff without deleting their history: the membership stays
// (jobs, entries and payments still name them) with the moment it stopped counting. A
// deactivated membership gives no role: the actor is read without it on every request, and a
// password sign-in needs an active one.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("memberships", (t) => {
    t.timestamp("deactivated_at", { precision: 3 }).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("memberships", (t) => {
    t.dropColumn("deactivated_at");
  });
}
