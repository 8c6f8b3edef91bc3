import type { Knex } from "knex";

export async function up(knex: Knex): Promise<void> {
  // One-time sign-in links for machine owners; only a hash of the token is kept.
  await knex.schema.createTable("sign_in_links", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.string("email", 254).notNullable();
    t.specificType("token_hash", "char(64)").notNullable().unique();
    t.timestamp("expires_at").notNullable();
    t.timestamp("used_at").nullable();
    t.timestamp("created_at").notNullable().defaultTo(knex.fn.now());
    t.index(["email", "created_at"]);
  });

  // Attempts, good and bad, so limits hold across any number of app instances.
  await knex.schema.createTable("auth_attempts", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.enum("kind", ["password", "link_request", "link_use"]).notNullable();
    t.string("subject", 254).notNullable();
    t.boolean("succeeded").notNullable();
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    t.index(["kind", "subject", "created_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("auth_attempts");
  await knex.schema.dropTable("sign_in_links");
}
