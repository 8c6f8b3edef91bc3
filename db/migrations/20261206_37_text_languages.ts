import type { Knex } from "knex";

// Issue 21 §2: the languages a shop texts in, for the STOP / START / HELP words and their answers
// (lib/texts.ts). A SET of the languages the app has words for; English is always one of them (the
// CHECK), so an owner can always stop texts with STOP. Existing shops keep English only.
export async function up(knex: Knex): Promise<void> {
  await knex.raw("ALTER TABLE shops ADD COLUMN sms_languages SET('en','es','fr') NOT NULL DEFAULT 'en' AFTER sms_quiet_end");
  await knex.raw("ALTER TABLE shops ADD CONSTRAINT shops_sms_languages CHECK (FIND_IN_SET('en', sms_languages) > 0)");
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw("ALTER TABLE shops DROP CONSTRAINT shops_sms_languages");
  await knex.schema.alterTable("shops", (t) => {
    t.dropColumn("sms_languages");
  });
}
