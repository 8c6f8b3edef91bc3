import type { Knex } from "knex";

// Tax at a rate per kind of line (issue 16 §2): parts take the shop's rate (tax_rate_percent);
// labour, fees and the shop-supplies fee may each have a rate of their own. NULL means "the
// shop's rate", so every shop reads as before until its owner sets one.
// The shop's standard drop-off terms (issue 16 §5): a diagnosis charge and an "authorised up to"
// amount anyone at the counter, a technician included, can put in front of the owner to sign.
const COLUMNS = ["labour_tax_rate_percent", "fee_tax_rate_percent", "supplies_tax_rate_percent"] as const;
const DROPOFF = ["dropoff_charge_minor", "dropoff_up_to_minor"] as const;

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("shop_money_settings", (t) => {
    for (const c of COLUMNS) t.decimal(c, 9, 6).nullable();
    for (const c of DROPOFF) t.bigInteger(c).unsigned().nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("shop_money_settings", (t) => {
    for (const c of [...COLUMNS, ...DROPOFF]) t.dropColumn(c);
  });
}
