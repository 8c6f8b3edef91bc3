import type { Knex } from "knex";
import { JOB_STATUSES } from "../../lib/job-status";
import { MACHINE_KINDS } from "../../lib/machine";

// Child rows point at their parent through (shop_id, id) pairs, so the database itself
// refuses a job whose customer or machine belongs to another shop.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("customers", (t) => {
    t.increments("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable().references("shops.id").onDelete("CASCADE");
    // Set when the person first signs in; the same person can be a customer of several shops.
    t.integer("user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.string("name", 120).notNullable();
    t.string("email", 254).nullable();
    t.string("phone", 40).nullable();
    t.timestamp("created_at").notNullable().defaultTo(knex.fn.now());
    t.unique(["shop_id", "id"]);
    t.unique(["shop_id", "email"]);
    t.index(["user_id"]);
    t.index(["email"]);
    t.index(["shop_id", "name"]);
  });

  await knex.schema.createTable("machines", (t) => {
    t.increments("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable().references("shops.id").onDelete("CASCADE");
    t.integer("customer_id").unsigned().notNullable();
    t.enum("kind", [...MACHINE_KINDS]).notNullable();
    t.smallint("year").unsigned().nullable();
    t.string("make", 60).notNullable();
    t.string("model", 80).notNullable();
    t.integer("engine_cc").unsigned().nullable();
    t.string("serial", 64).nullable();
    t.decimal("hours", 8, 1).unsigned().nullable();
    t.integer("odometer").unsigned().nullable();
    t.enum("odometer_unit", ["km", "mi"]).nullable();
    t.timestamp("created_at").notNullable().defaultTo(knex.fn.now());
    t.unique(["shop_id", "id"]);
    t.foreign(["shop_id", "customer_id"]).references(["shop_id", "id"]).inTable("customers").onDelete("CASCADE");
    t.index(["shop_id", "serial"]);
  });

  await knex.schema.createTable("jobs", (t) => {
    t.increments("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable().references("shops.id").onDelete("CASCADE");
    t.integer("number").unsigned().notNullable();
    // Opaque id for the owner's links (job numbers are guessable).
    t.specificType("public_id", "char(16)").notNullable().unique();
    t.integer("customer_id").unsigned().notNullable();
    t.integer("machine_id").unsigned().notNullable();
    t.enum("status", [...JOB_STATUSES]).notNullable().defaultTo("checked_in");
    t.text("concern").notNullable();
    t.text("intake_notes").nullable();
    t.date("promised_on").nullable();
    t.integer("technician_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.integer("created_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.timestamp("created_at").notNullable().defaultTo(knex.fn.now());
    t.timestamp("updated_at").notNullable().defaultTo(knex.fn.now());
    t.unique(["shop_id", "number"]);
    t.unique(["shop_id", "id"]);
    t.foreign(["shop_id", "customer_id"]).references(["shop_id", "id"]).inTable("customers");
    t.foreign(["shop_id", "machine_id"]).references(["shop_id", "id"]).inTable("machines");
    t.index(["shop_id", "status", "promised_on"]);
    t.index(["shop_id", "promised_on"]);
    t.index(["shop_id", "technician_user_id"]);
    t.index(["shop_id", "created_at"]);
  });

  await knex.schema.createTable("job_status_changes", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable();
    t.integer("job_id").unsigned().notNullable();
    t.enum("from_status", [...JOB_STATUSES]).nullable();
    t.enum("to_status", [...JOB_STATUSES]).notNullable();
    t.integer("changed_by_user_id").unsigned().nullable().references("users.id").onDelete("SET NULL");
    t.string("note", 500).nullable();
    t.timestamp("changed_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.foreign(["shop_id", "job_id"]).references(["shop_id", "id"]).inTable("jobs").onDelete("CASCADE");
    t.index(["job_id", "changed_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("job_status_changes");
  await knex.schema.dropTable("jobs");
  await knex.schema.dropTable("machines");
  await knex.schema.dropTable("customers");
}
