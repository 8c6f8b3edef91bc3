import type { Knex } from "knex";

// The machine owner agrees to the write-up they were shown (issue 16 §6): each consent keeps the
// SHA-256 of the story's curated content it was given on, and the shop publishes only while the
// story still hashes to the last "given" answer. NULL on answers recorded before this existed,
// and on refusals and withdrawals, which need no content.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("story_consents", (t) => {
    t.specificType("shown_hash", "char(64)").nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("story_consents", (t) => {
    t.dropColumn("shown_hash");
  });
}
