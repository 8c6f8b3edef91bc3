import type { Knex } from "knex";

// A new shop starts itself (issue 16 §1): the "Start your shop" form stores a pending sign-up
// and mails a confirmation link; opening it (once, before it expires) creates the shop, the
// owner's account and membership in one transaction. Only the token's hash is kept, and the
// password only as its bcrypt hash. Sign-ups, and booking requests from the shop's public page
// (issue 16 §6), have their own limits in auth_attempts.
const KINDS_BEFORE = ["password", "link_request", "link_use", "reset_request", "token_use", "password_change"];
const KINDS_AFTER = [...KINDS_BEFORE, "signup_request", "signup_use", "booking_request"];

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("shop_signups", (t) => {
    t.bigIncrements("id").unsigned().primary();
    t.specificType("token_hash", "char(64)").notNullable().unique();
    t.string("email", 254).notNullable();
    t.string("owner_name", 120).notNullable();
    t.string("password_hash", 100).notNullable();
    t.string("shop_name", 120).notNullable();
    t.string("slug", 60).notNullable();
    t.string("timezone", 64).notNullable();
    t.specificType("currency", "char(3)").notNullable();
    t.timestamp("expires_at", { precision: 3 }).notNullable();
    t.timestamp("used_at", { precision: 3 }).nullable();
    // The shop the confirmation made (kept for the record; gone with the shop).
    t.integer("shop_id").unsigned().nullable().references("shops.id").onDelete("SET NULL");
    t.timestamp("created_at", { precision: 3 }).notNullable().defaultTo(knex.fn.now(3));
    // Housekeeping deletes old rows by expiry.
    t.index(["expires_at"]);
  });
  await knex.schema.alterTable("shop_profiles", (t) => {
    // The public page's "what we work on": kinds of machines and work, in the shop's own words.
    t.string("takes_in", 600).nullable();
  });
  await knex.raw(`ALTER TABLE auth_attempts MODIFY kind ENUM(${KINDS_AFTER.map(() => "?").join(", ")}) NOT NULL`, KINDS_AFTER);
}

export async function down(knex: Knex): Promise<void> {
  await knex("auth_attempts").whereNotIn("kind", KINDS_BEFORE).delete();
  await knex.raw(`ALTER TABLE auth_attempts MODIFY kind ENUM(${KINDS_BEFORE.map(() => "?").join(", ")}) NOT NULL`, KINDS_BEFORE);
  await knex.schema.alterTable("shop_profiles", (t) => {
    t.dropColumn("takes_in");
  });
  await knex.schema.dropTable("shop_signups");
}
