import type { Knex } from "knex";

// Issue 18 §5: structured measurement sets (valve clearances, clutch plates, brake discs, springs,
// ring gaps, compression, leak-down) beside the free-form readings. One set per check, one timeline
// entry per set (its snapshot), one item row per valve / plate / cylinder. Items keep the decimals
// typed (0.20 stays 0.20: the instrument's resolution) and their own copy of the limit they were
// judged by, so a later change of limits can't rewrite an old verdict. A table of their own rather
// than rows of `readings`: each item carries per-kind detail (cylinder, side, old shim) and a trend
// key, and a set writes one entry, not one per valve.
const VERDICTS = ["within", "below", "above", "no_limit"] as const;

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("measurement_sets", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable();
    t.integer("job_id").unsigned().notNullable();
    t.foreign(["shop_id", "job_id"]).references(["shop_id", "id"]).inTable("jobs").onDelete("CASCADE");
    t.bigInteger("entry_id").unsigned().nullable();
    t.foreign(["shop_id", "entry_id"]).references(["shop_id", "id"]).inTable("journal_entries").onDelete("CASCADE");
    t.string("kind", 24).notNullable();
    t.string("title", 200).notNullable();
    t.string("unit", 20).notNullable();
    // Where the shop's limit comes from ("maker's manual p. 3-14"): required, shown to the owner.
    t.string("source", 200).notNullable();
    t.string("note", 500).nullable();
    // The draft finding made from this set ("draft a finding"), so it is offered once.
    t.bigInteger("finding_id").unsigned().nullable();
    t.foreign("finding_id").references("findings.id").onDelete("SET NULL");
    t.integer("recorded_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.unique(["shop_id", "id"]);
    t.index(["shop_id", "job_id"]);
  });

  await knex.schema.createTable("measurement_items", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable();
    t.bigInteger("set_id").unsigned().notNullable();
    t.foreign(["shop_id", "set_id"]).references(["shop_id", "id"]).inTable("measurement_sets").onDelete("CASCADE");
    t.tinyint("position").unsigned().notNullable();
    // The same valve / plate / cylinder across jobs ("exhaust:1:left"): what a trend follows.
    t.string("item_key", 80).notNullable();
    // A valve's label is "Exhaust, cyl 12, " and its position (up to 120 characters typed).
    t.string("label", 160).notNullable();
    t.decimal("value", 16, 6).unsigned().notNullable();
    t.tinyint("value_decimals").unsigned().notNullable();
    t.decimal("min_value", 16, 6).unsigned().nullable();
    t.decimal("max_value", 16, 6).unsigned().nullable();
    t.tinyint("limit_decimals").unsigned().notNullable().defaultTo(0);
    t.enum("verdict", [...VERDICTS]).notNullable();
    // Per-kind detail: cylinder, side, position, the old shim (valve clearance).
    t.json("detail").nullable();
    t.unique(["set_id", "position"]);
    t.index(["shop_id", "item_key"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("measurement_items");
  await knex.schema.dropTable("measurement_sets");
}
