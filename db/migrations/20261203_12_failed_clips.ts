import type { Knex } from "knex";

// A clip the video service rejects (not a video, an upload that failed, longer than the shop
// allows once processed) leaves the timeline: its entry is removed and the clip row stays
// without one, only as a failed upload the shop's staff see with its reason and can clear.
export async function up(knex: Knex): Promise<void> {
  await knex.raw("ALTER TABLE clips MODIFY entry_id BIGINT UNSIGNED NULL");
}

export async function down(knex: Knex): Promise<void> {
  // Failed uploads have no entry to point at; they go with the column's old rule.
  await knex("clips").whereNull("entry_id").delete();
  await knex.raw("ALTER TABLE clips MODIFY entry_id BIGINT UNSIGNED NOT NULL");
}
