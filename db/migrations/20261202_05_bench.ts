import type { Knex } from "knex";
import { TORQUE_UNIT_IDS } from "../../lib/torque";

// Bench tools: torque records, readings, the teardown log (whose reverse is the reassembly
// checklist), parts on a job with their status history, and the shop's own spec library.
// Each record that reaches the timeline keeps the id of its entry (the entry's body is a snapshot
// for reading; these rows are what the bench page works from). Bench settings live in their own
// table keyed by shop, so a shop without a row simply gets the defaults below.
const PART_STATUSES = ["needed", "ordered", "back_ordered", "received", "fitted", "returned"] as const;
const SPEC_KINDS = ["torque", "limit", "capacity", "note"] as const;

/** (shop_id, job_id) → jobs and (shop_id, entry_id) → journal_entries, as the journal tables do. */
function jobChild(t: Knex.CreateTableBuilder, { entry }: { entry: boolean }) {
  t.integer("shop_id").unsigned().notNullable();
  t.integer("job_id").unsigned().notNullable();
  t.foreign(["shop_id", "job_id"]).references(["shop_id", "id"]).inTable("jobs").onDelete("CASCADE");
  if (entry) {
    t.bigInteger("entry_id").unsigned().nullable();
    // Entries are only ever soft-deleted; a hard delete comes from the job going, so cascade.
    t.foreign(["shop_id", "entry_id"]).references(["shop_id", "id"]).inTable("journal_entries").onDelete("CASCADE");
  }
}

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("shop_bench_settings", (t) => {
    t.integer("shop_id").unsigned().primary().references("shops.id").onDelete("CASCADE");
    t.enum("torque_unit", [...TORQUE_UNIT_IDS]).notNullable().defaultTo("nm");
    // e.g. [30,60,100]: rising percentages ending at 100 (checked by lib/tightening-passes.ts).
    t.json("pass_percents").notNullable();
    // Chain replace-at elongation, % (REFERENCES.md §4: ~3 % most drives, ~1.5 % fixed centres).
    t.decimal("chain_limit_pct", 5, 2).notNullable().defaultTo(3.0);
    t.timestamp("updated_at").notNullable().defaultTo(knex.fn.now());
  });

  await knex.schema.createTable("torque_records", (t) => {
    t.bigIncrements("id").unsigned().primary();
    jobChild(t, { entry: true });
    t.string("fastener", 200).notNullable();
    t.decimal("spec_value", 10, 3).unsigned().notNullable();
    t.enum("unit", [...TORQUE_UNIT_IDS]).notNullable();
    // In the spec's unit; null when only the spec was logged.
    t.decimal("applied_value", 10, 3).unsigned().nullable();
    t.string("tool", 120).nullable();
    t.json("pass_percents").notNullable();
    t.smallint("bolt_count").unsigned().nullable();
    t.string("note", 500).nullable();
    t.integer("recorded_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(["shop_id", "job_id", "id"]);
  });

  await knex.schema.createTable("readings", (t) => {
    t.bigIncrements("id").unsigned().primary();
    jobChild(t, { entry: true });
    t.string("label", 200).notNullable();
    t.decimal("value", 16, 6).notNullable();
    t.string("unit", 20).nullable();
    t.decimal("min_value", 16, 6).nullable();
    t.decimal("max_value", 16, 6).nullable();
    t.string("source", 200).nullable();
    t.enum("verdict", ["within", "below", "above", "no_limit"]).notNullable();
    // Chain-wear inputs when the reading came from the chain helper (pitch, pitches, length, limit).
    t.json("chain").nullable();
    t.integer("recorded_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(["shop_id", "job_id", "id"]);
  });

  await knex.schema.createTable("teardown_steps", (t) => {
    t.bigIncrements("id").unsigned().primary();
    jobChild(t, { entry: true });
    // Removal order, handed out under a lock on the job row.
    t.integer("seq").unsigned().notNullable();
    t.string("removed", 200).notNullable();
    t.smallint("count").unsigned().nullable();
    t.string("size", 60).nullable();
    t.string("notes", 1000).nullable();
    t.string("storage_label", 80).nullable();
    t.specificType("photo_public_id", "char(22)").nullable().references("photos.public_id").onDelete("SET NULL");
    t.decimal("torque_value", 10, 3).unsigned().nullable();
    t.enum("torque_unit", [...TORQUE_UNIT_IDS]).nullable();
    t.smallint("torque_bolt_count").unsigned().nullable();
    t.boolean("replaced_new").notNullable().defaultTo(false);
    // The reassembly tick: who put it back and when (no timeline entry, it would flood it).
    t.integer("checked_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("checked_at", { precision: 3 }).nullable();
    t.integer("created_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.unique(["shop_id", "job_id", "seq"]);
  });

  await knex.schema.createTable("job_parts", (t) => {
    t.bigIncrements("id").unsigned().primary();
    jobChild(t, { entry: false });
    t.string("part_number", 60).nullable();
    t.string("description", 200).notNullable();
    t.string("supplier", 120).nullable();
    // Thousandths, as lib/money.ts counts quantities (1500 = 1.5 L).
    t.integer("qty_thousandths").unsigned().notNullable().defaultTo(1000);
    // Unit cost in the shop's currency's minor units; staff only, never copied into an entry.
    t.integer("cost_minor").unsigned().nullable();
    t.enum("status", [...PART_STATUSES]).notNullable().defaultTo("needed");
    t.date("expected_on").nullable();
    t.integer("created_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.timestamp("updated_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.unique(["shop_id", "id"]);
    // The page lists a job's parts; the waiting-on-parts rule counts them by status.
    t.index(["shop_id", "job_id", "status"]);
  });

  await knex.schema.createTable("job_part_events", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable();
    t.bigInteger("part_id").unsigned().notNullable();
    t.enum("from_status", [...PART_STATUSES]).nullable();
    t.enum("to_status", [...PART_STATUSES]).notNullable();
    t.integer("changed_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("changed_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.foreign(["shop_id", "part_id"]).references(["shop_id", "id"]).inTable("job_parts").onDelete("CASCADE");
    t.index(["part_id", "id"]);
  });

  await knex.schema.createTable("spec_entries", (t) => {
    t.increments("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable().references("shops.id").onDelete("CASCADE");
    // Matched to a job's machine by make and model (the collation ignores case).
    t.string("make", 60).notNullable();
    t.string("model", 80).notNullable();
    t.enum("kind", [...SPEC_KINDS]).notNullable();
    t.string("label", 200).notNullable();
    t.decimal("value", 16, 6).nullable();
    t.string("unit", 20).nullable();
    t.decimal("min_value", 16, 6).nullable();
    t.decimal("max_value", 16, 6).nullable();
    t.smallint("bolt_count").unsigned().nullable();
    t.string("notes", 1000).nullable();
    // Where the shop read it, e.g. "service manual p. 4-12".
    t.string("source", 200).nullable();
    t.integer("created_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("created_at").notNullable().defaultTo(knex.fn.now());
    t.index(["shop_id", "make", "model", "kind"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("spec_entries");
  await knex.schema.dropTable("job_part_events");
  await knex.schema.dropTable("job_parts");
  await knex.schema.dropTable("teardown_steps");
  await knex.schema.dropTable("readings");
  await knex.schema.dropTable("torque_records");
  await knex.schema.dropTable("shop_bench_settings");
}
