import type { Knex } from "knex";
import { STAFF_ROLES } from "../../lib/permissions";

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("shops", (t) => {
    t.increments("id").unsigned().primary();
    t.string("slug", 60).notNullable().unique();
    t.string("name", 120).notNullable();
    t.string("email", 254).nullable();
    t.string("phone", 40).nullable();
    t.string("timezone", 64).notNullable().defaultTo("UTC");
    t.specificType("currency", "char(3)").notNullable().defaultTo("USD");
    // Next job number to hand out; taken under a row lock so two check-ins never share one.
    t.integer("next_job_number").unsigned().notNullable().defaultTo(1);
    t.timestamp("created_at").notNullable().defaultTo(knex.fn.now());
  });

  await knex.schema.createTable("users", (t) => {
    t.increments("id").unsigned().primary();
    t.string("email", 254).notNullable().unique();
    t.string("name", 120).notNullable();
    // Only staff have a password; machine owners sign in with an e-mailed link.
    t.string("password_hash", 100).nullable();
    t.timestamp("created_at").notNullable().defaultTo(knex.fn.now());
    t.timestamp("last_sign_in_at").nullable();
  });

  await knex.schema.createTable("memberships", (t) => {
    t.increments("id").unsigned().primary();
    t.integer("shop_id").unsigned().notNullable().references("shops.id").onDelete("CASCADE");
    t.integer("user_id").unsigned().notNullable().references("users.id").onDelete("CASCADE");
    t.enum("role", [...STAFF_ROLES]).notNullable();
    t.timestamp("created_at").notNullable().defaultTo(knex.fn.now());
    t.unique(["shop_id", "user_id"]);
    t.index(["user_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("memberships");
  await knex.schema.dropTable("users");
  await knex.schema.dropTable("shops");
}
