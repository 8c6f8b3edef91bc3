import type { Knex } from "knex";

// Issue 18 §7. Teardown steps can be edited and deleted, never silently: a step keeps a version,
// every change first copies the step as it was into teardown_step_revisions (who, when, what it
// was), and a deleted step is only marked (deleted_at) so its history stays readable on the bench
// page. Findings' safety categories gain drivetrain, wheels and tyres, and suspension.
const SAFETY_BEFORE = ["none", "brakes", "steering", "fuel", "throttle"] as const;
const SAFETY_AFTER = [...SAFETY_BEFORE, "drivetrain", "wheels_tyres", "suspension"] as const;

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("teardown_steps", (t) => {
    // Bumped by every edit, so two phones editing one step can't overwrite each other unseen.
    t.integer("version").unsigned().notNullable().defaultTo(1);
    t.timestamp("deleted_at", { precision: 3 }).nullable();
    t.integer("deleted_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    // For the revisions' (shop_id, step_id) key, so a revision can't point into another shop.
    t.unique(["shop_id", "id"]);
  });
  await knex.schema.createTable("teardown_step_revisions", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable();
    t.integer("job_id").unsigned().notNullable();
    t.foreign(["shop_id", "job_id"]).references(["shop_id", "id"]).inTable("jobs").onDelete("CASCADE");
    t.bigInteger("step_id").unsigned().notNullable();
    t.foreign(["shop_id", "step_id"]).references(["shop_id", "id"]).inTable("teardown_steps").onDelete("CASCADE");
    // The step's version this row replaced, and what replaced it.
    t.integer("version").unsigned().notNullable();
    t.enum("change", ["edit", "torque", "delete"]).notNullable();
    // The step as it was before the change (its columns, as JSON).
    t.json("previous").notNullable();
    t.integer("changed_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("changed_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(["shop_id", "job_id", "step_id", "id"]);
  });
  await knex.schema.alterTable("findings", (t) => {
    t.enum("safety", [...SAFETY_AFTER]).notNullable().defaultTo("none").alter();
  });
}

export async function down(knex: Knex): Promise<void> {
  // The narrower list can't hold the new categories: those findings fall back to "none".
  await knex("findings").whereIn("safety", ["drivetrain", "wheels_tyres", "suspension"]).update({ safety: "none" });
  await knex.schema.alterTable("findings", (t) => {
    t.enum("safety", [...SAFETY_BEFORE]).notNullable().defaultTo("none").alter();
  });
  await knex.schema.dropTable("teardown_step_revisions");
  await knex.schema.alterTable("teardown_steps", (t) => {
    t.dropForeign(["deleted_by_user_id"]);
    t.dropUnique(["shop_id", "id"]);
    t.dropColumn("deleted_by_user_id");
    t.dropColumn("deleted_at");
    t.dropColumn("version");
  });
}
